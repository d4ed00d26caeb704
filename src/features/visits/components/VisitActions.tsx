import { useId, useState } from "react";
import type { ExtendImpact, Visit } from "../../../../shared/schemas";
import {
  Button,
  FormError,
  LinkButton,
  Notice,
  TextField,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { finishText, startText, workingDaysText } from "../../../lib/knock-on";
import { useAnswerVisit } from "../api/answer-visit";
import { useExtendVisit } from "../api/extend-visit";
import { useMarkProgress } from "../api/mark-progress";
import { usePreviewExtend } from "../api/preview-extend";
import { useRunningLate } from "../api/running-late";
import { dayWords } from "../words";

/** "Running late": the time they now expect to arrive, and an optional word for the workshop. */
function RunningLateForm({
  visit,
  onDone,
}: {
  visit: Visit;
  onDone: (message: string) => void;
}) {
  const late = useRunningLate(visit.bookingId);
  const [time, setTime] = useState("");
  const [note, setNote] = useState("");
  const [error, setError] = useState<string | null>(null);
  const id = useId();
  return (
    <form
      noValidate
      aria-label="Running late"
      className="flex flex-col gap-3 rounded border border-rule bg-paper p-3"
      onSubmit={(e) => {
        e.preventDefault();
        if (!/^([01]\d|2[0-3]):[0-5]\d$/.test(time)) {
          setError("Give the time you now expect to arrive, like 10:30.");
          return;
        }
        setError(null);
        late.mutate(
          { arrivalTime: time, note },
          {
            onSuccess: () =>
              onDone(
                `${visit.workshopName} has been told you now arrive at ${time}.`,
              ),
            onError: (err) => setError(errorMessage(err)),
          },
        );
      }}
    >
      <TextField
        id={`${id}-time`}
        label="New arrival time"
        type="time"
        inputClassName="font-mono"
        value={time}
        onChange={(e) => setTime(e.target.value)}
        hint="24-hour clock. The workshop gets an e-mail and a note in the thread."
      />
      <TextField
        id={`${id}-note`}
        label="Anything to add (optional)"
        hint="Only the workshop sees this; the thread says the new time."
        value={note}
        maxLength={300}
        onChange={(e) => setNote(e.target.value)}
      />
      <FormError message={error} />
      <Button
        type="submit"
        className="w-full sm:w-auto sm:self-start"
        busy={late.isPending}
      >
        Tell the workshop
      </Button>
    </form>
  );
}

/** The knock-on of one more day, before the trade confirms it. */
function ExtendKnockOn({ impact }: { impact: ExtendImpact }) {
  const h = impact.handover;
  const handover =
    !h.finishBefore || !h.finishAfter
      ? null
      : h.changeDays > 0
        ? `The planned finish moves ${workingDaysText(h.changeDays)} later, to ${dayWords(h.finishAfter)}${h.date ? ` (agreed handover ${dayWords(h.date)})` : ""}.`
        : `The planned finish stays ${dayWords(h.finishAfter)}.`;
  return (
    <div className="flex flex-col gap-2 text-sm" data-testid="extend-knock-on">
      <p>
        <span className="font-medium">{impact.taskName}</span> would end{" "}
        <span className="font-mono">{finishText(impact.toFinish)}</span> instead
        of <span className="font-mono">{finishText(impact.fromFinish)}</span>.
      </p>
      <div>
        <h4 className="font-semibold">Tasks that move</h4>
        {impact.moves.length === 0 && impact.reconfirm.length === 0 ? (
          <p className="text-ink-soft">Nothing else moves.</p>
        ) : (
          <ul className="mt-1 flex flex-col gap-1" aria-label="Tasks that move">
            {impact.moves.map((m) => (
              <li key={`m-${m.taskName}`}>
                <span className="font-medium">{m.taskName}</span>{" "}
                {workingDaysText(Math.abs(m.byDays))} later,{" "}
                <span className="font-mono text-ink-soft">
                  {startText(m.fromStart)} → {startText(m.toStart)}
                </span>
              </li>
            ))}
            {impact.reconfirm.map((r) => (
              <li key={`r-${r.taskName}`}>
                <span className="font-medium">{r.taskName}</span> would move to{" "}
                <span className="font-mono">{startText(r.proposedStart)}</span>;
                its trade is asked to confirm again.
              </li>
            ))}
          </ul>
        )}
      </div>
      {handover ? <p>{handover}</p> : null}
      {impact.problems.length ? (
        <div className="rounded border border-wait/50 bg-wait-wash px-3 py-2">
          <p className="font-semibold">On your own calendar</p>
          <ul className="list-disc pl-5">
            {impact.problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}

/** "Need another day": preview the knock-on from the server's engine, then confirm it. */
function NeedAnotherDay({
  visit,
  onDone,
}: {
  visit: Visit;
  onDone: (message: string) => void;
}) {
  const preview = usePreviewExtend(visit.bookingId);
  const extend = useExtendVisit(visit.bookingId);
  const [error, setError] = useState<string | null>(null);
  const impact = preview.data;
  if (!impact)
    return (
      <div className="flex flex-col gap-2">
        <Button
          variant="secondary"
          className="w-full sm:w-auto"
          busy={preview.isPending}
          onClick={() =>
            preview.mutate(undefined, {
              onError: (e) => setError(errorMessage(e)),
            })
          }
        >
          Need another day
        </Button>
        <FormError message={error} />
      </div>
    );
  return (
    <section
      aria-label="Need another day"
      className="flex flex-col gap-3 rounded border border-rule bg-paper p-3"
    >
      <h3 className="text-sm font-semibold">
        Another day on {visit.taskName}: the knock-on
      </h3>
      <ExtendKnockOn impact={impact} />
      <FormError message={error} />
      <div className="flex flex-col gap-2 sm:flex-row">
        <Button
          className="w-full sm:w-auto"
          busy={extend.isPending}
          onClick={() =>
            extend.mutate(impact.version, {
              onSuccess: (r) => {
                preview.reset();
                onDone(
                  `Done: ${visit.taskName} now ends ${dayWords(r.impact.toFinish)}. ${visit.workshopName} has been told.`,
                );
              },
              onError: (e) => {
                setError(errorMessage(e));
                preview.reset();
              },
            })
          }
        >
          Yes, I need another day
        </Button>
        <Button
          variant="secondary"
          className="w-full sm:w-auto"
          onClick={() => preview.reset()}
        >
          Keep it as it is
        </Button>
      </div>
    </section>
  );
}

/**
 * What a trade can do on their visit: confirm or propose (on the home list; the visit page has the
 * full answer form), mark their task started or done, upload a template or site photo to it, say
 * they are running late, or that they need another day.
 */
export function VisitActions({
  visit,
  quickAnswer = false,
}: {
  visit: Visit;
  /** Offer Confirm and a link to propose another start (the home list). */
  quickAnswer?: boolean;
}) {
  const answer = useAnswerVisit(visit.bookingId);
  const progress = useMarkProgress(visit.bookingId);
  const [open, setOpen] = useState<"late" | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const c = visit.can;
  const done = (m: string) => {
    setOpen(null);
    setError(null);
    setMessage(m);
  };
  const fail = (e: unknown) => {
    setMessage(null);
    setError(errorMessage(e));
  };
  const mark = (m: "started" | "done") =>
    progress.mutate(
      { mark: m },
      {
        onSuccess: () =>
          done(
            m === "started"
              ? `${visit.taskName} is marked started.`
              : `${visit.taskName} is marked done.`,
          ),
        onError: fail,
      },
    );
  const confirmable = quickAnswer && c.answer && visit.state !== "confirmed";
  const anything =
    confirmable ||
    c.markStarted ||
    c.markDone ||
    c.upload ||
    c.runningLate ||
    c.extend;
  if (!anything) return null;
  return (
    <div className="flex flex-col gap-3">
      {message ? <Notice>{message}</Notice> : null}
      <FormError message={error} />
      <div className="flex flex-col gap-2 sm:flex-row sm:flex-wrap">
        {confirmable ? (
          <>
            <Button
              className="w-full sm:w-auto"
              busy={answer.isPending}
              onClick={() =>
                answer.mutate(
                  { answer: "confirm", proposedStart: null, reason: "" },
                  {
                    onSuccess: () =>
                      done(`Confirmed: ${dayWords(visit.start)}. Thank you.`),
                    onError: fail,
                  },
                )
              }
            >
              Confirm {dayWords(visit.start)}
            </Button>
            <LinkButton
              variant="secondary"
              className="w-full sm:w-auto"
              to={`/visits/${visit.bookingId}#answer-heading`}
            >
              Propose another start
            </LinkButton>
          </>
        ) : null}
        {c.markStarted ? (
          <Button
            className="w-full sm:w-auto"
            busy={progress.isPending}
            onClick={() => mark("started")}
          >
            Mark started
          </Button>
        ) : null}
        {c.markDone ? (
          <Button
            className="w-full sm:w-auto"
            busy={progress.isPending}
            onClick={() => mark("done")}
          >
            Mark done
          </Button>
        ) : null}
        {c.runningLate ? (
          <Button
            variant="secondary"
            className="w-full sm:w-auto"
            aria-expanded={open === "late"}
            onClick={() => setOpen(open === "late" ? null : "late")}
          >
            Running late
          </Button>
        ) : null}
        {c.upload ? (
          <LinkButton
            variant="secondary"
            className="w-full sm:w-auto"
            to={`/jobs/${visit.jobId}#job-drawings`}
          >
            Upload a template or photo
          </LinkButton>
        ) : null}
      </div>
      {open === "late" ? <RunningLateForm visit={visit} onDone={done} /> : null}
      {c.extend ? <NeedAnotherDay visit={visit} onDone={done} /> : null}
    </div>
  );
}
