import { expect, it } from "vitest";
import { partySchema } from "../schemas/common";
import { aParty, partyNoun, partyTitle, partyWords } from "./trades";

it("words every party, the same word on every surface (issue 16)", () => {
  for (const p of partySchema.options) {
    const w = partyWords[p];
    expect(w.title.length, p).toBeGreaterThan(0);
    // The noun is the title in a sentence: same words, lower case.
    expect(w.noun, p).toBe(w.title.toLowerCase());
  }
  expect(partyTitle("flooring")).toBe("Flooring fitter");
  expect(partyNoun("flooring")).toBe("flooring fitter");
  expect(aParty("electrician")).toBe("an electrician");
  expect(aParty("plasterer")).toBe("a plasterer");
});
