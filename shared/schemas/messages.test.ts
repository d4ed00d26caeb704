import { describe, expect, it } from "vitest";
import { z } from "zod";
import "./messages";

const messageOf = (schema: z.ZodType, value: unknown) => {
  const r = schema.safeParse(value);
  if (r.success) throw new Error("expected a refusal");
  return r.error.issues[0].message;
};

describe("validation messages in plain sentences (issue 16)", () => {
  it("says the limit in words, not the library's", () => {
    expect(messageOf(z.string().max(160), "x".repeat(161))).toBe(
      "At most 160 characters.",
    );
    expect(messageOf(z.string().min(1), "")).toBe("Fill this in.");
    expect(messageOf(z.string(), undefined)).toBe("Fill this in.");
    expect(messageOf(z.number().int().max(31), 40)).toBe("At most 31.");
    expect(messageOf(z.array(z.string()).max(2), ["a", "b", "c"])).toBe(
      "At most 2 items.",
    );
    expect(messageOf(z.email(), "not an address")).toBe(
      "Enter an e-mail address, like name@example.test.",
    );
    expect(messageOf(z.enum(["FS", "SS", "FF"]), "XX")).toBe(
      "Choose one of: FS, SS, FF.",
    );
    expect(messageOf(z.number(), "3")).toBe("This should be a number.");
  });

  it("keeps a message written on the schema", () => {
    expect(messageOf(z.string().min(1, "Choose a trade"), "")).toBe(
      "Choose a trade",
    );
  });
});
