import { useState } from "react";
import type { TradeResponse } from "../../../../shared/schemas";
import { Button, FormError, PartyChip } from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { formatWeekdays } from "../../../lib/format";
import { useDeleteTrade } from "../api/delete-trade";
import { AddTradeForm } from "./AddTradeForm";

function DeleteTrade({ trade }: { trade: TradeResponse }) {
  const [confirming, setConfirming] = useState(false);
  const remove = useDeleteTrade();
  if (!confirming) {
    return (
      <Button
        variant="quiet-danger"
        size="sm"
        onClick={() => setConfirming(true)}
      >
        Delete<span className="sr-only"> {trade.businessName}</span>
      </Button>
    );
  }
  return (
    <div
      role="group"
      aria-label={`Confirm deleting ${trade.businessName}`}
      className="flex flex-col gap-2 rounded border border-risk/40 bg-risk-wash p-2.5"
    >
      <p className="text-sm">
        Delete {trade.businessName} from the workshop's trades? This cannot be
        undone.
      </p>
      <FormError message={remove.isError ? errorMessage(remove.error) : null} />
      <div className="flex flex-wrap gap-2">
        <Button
          variant="danger"
          size="sm"
          busy={remove.isPending}
          onClick={() => remove.mutate(trade.id)}
        >
          Delete
        </Button>
        <Button
          variant="secondary"
          size="sm"
          autoFocus
          onClick={() => setConfirming(false)}
        >
          Keep
        </Button>
      </div>
    </div>
  );
}

/** The workshop's trades; contact details are the workshop's own records. */
export function TradesList({
  trades,
  canDelete,
  canEdit,
  workshopId,
}: {
  trades: TradeResponse[];
  canDelete: boolean;
  canEdit: boolean;
  workshopId: string;
}) {
  const [editing, setEditing] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  return (
    <ul className="flex flex-col divide-y divide-rule rounded border border-rule bg-card">
      {trades.map((t) =>
        editing === t.id ? (
          <li key={t.id} className="px-4 py-4">
            <h3 className="mb-3 font-semibold">Edit {t.businessName}</h3>
            <AddTradeForm
              workshopId={workshopId}
              trade={t}
              onAdded={() => {
                setEditing(null);
                setSaved(t.id);
              }}
              onCancel={() => setEditing(null)}
            />
          </li>
        ) : (
          <li
            key={t.id}
            className="grid gap-2 px-4 py-3 md:grid-cols-[minmax(0,1.4fr)_minmax(0,1fr)_minmax(0,1.3fr)_auto] md:items-start md:gap-4"
          >
            <div className="flex min-w-0 flex-col gap-1">
              <span className="font-semibold">{t.businessName}</span>
              <span className="flex flex-wrap items-center gap-2">
                <PartyChip party={t.kind} />
                {t.hasAccount ? (
                  <span className="text-xs text-ink-soft">Has signed in</span>
                ) : t.emailHasAccount ? (
                  // Only that an account exists: never where else they work (issue 14).
                  <span className="text-xs text-ink-soft">
                    Has a Sitecue account — they will be asked to link it
                  </span>
                ) : null}
              </span>
            </div>
            <div className="min-w-0 text-sm">
              <span className="block">{t.contactName}</span>
              <span className="block font-mono text-ink-soft">
                {formatWeekdays(t.workingWeekdays)} {t.dayStart}–{t.dayEnd}
              </span>
            </div>
            <div className="flex min-w-0 flex-col text-sm">
              <a
                href={`mailto:${t.email}`}
                className="break-all text-accent underline underline-offset-2"
              >
                {t.email}
              </a>
              <a
                href={`tel:${t.phone.replace(/[^+0-9]/g, "")}`}
                className="font-mono text-accent underline underline-offset-2"
              >
                {t.phone}
              </a>
            </div>
            {canDelete || canEdit ? (
              <div className="flex flex-wrap items-start gap-2 md:justify-end">
                {saved === t.id ? (
                  <span role="status" className="text-sm text-ink-soft">
                    Saved.
                  </span>
                ) : null}
                {canEdit ? (
                  <Button
                    variant="secondary"
                    size="sm"
                    onClick={() => {
                      setSaved(null);
                      setEditing(t.id);
                    }}
                  >
                    Edit<span className="sr-only"> {t.businessName}</span>
                  </Button>
                ) : null}
                {canDelete ? <DeleteTrade trade={t} /> : null}
              </div>
            ) : null}
          </li>
        ),
      )}
    </ul>
  );
}
