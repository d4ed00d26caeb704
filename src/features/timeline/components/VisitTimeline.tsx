import { useEffect, useRef, useState, useSyncExternalStore } from "react";
import type {
  TimelineResponse,
  TimelineVisit,
} from "../../../../shared/schemas";
import {
  ErrorState,
  EmptyState,
  LoadingState,
  PartyChip,
  Section,
  StatusBadge,
} from "../../../components/ui";
import { isApiError } from "../../../lib/api-client";
import { useTimeline } from "../api/get-timeline";
import { useMarkTimelineSeen } from "../api/mark-seen";
import {
  arrivalWords,
  dayWords,
  daysWords,
  listWords,
  unsettledWords,
  wasWords,
  whoWords,
} from "../words";

/** How long the timeline must be on screen before it counts as seen. */
const SEEN_AFTER_MS = 1500;

function subscribeVisibility(onChange: () => void) {
  document.addEventListener("visibilitychange", onChange);
  return () => document.removeEventListener("visibilitychange", onChange);
}
const pageVisible = () => document.visibilityState === "visible";

type Change = TimelineVisit["change"];

/**
 * Marks the timeline seen once it has been on screen a moment, and keeps the changes shown on
 * this page: after marking, the server reports no changes, but the person is still reading them.
 */
function useSeenChanges(
  jobId: string,
  data: TimelineResponse | undefined,
  refetch: () => unknown,
) {
  const mark = useMarkTimelineSeen(jobId);
  const visible = useSyncExternalStore(
    subscribeVisibility,
    pageVisible,
    () => true,
  );
  const [kept, setKept] = useState<{
    changes: Record<string, Change>;
    handoverWas: string | null;
  }>({ changes: {}, handoverWas: null });
  const marked = useRef(-1);

  // Adjusting state while rendering when new changes arrive (React's documented pattern).
  if (data) {
    const fresh = data.visits.filter(
      (v) =>
        v.change &&
        JSON.stringify(kept.changes[v.id]) !== JSON.stringify(v.change),
    );
    const freshHandover =
      data.handoverWas !== null && data.handoverWas !== kept.handoverWas;
    if (fresh.length || freshHandover)
      setKept({
        changes: {
          ...kept.changes,
          ...Object.fromEntries(fresh.map((v) => [v.id, v.change])),
        },
        handoverWas: freshHandover ? data.handoverWas : kept.handoverWas,
      });
  }

  const version = data?.version ?? -1;
  const { mutate, isPending } = mark;
  useEffect(() => {
    if (!visible || isPending || version < 0 || marked.current === version)
      return;
    const timer = window.setTimeout(() => {
      marked.current = version;
      mutate(version, {
        onError: (e) => {
          // 409: the visits changed since the page loaded; load them, then mark again.
          marked.current = -1;
          if (isApiError(e) && e.status === 409) void refetch();
        },
      });
    }, SEEN_AFTER_MS);
    return () => window.clearTimeout(timer);
  }, [visible, isPending, version, mutate, refetch]);

  return kept;
}

/** A kept change still differs from what is shown now (a visit moved back is no news). */
function stillChanged(visit: TimelineVisit, change: Change): Change {
  if (!change || change.kind === "new") return change;
  const same =
    daysWords(visit.start, visit.finish) ===
      daysWords(change.was.start, change.was.finish) &&
    arrivalWords(visit.arrival) === arrivalWords(change.was.arrival);
  return same ? null : change;
}

function ChangeNote({
  visit,
  change,
}: {
  visit: TimelineVisit;
  change: Change;
}) {
  if (!change) return null;
  if (change.kind === "new")
    return (
      <p className="flex flex-wrap items-center gap-2 text-sm">
        <StatusBadge tone="accent">New</StatusBadge>
        <span>Added since you last looked.</span>
      </p>
    );
  const words = wasWords(visit, change.was);
  return (
    <p className="flex flex-wrap items-center gap-2 text-sm">
      <StatusBadge tone="wait">Changed</StatusBadge>
      <span data-testid="visit-was">
        {words.charAt(0).toUpperCase() + words.slice(1)}
      </span>
    </p>
  );
}

function VisitItem({
  visit,
  change,
}: {
  visit: TimelineVisit;
  change: Change;
}) {
  const highlighted = !!change;
  return (
    <li
      data-testid="visit"
      data-visit={visit.id}
      data-changed={highlighted ? "true" : undefined}
      className={
        highlighted
          ? "rounded border border-wait/50 border-l-4 border-l-wait bg-wait-wash/60 p-3"
          : "rounded border border-rule bg-card p-3"
      }
    >
      <div className="flex flex-col gap-1.5">
        <div className="flex flex-wrap items-center gap-2">
          <PartyChip party={visit.party} />
        </div>
        <h3 className="text-base font-semibold leading-snug">
          {whoWords(visit)}
        </h3>
        <p className="text-sm text-ink-soft">{visit.taskName}</p>
        <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
          <dt className="text-ink-soft">When</dt>
          <dd className="font-mono" data-testid="visit-days">
            {daysWords(visit.start, visit.finish)}
          </dd>
          <dt className="text-ink-soft">Arrival</dt>
          <dd className="font-mono" data-testid="visit-arrival">
            {arrivalWords(visit.arrival)}
          </dd>
          {visit.prepare ? (
            <>
              <dt className="text-ink-soft">To prepare</dt>
              <dd data-testid="visit-prepare">{visit.prepare}</dd>
            </>
          ) : null}
        </dl>
        {!visit.settled && !visit.past ? (
          <p
            className="flex flex-wrap items-center gap-2 text-sm"
            data-testid="visit-unsettled"
          >
            <StatusBadge tone="wait">{unsettledWords.badge}</StatusBadge>
            <span>{unsettledWords.line(visit)}</span>
          </p>
        ) : null}
        <ChangeNote visit={visit} change={change} />
        {visit.awayDays.length ? (
          <p
            className="rounded border border-risk/30 bg-risk-wash px-2 py-1 text-sm"
            data-testid="visit-away"
          >
            You&rsquo;ll be away on {listWords(visit.awayDays)} — the workshop
            has been told.
          </p>
        ) : null}
      </div>
    </li>
  );
}

/**
 * The customer's timeline of visits: who comes (trade and business, or the workshop), which
 * days, the arrival window and what to prepare; what changed since they last looked stands out.
 */
export function VisitTimeline({ jobId }: { jobId: string }) {
  const timeline = useTimeline(jobId);
  const kept = useSeenChanges(jobId, timeline.data, timeline.refetch);

  if (timeline.isPending)
    return (
      <Section title="Visits" id={`visits-${jobId}`}>
        <LoadingState label="Loading your visits…" />
      </Section>
    );
  if (timeline.isError)
    return (
      <Section title="Visits" id={`visits-${jobId}`}>
        <ErrorState
          error={timeline.error}
          onRetry={() => void timeline.refetch()}
        />
      </Section>
    );

  const t = timeline.data;
  const changeOf = (v: TimelineVisit): Change =>
    v.past ? null : stillChanged(v, v.change ?? kept.changes[v.id] ?? null);
  const coming = t.visits.filter((v) => !v.past);
  const past = t.visits.filter((v) => v.past);
  const changed = coming.filter((v) => changeOf(v)).length;
  const handoverWas = t.handoverWas ?? kept.handoverWas;

  return (
    <Section
      title="Visits"
      id={`visits-${jobId}`}
      description={
        changed
          ? `${changed} ${changed === 1 ? "visit has" : "visits have"} changed since you last looked.`
          : undefined
      }
    >
      <div className="flex flex-col gap-4">
        <p className="flex flex-wrap items-baseline gap-x-2 text-sm">
          <span className="text-ink-soft">Agreed handover</span>
          <span className="font-mono font-semibold" data-testid="handover">
            {t.handoverDate ? dayWords(t.handoverDate) : "to be set"}
          </span>
          {handoverWas && handoverWas !== t.handoverDate ? (
            <span className="text-sm">
              <StatusBadge tone="wait">Changed</StatusBadge> was{" "}
              {dayWords(handoverWas)}
            </span>
          ) : null}
        </p>
        {coming.length === 0 ? (
          <EmptyState title="No visits coming up">
            When a trade or the workshop is due at your home, the day and
            arrival time appear here.
          </EmptyState>
        ) : (
          <ol className="flex flex-col gap-3" aria-label="Coming visits">
            {coming.map((v) => (
              <VisitItem key={v.id} visit={v} change={changeOf(v)} />
            ))}
          </ol>
        )}
        {past.length ? (
          <details className="text-sm">
            <summary className="cursor-pointer text-accent underline underline-offset-2">
              Earlier visits ({past.length})
            </summary>
            <ol
              className="mt-3 flex flex-col gap-2"
              aria-label="Earlier visits"
            >
              {past.map((v) => (
                <li
                  key={v.id}
                  className="flex flex-wrap justify-between gap-x-3 border-b border-rule pb-2 last:border-b-0"
                >
                  <span>
                    {whoWords(v)}{" "}
                    <span className="text-ink-soft">· {v.taskName}</span>
                  </span>
                  <span className="font-mono">
                    {daysWords(v.start, v.finish)}
                  </span>
                </li>
              ))}
            </ol>
          </details>
        ) : null}
      </div>
    </Section>
  );
}
