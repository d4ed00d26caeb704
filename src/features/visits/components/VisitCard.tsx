import { Link } from "react-router-dom";
import type { Visit } from "../../../../shared/schemas";
import {
  Card,
  CautionNote,
  EmptyState,
  ErrorState,
  LoadingState,
  StatusBadge,
} from "../../../components/ui";
import { arrivalWindowLabel } from "../../../lib/labels";
import { useMyVisits } from "../api/list-my-visits";
import { daysWords, dayWords, readinessWords, stateWords } from "../words";
import { VisitActions } from "./VisitActions";

const kindWords = {
  drawing: "Drawing",
  template: "Template",
  site_photo: "Site photo",
} as const;

const toneClasses = {
  ok: ["border-ok/30 bg-ok-wash", "bg-ok"],
  wait: ["border-wait/40 bg-wait-wash", "bg-wait"],
  accent: ["border-accent/30 bg-accent-wash", "bg-accent"],
  risk: ["border-risk/30 bg-risk-wash", "bg-risk"],
  muted: ["border-rule bg-paper", "bg-rule-strong"],
} as const;

/** A status in words that may run long ("Waiting on …"): it wraps on a phone instead of overflowing. */
function Tag({
  tone,
  children,
}: {
  tone: keyof typeof toneClasses;
  children: React.ReactNode;
}) {
  const [frame, dot] = toneClasses[tone];
  return (
    <span
      className={`inline-flex max-w-full items-baseline gap-1.5 rounded border px-2 py-0.5 text-xs font-medium text-ink ${frame}`}
    >
      <span
        aria-hidden="true"
        className={`size-2 shrink-0 translate-y-px rounded-full ${dot}`}
      />
      <span>{children}</span>
    </span>
  );
}

function Fact({
  label,
  children,
}: {
  label: string;
  children: React.ReactNode;
}) {
  return (
    <div className="flex flex-col gap-0.5">
      <dt className="text-xs font-medium uppercase tracking-wide text-ink-soft">
        {label}
      </dt>
      <dd className="min-w-0">{children}</dd>
    </div>
  );
}

/** The facts of one visit: where, when, the booking state in words, and readiness from the engine. */
export function VisitFacts({
  visit,
  statusOnly = false,
}: {
  visit: Visit;
  /** Only the booking state, readiness and a late notice (the visit page shows the rest in full). */
  statusOnly?: boolean;
}) {
  const state = stateWords(visit);
  const ready = readinessWords(visit);
  return (
    <dl className="grid gap-3 sm:grid-cols-2">
      {statusOnly ? (
        visit.runningLate ? (
          <Fact label="You said">
            arriving{" "}
            <span className="font-mono">{visit.runningLate.arrivalTime}</span>{" "}
            on {dayWords(visit.runningLate.day)}
          </Fact>
        ) : null
      ) : (
        <>
          <Fact label="When">
            <span className="font-mono font-medium" data-testid="visit-when">
              {daysWords(visit)}
            </span>
            <span className="block text-sm">
              Arrive:{" "}
              <span className="font-mono" data-testid="visit-arrival">
                {arrivalWindowLabel(visit)}
              </span>
            </span>
            {visit.runningLate ? (
              <span className="mt-1 block text-sm text-wait-ink">
                You said: arriving{" "}
                <span className="font-mono">
                  {visit.runningLate.arrivalTime}
                </span>{" "}
                on {dayWords(visit.runningLate.day)}
              </span>
            ) : null}
          </Fact>
          <Fact label="Where">
            <span className="block">{visit.jobArea}</span>
            {visit.siteAddress ? (
              <span className="block text-sm font-medium">
                {visit.siteAddress}
              </span>
            ) : (
              <span className="block text-sm text-ink-soft">
                Full address once you confirm
              </span>
            )}
          </Fact>
        </>
      )}
      <Fact label="Booking">
        <span data-testid="visit-state">
          <Tag tone={state.tone}>{state.text}</Tag>
        </span>
      </Fact>
      <Fact label="Can it start?">
        <span data-testid="visit-readiness">
          <Tag tone={ready.tone}>{ready.text}</Tag>
        </span>
      </Fact>
    </dl>
  );
}

/** The drawings, templates and site photos shared with them on the job, newest first. */
export function VisitDrawings({ visit }: { visit: Visit }) {
  if (visit.drawings.length === 0) return null;
  return (
    <div>
      <h4 className="text-sm font-semibold">Drawings for you</h4>
      <ul className="mt-1 flex flex-col gap-1 text-sm">
        {visit.drawings.map((d) => (
          <li key={d.id}>
            <Link
              to={`/jobs/${visit.jobId}/drawings/${d.id}`}
              className="text-accent underline underline-offset-2"
            >
              {d.title}
            </Link>{" "}
            <span className="text-ink-soft">
              {kindWords[d.kind]}, Rev {d.currentRevision}
              {d.forThisTask ? ", for this task" : ""}
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}

/** One upcoming visit on the trade's home: who, what, where, when, readiness, drawings, actions. */
export function VisitCard({ visit }: { visit: Visit }) {
  return (
    <Card className="flex flex-col gap-4 p-4" data-testid="visit-card">
      <header className="flex flex-col gap-0.5">
        <p className="text-sm text-ink-soft">
          {visit.workshopName} ·{" "}
          <Link
            to={`/jobs/${visit.jobId}`}
            className="underline underline-offset-2"
          >
            {visit.jobTitle}
          </Link>
        </p>
        <h3 className="text-lg font-semibold">
          <Link
            to={`/visits/${visit.bookingId}`}
            className="underline-offset-2 hover:underline"
          >
            {visit.taskName}
          </Link>
        </h3>
      </header>
      <VisitFacts visit={visit} />
      <VisitDrawings visit={visit} />
      {visit.caution ? <CautionNote>{visit.caution}</CautionNote> : null}
      <VisitActions visit={visit} quickAnswer />
      <p className="text-sm">
        <Link
          to={`/visits/${visit.bookingId}`}
          className="text-accent underline underline-offset-2"
        >
          Open the visit: details and the thread
        </Link>
      </p>
    </Card>
  );
}

function PastVisit({ visit }: { visit: Visit }) {
  const state = stateWords(visit);
  return (
    <li className="flex flex-col gap-0.5 py-2">
      <Link
        to={`/visits/${visit.bookingId}`}
        className="font-medium text-accent underline underline-offset-2"
      >
        {visit.taskName}
      </Link>
      <span className="text-sm text-ink-soft">
        {visit.workshopName} · {visit.jobTitle}
      </span>
      <span className="flex flex-wrap items-center gap-2 text-sm">
        <span className="font-mono">{daysWords(visit)}</span>
        {visit.progress === "done" ? (
          <StatusBadge tone="ok">Done</StatusBadge>
        ) : (
          <StatusBadge tone={state.tone}>{state.text}</StatusBadge>
        )}
      </span>
    </li>
  );
}

/** The trade's visits across every workshop they work for: upcoming ones, then past ones folded away. */
export function MyVisits() {
  const visits = useMyVisits();
  if (visits.isPending) return <LoadingState label="Loading your visits…" />;
  if (visits.isError)
    return (
      <ErrorState error={visits.error} onRetry={() => void visits.refetch()} />
    );
  const { upcoming, past } = visits.data;
  return (
    <div className="flex flex-col gap-6">
      <section
        aria-labelledby="upcoming-visits"
        className="flex flex-col gap-3"
      >
        <h2 id="upcoming-visits" className="text-lg font-semibold">
          Upcoming visits
        </h2>
        {upcoming.length === 0 ? (
          <EmptyState title="No visits booked">
            When a workshop books you for a job, it appears here.
          </EmptyState>
        ) : (
          <ul className="flex flex-col gap-4" aria-label="Upcoming visits">
            {upcoming.map((v) => (
              <li key={v.bookingId}>
                <VisitCard visit={v} />
              </li>
            ))}
          </ul>
        )}
      </section>
      {past.length > 0 ? (
        <details className="rounded border border-rule bg-card px-4 py-2">
          <summary className="cursor-pointer py-1 font-semibold">
            Past visits ({past.length})
          </summary>
          <ul className="divide-y divide-rule" aria-label="Past visits">
            {past.map((v) => (
              <PastVisit key={v.bookingId} visit={v} />
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}
