import type { Request } from "express";
import type { z } from "zod";
import { HttpError, zodFields } from "./errors";

type Part = "body" | "params" | "query";

/** Parses one part of the request with a shared zod schema; a failure is a 400 naming each field. */
export function parse<S extends z.ZodType>(
  schema: S,
  req: Request,
  part: Part,
): z.output<S> {
  const result = schema.safeParse(req[part] ?? {});
  if (!result.success) {
    const what =
      part === "body"
        ? "Some fields need attention."
        : part === "params"
          ? "The address is not valid."
          : "The query is not valid.";
    if (part === "params")
      throw new HttpError(404, "not-found", "That record was not found.");
    throw new HttpError(400, "validation", what, zodFields(result.error));
  }
  return result.data;
}
