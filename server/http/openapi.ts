import { createDocument, type ZodOpenApiPathsObject } from "zod-openapi";
import { z } from "zod";
import { apiErrorSchema } from "../../shared/schemas";
import type { RouteSpec } from "./routes";

/** OpenAPI 3.1 built from the same route records and zod schemas the API validates with. */
export function openApiDocument(specs: RouteSpec[], version: string) {
  const paths: ZodOpenApiPathsObject = {};
  const error = {
    description: "Error",
    content: { "application/json": { schema: apiErrorSchema } },
  };
  for (const spec of specs) {
    const path = "/api" + spec.path.replace(/:(\w+)/g, "{$1}");
    const status = String(spec.status ?? 200);
    paths[path] ??= {};
    (paths[path] as Record<string, unknown>)[spec.method] = {
      summary: spec.summary,
      tags: [spec.tag],
      requestParams: {
        ...(spec.params ? { path: spec.params as z.ZodObject } : {}),
        ...(spec.query ? { query: spec.query as z.ZodObject } : {}),
      },
      ...(spec.body || spec.multipart
        ? {
            requestBody: {
              content: {
                ...(spec.body
                  ? { "application/json": { schema: spec.body } }
                  : {}),
                // Uploads: one or more binary "file" parts beside the text fields.
                ...(spec.multipart
                  ? {
                      "multipart/form-data": {
                        schema: spec.multipart.extend({
                          file: z
                            .string()
                            .meta({ format: "binary" })
                            .describe("the file (repeat the part for several)"),
                        }),
                      },
                    }
                  : {}),
              },
            },
          }
        : {}),
      responses: {
        [status]:
          status === "204" || !spec.response
            ? { description: "Done" }
            : {
                description: "OK",
                content: { "application/json": { schema: spec.response } },
              },
        "4XX": error,
      },
    };
  }
  return createDocument({
    openapi: "3.1.0",
    info: { title: "Sitecue API", version },
    paths,
  });
}
