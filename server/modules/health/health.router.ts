import type { DataSource } from "typeorm";
import { healthResponseSchema } from "../../../shared/schemas";
import type { ApiRoutes } from "../../http/routes";

export function registerHealthRoutes(
  api: ApiRoutes,
  ds: DataSource,
  version: string,
): void {
  api.add({
    method: "get",
    path: "/health",
    tag: "health",
    summary: "Whether the app and its database answer",
    response: healthResponseSchema,
    handler: async ({ res }) => {
      const up = await ds
        .query("SELECT 1")
        .then(() => true)
        .catch(() => false);
      res.status(up ? 200 : 503);
      return {
        status: up ? "ok" : "degraded",
        database: up ? "up" : "down",
        version,
      };
    },
  });
}
