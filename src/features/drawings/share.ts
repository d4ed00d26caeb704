import type { DrawingSharing, TradeKind } from "../../../shared/schemas";
import { partyLabels } from "../../lib/labels";

/** Who on the job a drawing can be shared with; the route gathers it from the job. */
export interface ShareOptions {
  /** The trade kinds with a task on the job. */
  tradeKinds: TradeKind[];
  /** The named trades on the job. */
  trades: { id: string; name: string; kind: TradeKind }[];
  /** The job's customer, when there is one. */
  customerName: string | null;
}

export interface ShareValue {
  tradeKinds: TradeKind[];
  tradeIds: string[];
  customer: boolean;
}

export const noSharing: ShareValue = {
  tradeKinds: [],
  tradeIds: [],
  customer: false,
};

export function shareValueOf(s: DrawingSharing): ShareValue {
  return {
    tradeKinds: s.tradeKinds,
    tradeIds: s.trades.map((t) => t.id),
    customer: s.customer,
  };
}

/** "Every plasterer on the job, Brightwire Electrical and the customer", or "Only the workshop". */
export function sharingText(s: DrawingSharing): string {
  const parts = [
    ...s.tradeKinds.map(
      (k) => `every ${partyLabels[k].toLowerCase()} on the job`,
    ),
    ...s.trades.map((t) => t.name),
    ...(s.customer ? ["the customer"] : []),
  ];
  if (parts.length === 0) return "Only the workshop";
  const list =
    parts.length === 1
      ? parts[0]
      : `${parts.slice(0, -1).join(", ")} and ${parts[parts.length - 1]}`;
  return list.charAt(0).toUpperCase() + list.slice(1);
}
