// A workshop at a real size, for the query-count tests and the API bench (issue 15): the demo
// scenario (two workshops sharing the plasterer) grown by N open jobs, each with a programme, its
// links, bookings of the demo's trades in every live state, and a message on its thread.
import type { DataSource, EntityManager } from "typeorm";
import { insertThreadMessage } from "../../server/modules/thread/thread-notes";
import { Trade } from "../../server/modules/trades/trades.entity";
import { User } from "../../server/modules/users/users.entity";
import { Workshop } from "../../server/modules/workshops/workshops.entity";
import type { BookingState } from "../../shared/schemas";
import {
  buildBooking,
  buildCustomer,
  buildJob,
  buildLink,
  buildTask,
} from "./builders";
import {
  DEMO_WORKSHOP_NAME,
  demoAccounts,
  weekdaysFrom,
} from "./demo-scenario";
import { demoSecondWorkshop } from "./demo-second-workshop";

/** Title of the k-th added job (1-based), so a test can find one. */
export const bigJobTitle = (k: number) => `Fitted study, house ${k}`;

const STATES: BookingState[] = [
  "confirmed",
  "sent",
  "date-proposed",
  "needs-reconfirming",
  "draft",
];

async function tradeNamed(m: EntityManager, workshopId: string, name: string) {
  return m.findOneByOrFail(Trade, { workshopId, businessName: name });
}

/** Adds one job to `workshop` with a six-task programme and bookings of the given trades. */
async function addJob(
  m: EntityManager,
  workshop: Workshop,
  k: number,
  day: (n: number) => string,
  trades: { electrician: Trade; plasterer: Trade; decorator: Trade },
  author: User,
) {
  const customer = await buildCustomer(m, workshop, {
    name: `Customer of house ${k}`,
    email: `house${k}.${workshop.id.slice(0, 4)}@example.test`,
  });
  const start = 2 + (k % 40);
  const job = await buildJob(m, workshop, customer, {
    title: bigJobTitle(k),
    siteAddress: `${k} Example Grove, Wetherfold`,
    postcode: "QX7 1BW",
    area: "Example Grove, Wetherfold",
    status: k % 3 === 0 ? "on-site" : "planned",
    handoverDate: day(start + 12),
  });
  const survey = await buildTask(m, job, {
    name: "Survey & measure",
    party: "workshop",
    durationDays: 0.5,
    actualStart: day(-5),
    actualFinish: `${day(-5)}T12:00`,
  });
  const firstFix = await buildTask(m, job, {
    name: "Electrician first fix",
    party: "electrician",
    durationDays: 0.5,
    hazards: ["electrical"],
  });
  const carcasses = await buildTask(m, job, {
    name: "Fix carcasses & scribes",
    party: "workshop",
    durationDays: 2,
    hazards: ["tall-unit"],
  });
  const coving = await buildTask(m, job, {
    name: "Fit coving & make good",
    party: "plasterer",
    durationDays: 1,
  });
  const paint = await buildTask(m, job, {
    name: "Fill, caulk & paint",
    party: "decorator",
    durationDays: 1,
  });
  const handover = await buildTask(m, job, {
    name: "Walk-round with the customer",
    party: "workshop",
    durationDays: 0,
  });
  await buildLink(m, survey, firstFix);
  await buildLink(m, firstFix, carcasses);
  await buildLink(m, carcasses, coving);
  await buildLink(m, coving, paint, { lag: 24, lagUnit: "elapsedHours" });
  await buildLink(m, paint, handover);
  const state = (offset: number) => STATES[(k + offset) % STATES.length];
  await buildBooking(m, firstFix, trades.electrician, {
    state: state(0),
    sentAt: new Date(Date.now() - 3 * 86_400_000),
    start: `${day(start)}T08:00`,
    finish: `${day(start)}T12:00`,
    arrivalWindow: "morning",
  });
  await buildBooking(m, coving, trades.plasterer, {
    state: state(1),
    sentAt: new Date(Date.now() - 3 * 86_400_000),
    start: `${day(start + 4)}T08:00`,
    finish: `${day(start + 4)}T16:30`,
    arrivalWindow: "all-day",
  });
  await buildBooking(m, paint, trades.decorator, {
    state: state(2),
    sentAt: new Date(Date.now() - 3 * 86_400_000),
    start: `${day(start + 6)}T08:00`,
    finish: `${day(start + 6)}T16:30`,
    arrivalWindow: "all-day",
  });
  await insertThreadMessage(m, {
    workshopId: workshop.id,
    jobId: job.id,
    audience: "job",
    kind: "message",
    text: `Materials for house ${k} are in the van.`,
    author: {
      userId: author.id,
      name: author.name,
      label: "Workshop",
      role: "workshop",
    },
  });
}

/**
 * Grows the already-loaded demo scenario: `jobs` more open jobs on the demo workshop, and one in
 * ten as many on the second workshop (both book the shared plasterer). `today` is the demo's.
 */
export async function growDemoWorkshop(
  ds: DataSource,
  today: string,
  jobs: number,
  /** Number of the first added job: grow again from where the last call stopped. */
  firstNumber = 1,
): Promise<void> {
  const day = (n: number) => weekdaysFrom(today, n);
  await ds.transaction(async (m) => {
    const first = await m.findOneByOrFail(Workshop, {
      name: DEMO_WORKSHOP_NAME,
    });
    const second = await m.findOneByOrFail(Workshop, {
      name: demoSecondWorkshop.name,
    });
    const owner = await m.findOneByOrFail(User, {
      email: demoAccounts.owner.email,
    });
    const secondOwner = await m.findOneByOrFail(User, {
      email: demoSecondWorkshop.owner.email,
    });
    const trades = {
      electrician: await tradeNamed(m, first.id, "Brightwire Electrical"),
      plasterer: await tradeNamed(m, first.id, "Ashby Plaster & Coving"),
      decorator: await tradeNamed(m, first.id, "Kestrel Decorating"),
    };
    for (let k = firstNumber; k < firstNumber + jobs; k++)
      await addJob(m, first, k, day, trades, owner);
    const shared = await tradeNamed(
      m,
      second.id,
      demoSecondWorkshop.tradeBusinessName,
    );
    const before = Math.ceil((firstNumber - 1) / 10);
    const after = Math.ceil((firstNumber - 1 + jobs) / 10);
    for (let k = before + 1; k <= after; k++)
      await addJob(
        m,
        second,
        1000 + k,
        day,
        { electrician: shared, plasterer: shared, decorator: shared },
        secondOwner,
      );
  });
}

/** Title of the long-programme job `addLongProgrammeJob` adds. */
export const LONG_JOB_TITLE = "Whole-house joinery, Example Lodge";

/**
 * One more open job on the demo workshop with a programme of `tasks` tasks (the bench's
 * "programme of 40 tasks"): runs of workshop and trade tasks, each waiting for the one before,
 * with a start-to-start link across every fifth pair so the network is not a single chain.
 */
export async function addLongProgrammeJob(
  ds: DataSource,
  tasks: number,
): Promise<string> {
  const parties = [
    "workshop",
    "electrician",
    "workshop",
    "plasterer",
    "decorator",
  ] as const;
  return ds.transaction(async (m) => {
    const workshop = await m.findOneByOrFail(Workshop, {
      name: DEMO_WORKSHOP_NAME,
    });
    const customer = await buildCustomer(m, workshop, {
      name: "Customer of Example Lodge",
      email: "lodge@example.test",
    });
    const job = await buildJob(m, workshop, customer, {
      title: LONG_JOB_TITLE,
      siteAddress: "Example Lodge, Wetherfold",
      postcode: "QX7 2LL",
      area: "Wetherfold",
      status: "planned",
      handoverDate: null,
    });
    const made = [];
    for (let i = 0; i < tasks; i++) {
      const party = parties[i % parties.length];
      made.push(
        await buildTask(m, job, {
          name: `Stage ${i + 1}`,
          party,
          durationDays:
            party === "workshop" ? 1 + (i % 3) : 0.5 + (i % 2) * 0.5,
        }),
      );
      if (i > 0) await buildLink(m, made[i - 1], made[i]);
      if (i >= 2 && i % 5 === 0)
        await buildLink(m, made[i - 2], made[i], { kind: "SS", lag: 1 });
    }
    return job.id;
  });
}
