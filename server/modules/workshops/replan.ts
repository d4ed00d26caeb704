import type { EntityManager } from "typeorm";
import {
  firstFreeStart,
  impactOf,
  type Impact,
} from "../../../shared/programme";
import type { ReplanJob } from "../../../shared/schemas";
import type { Job } from "../jobs/jobs.entity";
import { loadProgramme } from "../programme/programme-input";
import { schedule } from "../programme/programme.service";
import type { Workshop } from "./workshops.entity";

/** The settings the programme engine reads: changing any of them re-plans the open jobs. */
export function replans(before: Workshop, after: Workshop): boolean {
  return (
    before.holidayRegion !== after.holidayRegion ||
    before.timeZone !== after.timeZone ||
    before.dayStart !== after.dayStart ||
    before.dayEnd !== after.dayEnd ||
    before.workingWeekdays.join() !== after.workingWeekdays.join()
  );
}

/**
 * The job as it stands after the workshop's change: a job whose nation or time zone was the
 * workshop's old one follows the new one (it was set from the workshop, or happened to match);
 * a job set apart on purpose (a site over the border) keeps its own. DEVELOPERS.md, Decisions.
 */
export function followWorkshop(
  job: Job,
  before: Workshop,
  after: Workshop,
): Job {
  const next = { ...job } as Job;
  if (
    after.holidayRegion &&
    before.holidayRegion !== after.holidayRegion &&
    sameNation(job.holidayRegion, before.holidayRegion)
  )
    next.holidayRegion = after.holidayRegion;
  if (job.timeZone === before.timeZone) next.timeZone = after.timeZone;
  return next;
}

// GB-ENG and GB-WLS are one nation in words (shared nationLabels): the same bank holidays.
const nationOf = (r: string | null) => (r === "GB-WLS" ? "GB-ENG" : r);
const sameNation = (a: string | null, b: string | null) =>
  nationOf(a) === nationOf(b);

export interface JobReplan {
  job: Job;
  next: Job;
  /** The engine's impact, with bookings that land on a day that no longer works added to `reconfirm`. */
  impact: Impact;
  view: ReplanJob;
  changed: boolean;
}

/**
 * What the workshop's change does to one job, from the engine: its programme as it is and as it
 * would be (both from `loadProgramme`, the same input `GET /programme` schedules), the engine's
 * `impactOf` between them, and each booked task whose booked start the new calendars no longer
 * work (the engine's `non-working-day` problem, new with the change): it needs re-confirming at
 * the trade's first free start from that day, found by the engine as the booking form does.
 */
export async function replanJob(
  m: EntityManager,
  job: Job,
  before: Workshop,
  after: Workshop,
  now = new Date(),
): Promise<JobReplan> {
  const next = followWorkshop(job, before, after);
  const was = await loadProgramme(m, job, before, now);
  const will = await loadProgramme(m, next, after, now);
  const impact = impactOf(was.input, will.input);
  const resultBefore = schedule(was.input);
  const resultAfter = schedule(will.input);
  const nonWorking = (r: typeof resultAfter, taskId: string) =>
    r.tasks
      .find((t) => t.id === taskId)
      ?.problems.find((p) => p.code === "non-working-day");
  const unplaced = new Map<string, string>();
  for (const [taskId, booking] of will.bookingByTask) {
    if (impact.reconfirm.some((r) => r.task === taskId)) continue;
    const task = will.input.tasks.find((t) => t.id === taskId);
    if (!task || task.actualStart || !task.bookedStart) continue;
    const problem = nonWorking(resultAfter, taskId);
    if (!problem || nonWorking(resultBefore, taskId)) continue;
    const free = task.resource
      ? firstFreeStart(
          {
            ...will.input,
            tasks: will.input.tasks.map((t) =>
              t.id === taskId ? { ...t, bookedStart: null } : t,
            ),
          },
          taskId,
          { after: booking.start },
        )
      : null;
    if (free)
      impact.reconfirm.push({
        task: taskId,
        bookedStart: booking.start,
        proposedStart: free.start,
        reason: problem.message,
      });
    else unplaced.set(taskId, problem.message);
  }

  const taskName = new Map(will.tasks.map((t) => [t.id, t.name]));
  const bookingView = (taskId: string) => {
    const b = will.bookingByTask.get(taskId)!;
    return {
      bookingId: b.id,
      taskName: taskName.get(taskId) ?? "",
      tradeName: will.trades.get(b.tradeId)?.businessName ?? "",
      bookedStart: b.start,
    };
  };
  const bookings = [
    ...impact.reconfirm
      .filter((r) => will.bookingByTask.has(r.task))
      .map((r) => ({
        ...bookingView(r.task),
        proposedStart: r.proposedStart,
        reason: r.reason,
      })),
    ...[...unplaced].map(([taskId, reason]) => ({
      ...bookingView(taskId),
      proposedStart: null,
      reason,
    })),
  ];
  const atRisk = (days: number | null) => days !== null && days > 0;
  const view: ReplanJob = {
    jobId: job.id,
    title: job.title,
    finishBefore: impact.handover.finishBefore,
    finishAfter: impact.handover.finishAfter,
    changeDays: impact.handover.changeDays,
    handoverDate: job.handoverDate,
    handoverAtRiskBefore: atRisk(resultBefore.handoverSlipDays),
    handoverAtRisk: atRisk(resultAfter.handoverSlipDays),
    nationFollows: next.holidayRegion !== job.holidayRegion,
    movedTasks: impact.moves.length,
    bookings,
  };
  const changed =
    view.finishBefore !== view.finishAfter ||
    view.movedTasks > 0 ||
    bookings.length > 0 ||
    view.handoverAtRisk !== view.handoverAtRiskBefore ||
    view.nationFollows;
  return { job, next, impact, view, changed };
}
