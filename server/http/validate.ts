import type { Request } from "express";
import type { z } from "zod";
import { HttpError, zodFields } from "./errors";

type Part = "body" | "params" | "query";

// With the `u` flag a well-formed pair is one astral code point, so this matches only a lone
// (unpaired) surrogate: legal in JSON text, but no Unicode scalar value (RFC 8259 §8.2), and
// refused by MariaDB's JSON check (the audit detail), which used to make it a 500.
const LONE_SURROGATE = /\p{Surrogate}/u;

export const BROKEN_CHARACTER =
  "This has a broken character in it (often half of an emoji). Retype it and try again.";

/** Field paths (joined with dots, as zodFields does) of every string or key holding a lone surrogate. */
export function loneSurrogateFields(
  value: unknown,
  path: (string | number)[] = [],
  found: Record<string, string[]> = {},
): Record<string, string[]> {
  const mark = (p: (string | number)[]) => {
    found[p.join(".") || "_"] = [BROKEN_CHARACTER];
  };
  if (typeof value === "string") {
    if (LONE_SURROGATE.test(value)) mark(path);
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => loneSurrogateFields(v, [...path, i], found));
  } else if (value !== null && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      if (LONE_SURROGATE.test(k)) mark([...path, k]);
      loneSurrogateFields(v, [...path, k], found);
    }
  }
  return found;
}

/** Parses one part of the request with a shared zod schema; a failure is a 400 naming each field. */
export function parse<S extends z.ZodType>(
  schema: S,
  req: Request,
  part: Part,
): z.output<S> {
  const raw = req[part] ?? {};
  if (part === "params") {
    const result = schema.safeParse(raw);
    // An address that does not parse (or carries a broken character) names no record.
    if (!result.success || Object.keys(loneSurrogateFields(raw)).length)
      throw new HttpError(404, "not-found", "That record was not found.");
    return result.data;
  }
  const what =
    part === "body" ? "Some fields need attention." : "The query is not valid.";
  // Checked here, once for every route's body and query (and multipart fields), beside the schema.
  const broken = loneSurrogateFields(raw);
  const result = schema.safeParse(raw);
  if (!result.success || Object.keys(broken).length)
    throw new HttpError(400, "validation", what, {
      ...(result.success ? {} : zodFields(result.error)),
      ...broken,
    });
  return result.data;
}
