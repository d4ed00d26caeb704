// The knock-on of a proposed move in words, with Save and Cancel: the programme screen and the
// calendars show the same panel.
import type { Ref } from "react";
import type { ProgrammeResponse } from "../../shared/schemas";
import {
  dayText,
  finishText,
  startText,
  workingDaysText,
  type Preview,
} from "../lib/knock-on";
import { Button, FormError } from "./ui";

type Impact = Preview["impact"];

/** "Planned finish moves from Mon 14 Dec to Wed 16 Dec" / "Planned finish stays Mon 14 Dec" (never "handover": that is the agreed date). */
export function handoverSentence(impact: Impact): string {
  const { finishBefore, finishAfter } = impact.handover;
  if (!finishBefore || !finishAfter) return "No planned finish yet";
  if (dayText(finishBefore) === dayText(finishAfter))
    return `Planned finish stays ${dayText(finishAfter)}`;
  return `Planned finish moves from ${dayText(finishBefore)} to ${dayText(finishAfter)}`;
}

export function movesSentence(byDays: number): string {
  if (byDays === 0) return "moves within the day";
  return `moves ${workingDaysText(Math.abs(byDays))} ${byDays > 0 ? "later" : "earlier"}`;
}

/** The knock-on of a proposed move (or the server's answer to one), in words. */
export function ImpactSummary({
  programme,
  impact,
}: {
  programme: ProgrammeResponse;
  impact: Impact;
}) {
  const name = (id: string) =>
    programme.tasks.find((t) => t.id === id)?.name ?? "A task";
  const trade = (id: string) =>
    programme.tasks.find((t) => t.id === id)?.booking?.tradeName;
  const slip = impact.handover.slipDaysAfter;
  return (
    <div className="flex flex-col gap-3 text-sm">
      <div>
        <h4 className="font-semibold">Tasks that move</h4>
        {impact.moves.length === 0 ? (
          <p className="text-ink-soft">Nothing moves.</p>
        ) : (
          <ul className="mt-1 flex flex-col gap-1" aria-label="Tasks that move">
            {impact.moves.map((m) => (
              <li key={m.task} className="flex flex-wrap gap-x-2">
                <span className="font-medium">{name(m.task)}</span>
                <span>{movesSentence(m.byDays)}</span>
                <span className="font-mono text-ink-soft">
                  {startText(m.fromStart)} → {startText(m.toStart)}
                </span>
              </li>
            ))}
          </ul>
        )}
      </div>
      <p className="font-medium" data-testid="handover-change">
        {handoverSentence(impact)}
        {slip !== null && slip > 0 ? (
          <span className="text-risk">
            {" "}
            — {workingDaysText(slip)} past the handover date
            {programme.handover ? ` (${dayText(programme.handover)})` : ""}
          </span>
        ) : null}
      </p>
      {impact.reconfirm.length > 0 ? (
        <div>
          <h4 className="font-semibold">Bookings to re-confirm</h4>
          <ul className="mt-1 flex flex-col gap-1">
            {impact.reconfirm.map((r) => (
              <li key={r.task}>
                <span className="font-medium">{name(r.task)}</span>
                {trade(r.task) ? ` (${trade(r.task)})` : ""}: booked{" "}
                <span className="font-mono">{startText(r.bookedStart)}</span>,
                proposed{" "}
                <span className="font-mono">{startText(r.proposedStart)}</span>.{" "}
                <span className="text-ink-soft">{r.reason}.</span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}

export interface KnockOnPanelProps {
  programme: ProgrammeResponse;
  preview: Preview;
  saving: boolean;
  error: string | null;
  onSave: () => void;
  onCancel: () => void;
  headingRef?: Ref<HTMLHeadingElement>;
}

/** The instant knock-on of a drag, worked out in the browser, with Save and Cancel. */
export function KnockOnPanel({
  programme,
  preview,
  saving,
  error,
  onSave,
  onCancel,
  headingRef,
}: KnockOnPanelProps) {
  const task = programme.tasks.find((t) => t.id === preview.taskId);
  const after = preview.result.tasks.find((t) => t.id === preview.taskId);
  return (
    <section
      aria-labelledby="knock-on-heading"
      className="rounded border border-accent/50 border-l-4 border-l-accent bg-accent-wash/60 p-4"
      onKeyDown={(e) => {
        if (e.key === "Escape") onCancel();
      }}
    >
      <h3
        id="knock-on-heading"
        ref={headingRef}
        tabIndex={-1}
        className="text-base font-semibold"
      >
        Knock-on of moving {task?.name ?? "the task"}
      </h3>
      <p className="mb-3 text-sm text-ink-soft">
        Not earlier than{" "}
        <span className="font-mono text-ink">
          {dayText(preview.notEarlierThan)}
        </span>
        {after ? (
          <>
            {" "}
            — planned{" "}
            <span className="font-mono text-ink">
              {startText(after.plannedStart)} to{" "}
              {finishText(after.plannedFinish)}
            </span>
          </>
        ) : null}
        . Not saved yet.
      </p>
      <div aria-live="polite">
        <ImpactSummary programme={programme} impact={preview.impact} />
      </div>
      <FormError message={error} className="mt-3" />
      <div className="mt-4 flex flex-wrap gap-2">
        <Button onClick={onSave} busy={saving}>
          Save the move
        </Button>
        <Button variant="secondary" onClick={onCancel} disabled={saving}>
          Cancel
        </Button>
      </div>
    </section>
  );
}
