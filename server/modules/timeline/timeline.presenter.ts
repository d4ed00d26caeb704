import type {
  AwayRange,
  Party,
  TimelineResponse,
  TimelineVisit,
  VisitArrival,
} from "../../../shared/schemas";
import type { Job } from "../jobs/jobs.entity";
import type { SeenTimeline, TimelineView } from "./timeline.entity";

/** One visit before presenting: a trade's standing booking, or the workshop's own task. */
export interface VisitRow {
  id: string;
  party: Party;
  businessName: string;
  taskName: string;
  start: string;
  finish: string;
  arrival: VisitArrival;
  prepare: string | null;
  /** The task is marked done. */
  done: boolean;
  /** The days are settled (see TimelineVisit.settled). */
  settled: boolean;
}

/** An ISO date `n` calendar days on (wall-clock dates, so computed at UTC noon). */
export function plusDays(date: string, n: number): string {
  const d = new Date(`${date}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + n);
  return d.toISOString().slice(0, 10);
}

/** Every date of the ranges, once, in order. */
export function datesOfRanges(ranges: AwayRange[]): string[] {
  const out = new Set<string>();
  for (const r of ranges)
    for (let d = r.from; d <= r.to; d = plusDays(d, 1)) out.add(d);
  return [...out].sort();
}

/** Runs of consecutive dates as ranges (the inverse of `datesOfRanges`). */
export function rangesOfDates(dates: string[]): AwayRange[] {
  const sorted = [...new Set(dates)].sort();
  const out: AwayRange[] = [];
  for (const d of sorted) {
    const last = out[out.length - 1];
    if (last && plusDays(last.to, 1) === d) last.to = d;
    else out.push({ from: d, to: d });
  }
  return out;
}

/** The visit's calendar days (start to finish) that are in `away`. */
export function awayDaysOf(
  v: Pick<VisitRow, "start" | "finish">,
  away: ReadonlySet<string>,
): string[] {
  const out: string[] = [];
  const last = v.finish.slice(0, 10);
  for (let d = v.start.slice(0, 10); d <= last; d = plusDays(d, 1))
    if (away.has(d)) out.push(d);
  return out;
}

/** What the timeline shows now, to compare with next time. */
export function snapshotOf(
  rows: VisitRow[],
  handoverDate: string | null,
): SeenTimeline {
  return {
    visits: Object.fromEntries(
      rows.map((r) => [
        r.id,
        {
          start: r.start,
          finish: r.finish,
          window: r.arrival.window,
          from: r.arrival.from,
          to: r.arrival.to,
        },
      ]),
    ),
    handoverDate,
  };
}

function changeOf(
  r: VisitRow,
  seen: SeenTimeline | null,
  past: boolean,
): TimelineVisit["change"] {
  // The first look has nothing to compare with; a visit that is over is no longer news.
  if (!seen || past) return null;
  const was = seen.visits[r.id];
  if (!was) return { kind: "new" };
  const same =
    was.start === r.start &&
    was.finish === r.finish &&
    was.window === r.arrival.window &&
    (r.arrival.window !== "range" ||
      (was.from === r.arrival.from && was.to === r.arrival.to));
  if (same) return null;
  return {
    kind: "moved",
    was: {
      start: was.start,
      finish: was.finish,
      arrival: { window: was.window, from: was.from, to: was.to },
    },
  };
}

/** The timeline as the customer sees it: no float, no booking states, no notes but theirs. */
export function presentTimeline(ctx: {
  job: Job;
  workshopName: string;
  today: string;
  rows: VisitRow[];
  view: TimelineView | null;
}): TimelineResponse {
  const { job, today } = ctx;
  const seen = ctx.view?.seen ?? null;
  const away = new Set(job.siteClosedDates.filter((d) => d >= today));
  const visits: TimelineVisit[] = ctx.rows
    .map((r) => {
      const past = r.done || r.finish.slice(0, 10) < today;
      return {
        id: r.id,
        party: r.party,
        businessName: r.businessName,
        taskName: r.taskName,
        start: r.start,
        finish: r.finish,
        arrival: r.arrival,
        prepare: r.prepare,
        settled: r.settled,
        past,
        change: changeOf(r, seen, past),
        awayDays: past ? [] : awayDaysOf(r, away),
      };
    })
    .sort(
      (a, b) =>
        a.start.localeCompare(b.start) ||
        a.finish.localeCompare(b.finish) ||
        a.taskName.localeCompare(b.taskName),
    );
  return {
    jobId: job.id,
    jobTitle: job.title,
    workshopName: ctx.workshopName,
    timeZone: job.timeZone,
    today,
    handoverDate: job.handoverDate,
    handoverWas:
      seen?.handoverDate && seen.handoverDate !== job.handoverDate
        ? seen.handoverDate
        : null,
    visits,
    away: rangesOfDates([...away]),
    lastSeenAt: ctx.view?.seenAt.toISOString() ?? null,
    version: job.version,
  };
}
