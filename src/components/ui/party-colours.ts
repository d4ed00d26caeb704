import type { Party } from "../../../shared/schemas";

/**
 * Each party's colour token (the theme's `trade-*` colours) as the classes the screens use, in
 * one place: a chip's swatch, a bar's fill, a calendar entry's left rule. Written out in full so
 * Tailwind finds every class. Colour is decoration: the party's words always stand beside it.
 */
export const partyColours: Record<Party, { fill: string; rule: string }> = {
  workshop: { fill: "bg-trade-workshop", rule: "border-l-trade-workshop" },
  plasterer: { fill: "bg-trade-plasterer", rule: "border-l-trade-plasterer" },
  decorator: { fill: "bg-trade-decorator", rule: "border-l-trade-decorator" },
  electrician: {
    fill: "bg-trade-electrician",
    rule: "border-l-trade-electrician",
  },
  flooring: { fill: "bg-trade-flooring", rule: "border-l-trade-flooring" },
  plumber: { fill: "bg-trade-plumber", rule: "border-l-trade-plumber" },
  other: { fill: "bg-trade-other", rule: "border-l-trade-other" },
};
