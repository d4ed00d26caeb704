// The words for a trade kind (or the workshop), once for e-mails, calendar text, feeds and
// screens (issue 16): before, six maps disagreed ("Flooring" on the trades form, "Flooring
// fitter" on the timeline). A new trade kind is one row here and one in shared/schemas/common.ts.
import type { Party } from "../schemas/common";

export interface PartyWords {
  /** The person, as a heading or before a business name: "Plasterer", "Flooring fitter". */
  title: string;
  /** Inside a sentence: "book a plasterer", "no flooring fitter is booked". */
  noun: string;
  /** As a choice in a form or filter: "Plasterer", "Other trade". */
  choice: string;
}

export const partyWords: Record<Party, PartyWords> = {
  workshop: { title: "Workshop", noun: "workshop", choice: "Workshop" },
  plasterer: { title: "Plasterer", noun: "plasterer", choice: "Plasterer" },
  decorator: { title: "Decorator", noun: "decorator", choice: "Decorator" },
  electrician: {
    title: "Electrician",
    noun: "electrician",
    choice: "Electrician",
  },
  flooring: {
    title: "Flooring fitter",
    noun: "flooring fitter",
    choice: "Flooring fitter",
  },
  plumber: { title: "Plumber", noun: "plumber", choice: "Plumber" },
  other: { title: "Trade", noun: "trade", choice: "Other trade" },
};

/** "Plasterer", "Flooring fitter". */
export const partyTitle = (p: Party): string => partyWords[p].title;

/** "plasterer", "flooring fitter". */
export const partyNoun = (p: Party): string => partyWords[p].noun;

/** With its article: "a plasterer", "an electrician". */
export const aParty = (p: Party): string =>
  `${/^[aeiou]/.test(partyWords[p].noun) ? "an" : "a"} ${partyWords[p].noun}`;
