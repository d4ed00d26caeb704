import type { Party } from "./common";
import type { Hazard } from "./programme";

// The brief's Safety section: a short caution that defers to local regulations and licensed
// practice. Sitecue plans work; it does not certify it. Shared, so the programme screen derives
// each task's caution from its party and hazards rather than receiving the sentence per task.
const cautions: Record<Hazard, string> = {
  electrical:
    "Electrical work: to be done by a qualified, registered electrician under local regulations. Isolate circuits before cabinets are fixed over cable routes.",
  height:
    "Work at height: use suitable steps or a platform and follow local work-at-height rules; do not stand on worktops or carcasses.",
  "tall-unit":
    "Tall units: fix to the wall with fixings suited to the wall type before loading shelves or hanging doors; check for hidden cables and pipes first.",
};

/** The caution text for a task, from its hazards (electrical work is always flagged). */
export function cautionFor(
  party: Party,
  hazards: readonly Hazard[],
): string | null {
  const all = new Set<Hazard>(hazards);
  if (party === "electrician") all.add("electrical");
  if (all.size === 0) return null;
  return (
    [...all].map((h) => cautions[h]).join(" ") +
    " Sitecue plans work; it does not certify it."
  );
}
