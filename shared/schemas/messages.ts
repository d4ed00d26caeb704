// Validation messages in plain sentences (issue 16), for every schema on both sides: before,
// people read the schema library's own words ("Too big: expected string to have <=160
// characters"). A message written on a schema (`.min(1, "Choose a trade")`) still wins; this
// words only what a schema leaves unsaid. Installed once, by importing shared/schemas.
import { z } from "zod";

const typeWords: Record<string, string> = {
  string: "text",
  number: "a number",
  int: "a whole number",
  boolean: "yes or no",
  array: "a list",
  object: "a set of fields",
  date: "a date",
};

const formatWords: Record<string, string> = {
  email: "Enter an e-mail address, like name@example.test.",
  uuid: "This is not a valid reference.",
  url: "Enter a web address, starting https://.",
  date: "Enter a date as YYYY-MM-DD.",
  datetime: "Enter a date and time.",
  time: "Enter a time as HH:MM on the 24-hour clock.",
  regex: "This is not in the expected form.",
};

const plural = (n: number | bigint, one: string, many = `${one}s`) =>
  `${n} ${Number(n) === 1 ? one : many}`;

/** The sentence for one issue, or undefined to keep the library's. */
export function plainMessage(iss: z.core.$ZodRawIssue): string | undefined {
  switch (iss.code) {
    case "invalid_type":
      if (iss.input === undefined || iss.input === null) return "Fill this in.";
      return `This should be ${typeWords[iss.expected] ?? iss.expected}.`;
    case "too_big": {
      const max = iss.maximum as number;
      if (iss.origin === "string")
        return `At most ${plural(max, "character")}.`;
      if (iss.origin === "array" || iss.origin === "set")
        return `At most ${plural(max, "item")}.`;
      if (iss.origin === "number" || iss.origin === "int")
        return iss.inclusive === false
          ? `Less than ${max}.`
          : `At most ${max}.`;
      return undefined;
    }
    case "too_small": {
      const min = iss.minimum as number;
      if (iss.origin === "string")
        return min <= 1
          ? "Fill this in."
          : `At least ${plural(min, "character")}.`;
      if (iss.origin === "array" || iss.origin === "set")
        return `Choose at least ${plural(min, "item")}.`;
      if (iss.origin === "number" || iss.origin === "int")
        return iss.inclusive === false
          ? `More than ${min}.`
          : `At least ${min}.`;
      return undefined;
    }
    case "invalid_format":
      return formatWords[iss.format] ?? "This is not in the expected form.";
    case "invalid_value":
      return iss.values.length === 1
        ? `This should be ${String(iss.values[0])}.`
        : `Choose one of: ${iss.values.map(String).join(", ")}.`;
    case "unrecognized_keys":
      return `Not a field here: ${iss.keys.join(", ")}.`;
    default:
      return undefined;
  }
}

z.config({ customError: (iss) => plainMessage(iss) });
