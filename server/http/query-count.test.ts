// Issue 15: what a page costs in SQL must not grow with the size of the workshop. Each route is
// asked at 5 and then at 50 added jobs (the demo grown by tests/factories/big-workshop.ts, two
// workshops sharing the plasterer), and the statements it sent — counted through TypeORM's logger
// and the session store, written in each response's Server-Timing header — must be the same.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../tests/setup/test-app";
import {
  demoAccounts,
  demoJobTitles,
} from "../../tests/factories/demo-scenario";
import { growDemoWorkshop } from "../../tests/factories/big-workshop";
import { statementsIn } from "../db/query-tally";
import { Booking } from "../modules/bookings/bookings.entity";
import { Job } from "../modules/jobs/jobs.entity";
import { localToday } from "../modules/jobs/jobs.presenter";
import { Trade } from "../modules/trades/trades.entity";

let t: TestApp;
const today = localToday("Europe/London");
const who: Record<"owner" | "trade" | "customer", Session> = {} as never;
const feeds: Record<"owner" | "trade" | "customer", string> = {} as never;
let alcoves: Job;
let visitId: string;

interface Probe {
  name: string;
  as: keyof typeof who | "none";
  path: () => string;
}

const probes: Probe[] = [
  { name: "session", as: "owner", path: () => "/api/auth/session" },
  { name: "health", as: "none", path: () => "/api/health" },
  {
    name: "attention (home)",
    as: "owner",
    path: () => `/api/workshops/${alcoves.workshopId}/attention`,
  },
  {
    name: "away clashes (home)",
    as: "owner",
    path: () => `/api/workshops/${alcoves.workshopId}/away-clashes`,
  },
  {
    name: "unanswered bookings (home)",
    as: "owner",
    path: () => `/api/workshops/${alcoves.workshopId}/bookings/unanswered`,
  },
  { name: "unread threads", as: "owner", path: () => "/api/thread/unread" },
  { name: "jobs list", as: "owner", path: () => "/api/jobs" },
  {
    name: "programme",
    as: "owner",
    path: () => `/api/jobs/${alcoves.id}/programme`,
  },
  {
    name: "owner's feed",
    as: "none",
    path: () => new URL(feeds.owner).pathname,
  },
  {
    name: "workshop calendar range",
    as: "owner",
    path: () =>
      `/api/calendar?scope=workshop&id=${alcoves.workshopId}&from=${today}&to=${plusDays(today, 42)}`,
  },
  {
    name: "job calendar range",
    as: "owner",
    path: () =>
      `/api/calendar?scope=job&id=${alcoves.id}&from=${today}&to=${plusDays(today, 42)}`,
  },
  { name: "trade's visits", as: "trade", path: () => "/api/me/visits" },
  {
    name: "trade's visit",
    as: "trade",
    path: () => `/api/visits/${visitId}`,
  },
  {
    name: "trade's feed",
    as: "none",
    path: () => new URL(feeds.trade).pathname,
  },
  {
    name: "trade calendar range",
    as: "trade",
    path: () =>
      `/api/calendar?scope=me&from=${today}&to=${plusDays(today, 42)}`,
  },
  {
    name: "customer's timeline",
    as: "customer",
    path: () => `/api/jobs/${alcoves.id}/timeline`,
  },
  {
    name: "customer's feed",
    as: "none",
    path: () => new URL(feeds.customer).pathname,
  },
];

function plusDays(date: string, n: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + n);
  return d.toISOString().slice(0, 10);
}

async function countAll(): Promise<Record<string, number>> {
  const counts: Record<string, number> = {};
  for (const p of probes) {
    const agent = p.as === "none" ? null : who[p.as].agent;
    const res = agent
      ? await agent.get(p.path())
      : await (await import("supertest")).default(t.sitecue.app).get(p.path());
    // A refused request or a missing count shows as a negative figure, which fails below.
    const n = statementsIn(res.headers["server-timing"]);
    counts[p.name] = res.status === 200 && n !== null ? n : -res.status;
  }
  return counts;
}

let at5: Record<string, number>;
let at50: Record<string, number>;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  await growDemoWorkshop(t.db.ds, today, 5);
  who.owner = await signIn(t, demoAccounts.owner.email);
  who.trade = await signIn(t, demoAccounts.trade.email);
  who.customer = await signIn(t, demoAccounts.customer.email);
  for (const k of Object.keys(who) as (keyof typeof who)[]) {
    const made = await who[k].agent
      .post("/api/me/feed")
      .set("X-CSRF-Token", who[k].csrf)
      .expect(201);
    feeds[k] = made.body.url;
  }
  alcoves = await t.db.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
  const plasterer = await t.db.ds.manager.findOneByOrFail(Trade, {
    workshopId: alcoves.workshopId,
    businessName: "Ashby Plaster & Coving",
  });
  visitId = (
    await t.db.ds.manager.findOneByOrFail(Booking, {
      tradeId: plasterer.id,
      state: "confirmed",
    })
  ).id;
  // A first round warms what is made once per process (the session's first touch, caches).
  await countAll();
  at5 = await countAll();
  await growDemoWorkshop(t.db.ds, today, 45, 6);
  at50 = await countAll();
  console.log(
    "statements per request at 5 / 50 added jobs:\n" +
      probes
        .map((p) => `  ${p.name}: ${at5[p.name]} / ${at50[p.name]}`)
        .join("\n"),
  );
}, 300_000);
afterAll(async () => t?.close());

describe("statements per request (issue 15)", () => {
  for (const p of probes)
    it(`${p.name} sends as many statements at 50 jobs as at 5`, () => {
      expect(at5[p.name], "answered 200 with a count").toBeGreaterThan(0);
      expect(at50[p.name]).toBe(at5[p.name]);
    });

  it("a signed-in request loads the person in one statement and writes no session", () => {
    // session: one read of the session row, one of the person with their memberships.
    expect(at5.session).toBe(2);
  });
});
