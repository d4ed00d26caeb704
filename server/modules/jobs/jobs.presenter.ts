import { partyTitle } from "../../../shared/words/trades";
import type { Actor } from "../../policies";
import type {
  BookingView,
  JobDetail,
  JobSummary,
  TaskView,
  ViewerRole,
} from "../../../shared/schemas";
import type { Booking } from "../bookings/bookings.entity";
import type { Customer } from "../customers/customers.entity";
import { cautionFor } from "../../../shared/schemas";
import type { Task, TaskLink } from "../programme/programme.entity";
import type { Trade } from "../trades/trades.entity";
import type { Workshop } from "../workshops/workshops.entity";
import type { Job } from "./jobs.entity";

/** The role a person has on this job, strongest first. */
export function viewerRoleFor(actor: Actor, job: Job): ViewerRole {
  const role = actor.memberships.get(job.workshopId);
  if (role) return role;
  if (actor.customers.get(job.customerId) === job.workshopId) return "customer";
  return "trade";
}

export function presentJobSummary(
  job: Job,
  ctx: {
    role: ViewerRole;
    workshopName: string;
    customerName: string | null;
    bookings: Booking[];
    tasks: Map<string, Pick<Task, "id" | "name" | "party">>;
    trades: Map<string, Pick<Trade, "id" | "businessName" | "kind">>;
  },
): JobSummary {
  const today = localToday(job.timeZone);
  const next = ctx.bookings
    .filter((b) => b.finish.slice(0, 10) >= today)
    .sort((a, b) => a.start.localeCompare(b.start))[0];
  let nextEvent: JobSummary["nextEvent"] = null;
  if (next) {
    const trade = ctx.trades.get(next.tradeId);
    const task = ctx.tasks.get(next.taskId);
    nextEvent = {
      date: next.start.slice(0, 10),
      label: `${trade ? partyTitle(trade.kind) : "Visit"}: ${task?.name ?? "visit"}`,
    };
  } else if (job.handoverDate && job.handoverDate >= today) {
    nextEvent = { date: job.handoverDate, label: "Agreed handover" };
  }
  return {
    id: job.id,
    workshopId: job.workshopId,
    workshopName: ctx.workshopName,
    title: job.title,
    area: job.area,
    status: job.status,
    customerName: ctx.customerName,
    handoverDate: job.handoverDate,
    nextEvent,
    viewerRole: ctx.role,
  };
}

const taskStatus = (t: Task): TaskView["status"] =>
  t.actualFinish ? "done" : t.actualStart ? "started" : "not-started";

/** A job as one viewer may see it: trades see their own tasks in full and what those wait on by name only. */
export function presentJobDetail(
  job: Job,
  ctx: {
    actor: Actor;
    full: boolean;
    address: boolean;
    role: ViewerRole;
    workshop: Workshop;
    customer: Customer;
    tasks: Task[];
    links: TaskLink[];
    bookings: Booking[];
    trades: Trade[];
  },
): JobDetail {
  const trades = new Map(ctx.trades.map((t) => [t.id, t]));
  const visibleBookings = ctx.bookings.filter((b) => {
    if (ctx.full) return true;
    if (ctx.role === "customer")
      return [
        "sent",
        "confirmed",
        "date-proposed",
        "needs-reconfirming",
      ].includes(b.state);
    return ctx.actor.trades.has(b.tradeId) && b.state !== "draft";
  });
  const ownTaskIds = new Set(
    visibleBookings
      .filter((b) => ctx.actor.trades.has(b.tradeId))
      .map((b) => b.taskId),
  );
  const waitedOn = new Set(
    ctx.links
      .filter((l) => ownTaskIds.has(l.toTaskId))
      .map((l) => l.fromTaskId),
  );

  const tasks: TaskView[] = [];
  for (const t of ctx.tasks) {
    const inFull = ctx.full || ctx.role === "customer" || ownTaskIds.has(t.id);
    if (!inFull && !waitedOn.has(t.id)) continue;
    tasks.push({
      id: t.id,
      name: t.name,
      party: t.party,
      durationDays: Number(t.durationDays),
      status: taskStatus(t),
      detail: inFull
        ? {
            notEarlierThan: t.notEarlierThan,
            actualStart: t.actualStart,
            actualFinish: t.actualFinish,
            customerNote: t.customerNote,
            internalNote: ctx.full ? t.internalNote : null,
            caution:
              ctx.role === "customer" ? null : cautionFor(t.party, t.hazards),
            sortOrder: t.sortOrder,
          }
        : null,
    });
  }
  const taskIds = new Set(tasks.map((t) => t.id));

  const bookings: BookingView[] = visibleBookings.map((b) => {
    const trade = trades.get(b.tradeId)!;
    return {
      id: b.id,
      taskId: b.taskId,
      tradeId: b.tradeId,
      tradeBusinessName: trade.businessName,
      tradeKind: trade.kind,
      state: b.state,
      start: b.start,
      finish: b.finish,
      arrivalWindow: b.arrivalWindow,
      arrivalFrom: b.arrivalFrom,
      arrivalTo: b.arrivalTo,
    };
  });

  const partyTrades = [
    ...new Map(
      visibleBookings.map((b) => [b.tradeId, trades.get(b.tradeId)!]),
    ).values(),
  ];
  return {
    id: job.id,
    workshopId: job.workshopId,
    workshopName: ctx.workshop.name,
    version: job.version,
    title: job.title,
    status: job.status,
    area: job.area,
    siteAddress: ctx.address ? job.siteAddress : null,
    postcode: ctx.address ? job.postcode : null,
    accessNotes: ctx.address ? job.accessNotes : null,
    holidayRegion: job.holidayRegion,
    timeZone: job.timeZone,
    handoverDate: job.handoverDate,
    siteWeekdays: job.siteWeekdays,
    viewerRole: ctx.role,
    parties: [
      {
        kind: "customer",
        id: ctx.customer.id,
        name: ctx.customer.name,
        tradeKind: null,
        email: ctx.full ? ctx.customer.email : null,
        phone: ctx.full ? ctx.customer.phone : null,
      },
      ...partyTrades.map((t) => ({
        kind: "trade" as const,
        id: t.id,
        name: t.businessName,
        tradeKind: t.kind,
        email: ctx.full || ctx.actor.trades.has(t.id) ? t.email : null,
        phone: ctx.full || ctx.actor.trades.has(t.id) ? t.phone : null,
      })),
    ],
    tasks,
    links: ctx.links
      .filter(
        (l) =>
          ctx.full || (taskIds.has(l.fromTaskId) && taskIds.has(l.toTaskId)),
      )
      .map((l) => ({
        id: l.id,
        fromTaskId: l.fromTaskId,
        toTaskId: l.toTaskId,
        kind: l.kind,
        lag: Number(l.lag),
        lagUnit: l.lagUnit,
      })),
    bookings,
  };
}

/**
 * One formatter per time zone and pattern, made once: building an Intl.DateTimeFormat costs far
 * more than formatting with one (it was an eighth of the home's CPU time at 53 jobs, issue 15).
 */
const formatters = new Map<string, Intl.DateTimeFormat>();
export function zonedFormatter(
  locale: string,
  options: Intl.DateTimeFormatOptions & { timeZone: string },
): Intl.DateTimeFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let f = formatters.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat(locale, options);
    formatters.set(key, f);
  }
  return f;
}

/** Today's date in a time zone, as YYYY-MM-DD. */
export function localToday(timeZone: string, now = new Date()): string {
  return zonedFormatter("en-CA", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
  }).format(now);
}
