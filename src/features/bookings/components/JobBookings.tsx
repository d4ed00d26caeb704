import { stateIs } from "../../../../shared/bookings/lifecycle";
import { useState } from "react";
import { useSearchParams } from "react-router-dom";
import type { BookingResponse, Party } from "../../../../shared/schemas";
import {
  BookingStateBadge,
  Button,
  EmptyState,
  ErrorState,
  FormError,
  LoadingState,
  Notice,
  PartyChip,
  Section,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { bookingStateLabels } from "../../../lib/labels";
import { useChaseBooking } from "../api/chase-booking";
import { useDecideProposal } from "../api/decide-proposal";
import { useJobBookings } from "../api/list-job-bookings";
import { useUnansweredBookings } from "../api/list-unanswered";
import { useSendBooking } from "../api/send-booking";
import {
  aKind,
  channelWords,
  dayWords,
  kindNoun,
  visitWords,
  whenWords,
} from "../words";
import { BookTradePanel } from "./BookTradePanel";
import {
  CancelBookingForm,
  CopyLinkButton,
  RecordAnswerForm,
} from "./BookingActions";

/** A task as the bookings screens need it. */
export interface BookableTask {
  id: string;
  name: string;
  party: Party;
  caution: string | null;
  /** Marked done: nothing to book any more (issue 16: done work asked for a booking). */
  done?: boolean;
}

/** A booking that holds its task (the lifecycle table): a new one cannot be made beside it. */
export const isStanding = (b: BookingResponse) => stateIs(b.state, "standing");

/** How long a sent booking waits for an answer before it is flagged to chase. */
const UNANSWERED_HOURS = 48;

/**
 * Who and how, for one history entry. An answer by phone or text is the trade's, recorded by a
 * member: both are named. A member sending through Sitecue needs no "how".
 */
function historyWho(
  b: BookingResponse,
  e: BookingResponse["history"][number],
): string {
  if (
    (e.channel === "phone" || e.channel === "text") &&
    e.who !== b.tradeBusinessName
  )
    return `${b.tradeBusinessName}, ${channelWords[e.channel]} (recorded by ${e.who})`;
  if (e.channel === "system" && e.who !== "Sitecue") return e.who;
  return `${e.who}, ${channelWords[e.channel]}`;
}

function History({ booking }: { booking: BookingResponse }) {
  if (booking.history.length === 0) return null;
  return (
    <details className="text-sm">
      <summary className="cursor-pointer text-accent underline-offset-2 hover:underline">
        History ({booking.history.length})
      </summary>
      <ol className="mt-2 flex flex-col gap-1.5 border-l border-rule pl-3">
        {[...booking.history].reverse().map((e, i) => (
          <li key={`${e.at}-${i}`} className="flex flex-col">
            <span>
              <span className="font-medium">
                {bookingStateLabels[e.toState]}
              </span>{" "}
              — {historyWho(booking, e)}
            </span>
            <span className="font-mono text-xs text-ink-soft">
              {whenWords(e.at)}
            </span>
            {e.note ? (
              <span className="whitespace-pre-line text-ink-soft">
                {e.note}
              </span>
            ) : null}
          </li>
        ))}
      </ol>
    </details>
  );
}

type Open = "answer" | "cancel" | "book-another" | "edit" | null;

function BookingItem({
  jobId,
  booking: b,
  task,
  canBookAnother,
  unanswered,
  targeted,
  initialOpen,
  onChanged,
  onNotice,
}: {
  jobId: string;
  booking: BookingResponse;
  task: BookableTask | undefined;
  canBookAnother: boolean;
  /** Sent and not answered for longer than the workshop waits before chasing. */
  unanswered: boolean;
  /** The booking a link pointed at (`?booking=<id>`): shown marked, and focused. */
  targeted: boolean;
  /** A form to open at once (`&open=book-another` from the attention list's "Book the next …"). */
  initialOpen: Open;
  onChanged?: () => void;
  onNotice: (text: string) => void;
}) {
  const [open, setOpen] = useState<Open>(initialOpen);
  const [error, setError] = useState<string | null>(null);
  const send = useSendBooking(jobId);
  const chase = useChaseBooking(jobId);
  const decide = useDecideProposal(jobId);
  const kind = kindNoun(b.tradeKind);

  const act = async (fn: () => Promise<unknown>, text: string) => {
    setError(null);
    try {
      await fn();
      onChanged?.();
      onNotice(text);
    } catch (e) {
      setError(errorMessage(e));
    }
  };
  const done = (text: string) => () => {
    setOpen(null);
    onChanged?.();
    onNotice(text);
  };

  const unansweredSince = unanswered ? b.sentAt : null;
  const waiting =
    b.state === "sent" ||
    b.state === "needs-reconfirming" ||
    b.state === "date-proposed";
  const live = waiting || b.state === "confirmed";

  return (
    <li
      id={`booking-${b.id}`}
      tabIndex={-1}
      className={
        targeted
          ? "-mx-2 flex scroll-mt-4 flex-col gap-2 rounded border border-accent/50 bg-accent-wash px-2 py-3 outline-none focus-visible:ring-2 focus-visible:ring-accent"
          : "flex scroll-mt-4 flex-col gap-2 py-3 outline-none first:pt-0 last:pb-0 focus-visible:ring-2 focus-visible:ring-accent"
      }
      aria-label={`${b.tradeBusinessName}, ${b.taskName}`}
      aria-current={targeted ? "true" : undefined}
    >
      <div className="grid gap-1.5 sm:grid-cols-[1fr_auto] sm:gap-4">
        <div className="flex min-w-0 flex-col gap-1">
          <div className="flex flex-wrap items-center gap-2">
            <span className="font-medium">{b.tradeBusinessName}</span>
            <PartyChip party={b.tradeKind} />
            <BookingStateBadge state={b.state} />
          </div>
          <p className="text-sm text-ink-soft">For: {b.taskName}</p>
        </div>
        <p className="font-mono text-sm sm:text-right">{visitWords(b)}</p>
      </div>
      {b.state === "date-proposed" && b.proposedStart ? (
        <p className="rounded border border-wait/40 bg-wait-wash px-3 py-2 text-sm">
          {b.tradeBusinessName} proposes to start{" "}
          <span className="font-mono font-medium">
            {dayWords(b.proposedStart)}
          </span>{" "}
          instead.
        </p>
      ) : null}
      {unansweredSince ? (
        <p className="text-sm font-medium text-wait-ink">
          No answer since {whenWords(unansweredSince)}
        </p>
      ) : null}
      {b.overrideReason ? (
        <p className="text-sm text-ink-soft">
          Booked despite a clash: {b.overrideReason}
        </p>
      ) : null}
      <History booking={b} />
      <FormError message={error} />
      <div className="flex flex-wrap items-start gap-2">
        {b.state === "draft" ? (
          <Button
            size="sm"
            busy={send.isPending}
            onClick={() =>
              act(
                () => send.mutateAsync(b.id),
                `Sent to ${b.tradeBusinessName}.`,
              )
            }
          >
            Send
          </Button>
        ) : null}
        {b.state === "draft" ? (
          <Button
            size="sm"
            variant="secondary"
            aria-expanded={open === "edit"}
            onClick={() => setOpen(open === "edit" ? null : "edit")}
          >
            Change<span className="sr-only"> the draft for {b.taskName}</span>
          </Button>
        ) : null}
        {b.state === "date-proposed" && b.proposedStart ? (
          <>
            <Button
              size="sm"
              busy={decide.isPending && decide.variables?.body.accept}
              disabled={decide.isPending}
              onClick={() =>
                act(
                  () =>
                    decide.mutateAsync({
                      bookingId: b.id,
                      body: { accept: true, note: "" },
                    }),
                  `${dayWords(b.proposedStart!)} accepted: ${b.tradeBusinessName} is booked for it.`,
                )
              }
            >
              Accept {dayWords(b.proposedStart)}
            </Button>
            <Button
              size="sm"
              variant="secondary"
              busy={decide.isPending && !decide.variables?.body.accept}
              disabled={decide.isPending}
              onClick={() =>
                act(
                  () =>
                    decide.mutateAsync({
                      bookingId: b.id,
                      body: { accept: false, note: "" },
                    }),
                  `The proposed start was rejected; ${b.tradeBusinessName} is asked again for ${dayWords(b.start)}.`,
                )
              }
            >
              Reject
            </Button>
          </>
        ) : null}
        {live && !b.visitOver ? <CopyLinkButton booking={b} /> : null}
        {b.state === "sent" || b.state === "needs-reconfirming" ? (
          <Button
            size="sm"
            variant="secondary"
            busy={chase.isPending}
            onClick={() =>
              act(
                () => chase.mutateAsync(b.id),
                `${b.tradeBusinessName} has been sent the invitation again.`,
              )
            }
          >
            Chase
          </Button>
        ) : null}
        {live ? (
          <Button
            size="sm"
            variant="secondary"
            aria-expanded={open === "answer"}
            onClick={() => setOpen(open === "answer" ? null : "answer")}
          >
            Record answer
          </Button>
        ) : null}
        {b.state === "declined" && canBookAnother ? (
          <Button
            size="sm"
            aria-expanded={open === "book-another"}
            onClick={() =>
              setOpen(open === "book-another" ? null : "book-another")
            }
          >
            Book another {kind}
          </Button>
        ) : null}
        {isStanding(b) ? (
          <Button
            size="sm"
            variant="quiet-danger"
            aria-expanded={open === "cancel"}
            onClick={() => setOpen(open === "cancel" ? null : "cancel")}
          >
            Cancel booking
          </Button>
        ) : null}
      </div>
      {open === "answer" ? (
        <RecordAnswerForm
          jobId={jobId}
          booking={b}
          onCancel={() => setOpen(null)}
          onDone={(nb) =>
            done(
              `${b.tradeBusinessName}'s answer recorded: ${bookingStateLabels[nb.state].toLowerCase()}.`,
            )()
          }
        />
      ) : null}
      {open === "cancel" ? (
        <CancelBookingForm
          jobId={jobId}
          booking={b}
          onCancel={() => setOpen(null)}
          onDone={done(`The booking of ${b.tradeBusinessName} is cancelled.`)}
        />
      ) : null}
      {open === "edit" ? (
        <BookTradePanel
          jobId={jobId}
          taskId={b.taskId}
          caution={task?.caution}
          editing={b}
          onClose={() => setOpen(null)}
          onBooked={(nb) =>
            done(
              `The draft is changed: ${nb.tradeBusinessName} for ${visitWords(nb)}.`,
            )()
          }
        />
      ) : null}
      {open === "book-another" ? (
        <BookTradePanel
          jobId={jobId}
          taskId={b.taskId}
          caution={task?.caution}
          onClose={() => setOpen(null)}
          onBooked={(nb) =>
            done(
              nb.state === "draft"
                ? `${nb.tradeBusinessName} saved as a draft for ${visitWords(nb)}.`
                : `Sent to ${nb.tradeBusinessName} for ${visitWords(nb)}.`,
            )()
          }
        />
      ) : null}
    </li>
  );
}

/**
 * The job's bookings for the workshop: each with its state, dates, history and the actions
 * that fit its state; and the trade tasks not yet booked, each one click from booking.
 */
export function JobBookings({
  jobId,
  workshopId,
  tasks,
  onChanged,
}: {
  jobId: string;
  workshopId: string;
  tasks: BookableTask[];
  /** Called after any change, so the caller can refresh what it shows from the job. */
  onChanged?: () => void;
}) {
  const bookings = useJobBookings(jobId);
  const unanswered = useUnansweredBookings(workshopId, UNANSWERED_HOURS);
  const late = new Set((unanswered.data ?? []).map((b) => b.id));
  const [notice, setNotice] = useState<string | null>(null);
  // Links into this panel (the attention list's fixes): ?booking=<id>[&open=book-another], ?book=<taskId>.
  const [params] = useSearchParams();
  const targetId = params.get("booking");
  const [booking, setBooking] = useState<string | null>(() =>
    params.get("book"),
  );

  let body: React.ReactNode;
  if (bookings.isPending) body = <LoadingState label="Loading the bookings…" />;
  else if (bookings.isError)
    body = (
      <ErrorState error={bookings.error} onRetry={() => bookings.refetch()} />
    );
  else {
    const list = bookings.data;
    const standingTask = new Set(list.filter(isStanding).map((b) => b.taskId));
    // A declined booking offers "Book another" on its own line while nothing else holds the
    // task; "Not booked yet" lists the trade tasks nobody has been asked for.
    const asked = new Set(
      list.filter((b) => b.state === "declined").map((b) => b.taskId),
    );
    const unbooked = tasks.filter(
      (t) =>
        t.party !== "workshop" &&
        !t.done &&
        !standingTask.has(t.id) &&
        !asked.has(t.id),
    );
    const taskOf = (id: string) => tasks.find((t) => t.id === id);
    body = (
      <div className="flex flex-col gap-4">
        {notice ? <Notice>{notice}</Notice> : null}
        {list.length === 0 ? (
          <EmptyState title="No bookings yet">
            Book each trade task below; their answers appear here.
          </EmptyState>
        ) : (
          <ul
            className="flex flex-col divide-y divide-rule"
            aria-label="Bookings"
          >
            {list.map((b) => (
              <BookingItem
                key={b.id}
                jobId={jobId}
                booking={b}
                task={taskOf(b.taskId)}
                canBookAnother={!standingTask.has(b.taskId)}
                unanswered={late.has(b.id)}
                targeted={targetId === b.id}
                initialOpen={
                  targetId === b.id &&
                  params.get("open") === "book-another" &&
                  b.state === "declined" &&
                  !standingTask.has(b.taskId)
                    ? "book-another"
                    : null
                }
                onChanged={onChanged}
                onNotice={setNotice}
              />
            ))}
          </ul>
        )}
        {unbooked.length > 0 ? (
          <div className="flex flex-col gap-2 border-t border-rule pt-3">
            <h3 className="text-sm font-semibold">Not booked yet</h3>
            <ul className="flex flex-col gap-2">
              {unbooked.map((t) => {
                return (
                  <li
                    key={t.id}
                    id={`book-${t.id}`}
                    tabIndex={-1}
                    className="flex scroll-mt-4 flex-col gap-2 outline-none focus-visible:ring-2 focus-visible:ring-accent"
                  >
                    <div className="flex flex-wrap items-center gap-2">
                      <span>{t.name}</span>
                      <PartyChip party={t.party} />
                      <Button
                        size="sm"
                        variant="secondary"
                        aria-expanded={booking === t.id}
                        aria-label={`Book ${aKind(t.party)} for ${t.name}`}
                        onClick={() =>
                          setBooking(booking === t.id ? null : t.id)
                        }
                      >
                        Book {aKind(t.party)}
                      </Button>
                    </div>
                    {booking === t.id ? (
                      <BookTradePanel
                        jobId={jobId}
                        taskId={t.id}
                        caution={t.caution}
                        onClose={() => setBooking(null)}
                        onBooked={(nb) => {
                          setBooking(null);
                          onChanged?.();
                          setNotice(
                            nb.state === "draft"
                              ? `${nb.tradeBusinessName} saved as a draft for ${visitWords(nb)}.`
                              : `Sent to ${nb.tradeBusinessName} for ${visitWords(nb)}.`,
                          );
                        }}
                      />
                    ) : null}
                  </li>
                );
              })}
            </ul>
          </div>
        ) : null}
      </div>
    );
  }

  return (
    <Section
      title="Bookings"
      id="job-bookings"
      description="Each trade's booking, their answer and how it came."
    >
      {body}
    </Section>
  );
}
