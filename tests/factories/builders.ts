// Test builders: one set, used by the tests and by the demo seed (style.md). Each inserts one
// record with sensible invented defaults and returns it.
import type { EntityManager } from "typeorm";
import { randomUUID } from "node:crypto";
import { newId } from "../../server/db/columns";
import { OutboxMessage } from "../../server/infra/outbox/outbox.entity";
import { hashPassword } from "../../server/modules/auth/passwords";
import { Booking } from "../../server/modules/bookings/bookings.entity";
import { Customer } from "../../server/modules/customers/customers.entity";
import { Job } from "../../server/modules/jobs/jobs.entity";
import {
  Task,
  TaskLink,
  type Hazard,
} from "../../server/modules/programme/programme.entity";
import { Trade, TradeMember } from "../../server/modules/trades/trades.entity";
import { User } from "../../server/modules/users/users.entity";
import {
  Workshop,
  WorkshopMember,
} from "../../server/modules/workshops/workshops.entity";
import {
  arrivalWindows,
  type BookingState,
  type MemberRole,
  type Party,
  type TradeKind,
} from "../../shared/schemas";

let counter = 0;
const seq = () => ++counter;

// Hashing is the slow part of a builder; the same password hashes once per process.
const hashes = new Map<string, Promise<string>>();
const hashOnce = (password: string) => {
  if (!hashes.has(password)) hashes.set(password, hashPassword(password));
  return hashes.get(password)!;
};

export async function buildUser(
  m: EntityManager,
  o: Partial<User> & { password?: string | null } = {},
): Promise<User> {
  const n = seq();
  const { password = "sitecue-demo", ...rest } = o;
  const user = m.create(User, {
    id: newId(),
    email: `person${n}@example.test`,
    name: `Person ${n}`,
    passwordHash: password === null ? null : await hashOnce(password),
    lastSignInAt: null,
    // Built people (the demo's, the tests') have proved their address; sign-up's have not.
    emailVerifiedAt: new Date(),
    ...rest,
  });
  await m.insert(User, user);
  return user;
}

export async function buildWorkshop(
  m: EntityManager,
  o: Partial<Workshop> = {},
): Promise<Workshop> {
  const w = m.create(Workshop, {
    id: newId(),
    name: `Workshop ${seq()}`,
    town: "Wetherfold",
    timeZone: "Europe/London",
    holidayRegion: "GB-ENG",
    workingWeekdays: [1, 2, 3, 4, 5],
    dayStart: "08:00",
    dayEnd: "16:30",
    siteWeekdays: [1, 2, 3, 4, 5],
    arrivalWindows: [...arrivalWindows],
    reminderDays: 1,
    setupStep: null,
    // Built workshops (the demo, tests) count as set up; pass null to be one just signed up.
    setupCompletedAt: new Date(),
    ...o,
  });
  await m.insert(Workshop, w);
  return w;
}

export async function buildMember(
  m: EntityManager,
  workshop: Workshop,
  user: User,
  role: MemberRole,
): Promise<WorkshopMember> {
  const member = m.create(WorkshopMember, {
    id: newId(),
    workshopId: workshop.id,
    userId: user.id,
    role,
  });
  await m.insert(WorkshopMember, member);
  return member;
}

export async function buildTrade(
  m: EntityManager,
  workshop: Workshop,
  o: Partial<Trade> & { kind: TradeKind },
): Promise<Trade> {
  const n = seq();
  const t = m.create(Trade, {
    id: newId(),
    workshopId: workshop.id,
    businessName: `Trade ${n}`,
    contactName: `Contact ${n}`,
    email: `trade${n}@example.test`,
    phone: "01632 960 000",
    workingWeekdays: [1, 2, 3, 4, 5],
    dayStart: "08:00",
    dayEnd: "16:30",
    daysOff: [],
    ...o,
  });
  await m.insert(Trade, t);
  return t;
}

export async function linkTradeUser(
  m: EntityManager,
  trade: Trade,
  user: User,
): Promise<TradeMember> {
  const link = m.create(TradeMember, {
    id: newId(),
    workshopId: trade.workshopId,
    tradeId: trade.id,
    userId: user.id,
  });
  await m.insert(TradeMember, link);
  return link;
}

export async function buildCustomer(
  m: EntityManager,
  workshop: Workshop,
  o: Partial<Customer> = {},
): Promise<Customer> {
  const n = seq();
  const c = m.create(Customer, {
    id: newId(),
    workshopId: workshop.id,
    name: `Customer ${n}`,
    email: `customer${n}@example.test`,
    phone: null,
    userId: null,
    ...o,
  });
  await m.insert(Customer, c);
  return c;
}

export async function buildJob(
  m: EntityManager,
  workshop: Workshop,
  customer: Customer,
  o: Partial<Job> = {},
): Promise<Job> {
  const j = m.create(Job, {
    id: newId(),
    workshopId: workshop.id,
    customerId: customer.id,
    title: `Job ${seq()}`,
    siteAddress: "1 Example Row, Wetherfold",
    postcode: "QX1 1AA",
    area: "Wetherfold",
    holidayRegion: "GB-ENG",
    timeZone: "Europe/London",
    status: "planned",
    handoverDate: null,
    siteWeekdays: [1, 2, 3, 4, 5],
    siteClosedDates: [],
    accessNotes: "",
    version: 1,
    ...o,
  });
  await m.insert(Job, j);
  return j;
}

export async function buildTask(
  m: EntityManager,
  job: Job,
  o: Partial<Omit<Task, "durationDays">> & {
    name: string;
    party: Party;
    durationDays?: number;
    hazards?: Hazard[];
  },
): Promise<Task> {
  const { durationDays = 1, ...rest } = o;
  const count = await m.countBy(Task, { jobId: job.id });
  const t = m.create(Task, {
    id: newId(),
    workshopId: job.workshopId,
    jobId: job.id,
    durationDays: String(durationDays),
    notEarlierThan: null,
    actualStart: null,
    actualFinish: null,
    customerNote: "",
    internalNote: "",
    hazards: [],
    sortOrder: count + 1,
    ...rest,
  });
  await m.insert(Task, t);
  return t;
}

export async function buildLink(
  m: EntityManager,
  from: Task,
  to: Task,
  o: {
    kind?: TaskLink["kind"];
    lag?: number;
    lagUnit?: TaskLink["lagUnit"];
  } = {},
): Promise<TaskLink> {
  const l = m.create(TaskLink, {
    id: newId(),
    workshopId: from.workshopId,
    jobId: from.jobId,
    fromTaskId: from.id,
    toTaskId: to.id,
    kind: o.kind ?? "FS",
    lag: String(o.lag ?? 0),
    lagUnit: o.lagUnit ?? "workingDays",
  });
  await m.insert(TaskLink, l);
  return l;
}

export async function buildBooking(
  m: EntityManager,
  task: Task,
  trade: Trade,
  o: Partial<Booking> & { state: BookingState; start: string; finish: string },
): Promise<Booking> {
  const b = m.create(Booking, {
    id: newId(),
    workshopId: task.workshopId,
    jobId: task.jobId,
    taskId: task.id,
    tradeId: trade.id,
    arrivalWindow: "all-day",
    arrivalFrom: null,
    arrivalTo: null,
    icalUid: `${newId()}`,
    sequence: 0,
    ...o,
  });
  await m.insert(Booking, b);
  return b;
}

/**
 * An outbox e-mail of the workshop that has given up (state `failed`), as the worker leaves one
 * after a permanent SMTP refusal. Written straight to the table, so no worker picks it up first.
 */
export async function buildFailedMail(
  m: EntityManager,
  workshopId: string,
  o: Partial<OutboxMessage> = {},
): Promise<OutboxMessage> {
  const n = seq();
  const row = m.create(OutboxMessage, {
    id: newId(),
    workshopId,
    messageId: `<${randomUUID()}@sitecue.example.test>`,
    to: `failed-${n}@example.test`,
    subject: `Booking ${n}`,
    text: `Message ${n}`,
    html: null,
    calendar: null,
    state: "failed",
    attempts: 1,
    nextAttemptAt: new Date(),
    lastError:
      "Can't send mail - all recipients were rejected: 550 5.1.1 Recipient address rejected: mailbox unavailable",
    lastAttemptAt: new Date(),
    claimedBy: null,
    claimedAt: null,
    sentAt: null,
    ...o,
  });
  await m.insert(OutboxMessage, row);
  return row;
}
