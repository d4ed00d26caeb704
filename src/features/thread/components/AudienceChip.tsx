import {
  threadAudienceLabels,
  type ThreadAudience,
} from "../../../../shared/schemas";
import { StatusBadge } from "../../../components/ui";

// The words carry the meaning; the tone only helps the eye tell a workshop-only note from one
// the customer reads too.
const tone = {
  job: "ok",
  trades: "accent",
  workshop: "wait",
} as const satisfies Record<ThreadAudience, string>;

export function AudienceChip({ audience }: { audience: ThreadAudience }) {
  return (
    <StatusBadge tone={tone[audience]}>
      {threadAudienceLabels[audience]}
    </StatusBadge>
  );
}

/** Who reads a message posted to each audience, said plainly beside the composer's choice. */
export const audienceReaders: Record<ThreadAudience, string> = {
  job: "Everyone on the job sees it, the customer too.",
  trades:
    "The workshop and the trades on the job see it; the customer does not.",
  workshop: "Only the workshop's own people see it.",
};
