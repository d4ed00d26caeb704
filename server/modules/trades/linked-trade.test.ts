// Issue 14: a trade who already has a Sitecue account from another workshop is linked, not
// duplicated — the invitation names the workshop asking, is accepted by signing in (the password
// and the person's other sessions untouched: OWASP ASVS v4.0.3 3.3.3 is about a *changed*
// password, and nothing here changes it), days off stay one set, and the demo's second workshop
// shares the plasterer: both in their visits and feed, each workshop seeing the other only as busy.
import ICAL from "ical.js";
import { In } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  anonymous,
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  buildMember,
  buildTask,
  buildUser,
  buildWorkshop,
} from "../../../tests/factories/builders";
import {
  DEMO_PASSWORD,
  demoAccounts,
  DEMO_WORKSHOP_NAME,
  weekdaysFrom,
} from "../../../tests/factories/demo-scenario";
import { demoSecondWorkshop } from "../../../tests/factories/demo-second-workshop";
import { AuthToken } from "../auth/auth-tokens.entity";
import { Booking } from "../bookings/bookings.entity";
import { Job } from "../jobs/jobs.entity";
import { localToday } from "../jobs/jobs.presenter";
import { User } from "../users/users.entity";
import { Workshop } from "../workshops/workshops.entity";
import { Trade, TradeMember } from "./trades.entity";

let t: TestApp;
let dev: User;
let third: Workshop;
let thirdOwner: Session;

// Names of the two demo workshops and the demo's own records of the plasterer: none of them may
// reach a third workshop adding or inviting the same person.
const elsewhere = [
  DEMO_WORKSHOP_NAME,
  demoSecondWorkshop.name,
  "Ashby Plaster & Coving",
  demoSecondWorkshop.tradeBusinessName,
  "Alcove cabinets",
  demoSecondWorkshop.jobTitle,
];

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  dev = await m.findOneByOrFail(User, { email: demoAccounts.trade.email });
  third = await buildWorkshop(m, { name: "Pennock Fitted Furniture" });
  const owner = await buildUser(m, {
    email: "ada@pennockfitted.example.test",
    name: "Ada Pennock",
    password: DEMO_PASSWORD,
  });
  await buildMember(m, third, owner, "owner");
  thirdOwner = await signIn(t, owner.email);
}, 120_000);
afterAll(async () => t?.close());

const today = () => localToday("Europe/London");

async function addTrade(s: Session, workshopId: string, email: string) {
  return s.agent
    .post(`/api/workshops/${workshopId}/trades`)
    .set("X-CSRF-Token", s.csrf)
    .send({
      kind: "plasterer",
      businessName: "Dev Ashby (plaster)",
      contactName: "Dev Ashby",
      email,
      phone: "07700 900 114",
      workingWeekdays: [1, 2, 3, 4, 5],
      dayStart: "08:00",
      dayEnd: "16:30",
      // A day off the workshop already knew of, from a phone call.
      daysOff: ["2027-02-05"],
    });
}

async function inviteTrade(s: Session, workshopId: string, tradeId: string) {
  const before = new Set(t.mail.messages());
  const res = await s.agent
    .post(`/api/workshops/${workshopId}/invitations`)
    .set("X-CSRF-Token", s.csrf)
    .send({
      role: "trade",
      name: "Dev Ashby",
      email: dev.email,
      tradeId,
    });
  expect(res.status).toBe(201);
  const mail = await t.mail.waitFor(
    (m) => !before.has(m) && m.to.includes(dev.email),
  );
  const token = mail.links
    .find((l) => l.includes("/invite/"))!
    .split("/invite/")[1];
  return { res, mail, token };
}

const accept = (s: Session, token: string) =>
  s.agent
    .post("/api/auth/accept-invitation")
    .set("X-CSRF-Token", s.csrf)
    .send({ token });

describe("an invitee who already has an account", () => {
  it("adding the trade says only that an account exists, never where", async () => {
    const res = await addTrade(thirdOwner, third.id, dev.email);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      hasAccount: false,
      emailHasAccount: true,
    });
    const text = JSON.stringify(res.body);
    for (const word of elsewhere) expect(text).not.toContain(word);
    const list = await thirdOwner.agent
      .get(`/api/workshops/${third.id}/trades`)
      .expect(200);
    const listed = JSON.stringify(list.body);
    for (const word of elsewhere) expect(listed).not.toContain(word);
    // An address with no account says so too.
    const fresh = await addTrade(
      thirdOwner,
      third.id,
      "new.plasterer@example.test",
    );
    expect(fresh.body).toMatchObject({
      hasAccount: false,
      emailHasAccount: false,
    });
  });

  it("is asked to sign in, and accepting links the trade with the password and sessions untouched", async () => {
    const m = t.db.ds.manager;
    // The plasterer's days off, entered once for the workshops they already work for.
    const phone = await signIn(t, dev.email);
    await phone.agent
      .put("/api/me/days-off")
      .set("X-CSRF-Token", phone.csrf)
      .send({ daysOff: ["2027-02-01"] })
      .expect(200);
    const hashBefore = (await m.findOneByOrFail(User, { id: dev.id }))
      .passwordHash;
    const linksBefore = await m.countBy(TradeMember, { userId: dev.id });

    const record = (await addTrade(thirdOwner, third.id, dev.email)).body;
    const { res, mail, token } = await inviteTrade(
      thirdOwner,
      third.id,
      record.id,
    );
    // The answer says what the owner needs (they will be asked to link), and nothing of where.
    expect(res.body.existingAccount).toBe(true);
    for (const word of elsewhere)
      expect(JSON.stringify(res.body)).not.toContain(word);
    // Still one account for the address.
    expect(await m.countBy(User, { email: dev.email })).toBe(1);

    // The e-mail says which workshop asks, as what, and to sign in (not to choose a password).
    expect(mail.subject).toBe(
      "Pennock Fitted Furniture invites you to Sitecue",
    );
    expect(mail.text).toContain(
      "Pennock Fitted Furniture asks you to join their jobs on Sitecue as Dev Ashby (plaster).",
    );
    expect(mail.text).toContain("Sign in to accept");
    expect(mail.text).not.toContain("Choose a password");
    for (const word of elsewhere) expect(mail.text).not.toContain(word);

    // The link's page says the same.
    const info = await (
      await anonymous(t)
    ).agent
      .get(`/api/auth/tokens/${token}`)
      .expect(200);
    expect(info.body).toMatchObject({
      kind: "invitation",
      workshopName: "Pennock Fitted Furniture",
      role: "trade",
      tradeName: "Dev Ashby (plaster)",
      existingAccount: true,
    });

    // The link cannot set (overwrite) the existing account's password.
    const stranger = await anonymous(t);
    const set = await stranger.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", stranger.csrf)
      .send({ token, password: "someone-elses-password" });
    expect(set.status).toBe(409);
    expect(set.body.error.message).toMatch(/Sign in to accept/);
    // Not signed in: refused.
    const anon = await accept(stranger, token);
    expect(anon.status).toBe(401);
    // Signed in as someone else: refused, and nothing linked.
    const rosa = await signIn(t, demoAccounts.customer.email);
    const wrong = await accept(rosa, token);
    expect(wrong.status).toBe(403);
    expect(wrong.body.error.message).toContain(dev.email);
    expect(await m.countBy(TradeMember, { userId: dev.id })).toBe(linksBefore);

    // Signed in as the invited account: linked.
    const laptop = await signIn(t, dev.email);
    const ok = await accept(laptop, token);
    expect(ok.status).toBe(200);
    expect(ok.body.user.trades).toContainEqual(
      expect.objectContaining({
        tradeId: record.id,
        workshopName: "Pennock Fitted Furniture",
      }),
    );
    expect(await m.countBy(TradeMember, { userId: dev.id })).toBe(
      linksBefore + 1,
    );
    // The password is as it was, and the other session carries on.
    expect((await m.findOneByOrFail(User, { id: dev.id })).passwordHash).toBe(
      hashBefore,
    );
    await signIn(t, dev.email, DEMO_PASSWORD);
    expect((await phone.agent.get("/api/me/visits")).status).toBe(200);
    expect((await laptop.agent.get("/api/me/visits")).status).toBe(200);
    // The owner's list now shows the trade as linked.
    const listed = (
      await thirdOwner.agent.get(`/api/workshops/${third.id}/trades`)
    ).body.trades.find((x: { id: string }) => x.id === record.id);
    expect(listed).toMatchObject({ hasAccount: true, emailHasAccount: false });

    // Days off are one set: every record of the person holds both days.
    const records = await m.findBy(Trade, {
      id: In(
        (await m.findBy(TradeMember, { userId: dev.id })).map((l) => l.tradeId),
      ),
    });
    expect(records).toHaveLength(linksBefore + 1);
    for (const r of records)
      expect([...r.daysOff].sort()).toEqual(["2027-02-01", "2027-02-05"]);
    expect((await phone.agent.get("/api/me/days-off")).body).toEqual({
      daysOff: ["2027-02-01", "2027-02-05"],
    });

    // Used once.
    const again = await accept(laptop, token);
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe("token-invalid");
  });

  it("an invitation left to expire leaves nothing behind", async () => {
    const m = t.db.ds.manager;
    const record = (await addTrade(thirdOwner, third.id, dev.email)).body;
    const { token } = await inviteTrade(thirdOwner, third.id, record.id);
    await m
      .createQueryBuilder()
      .update(AuthToken)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where("grant LIKE :g", { g: `%${record.id}%` })
      .execute();
    const s = await signIn(t, dev.email);
    const res = await accept(s, token);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("token-invalid");
    expect(await m.countBy(TradeMember, { tradeId: record.id })).toBe(0);
    expect(await m.countBy(User, { email: dev.email })).toBe(1);
  });
});

describe("the demo's second workshop shares the plasterer", () => {
  const names = () => [DEMO_WORKSHOP_NAME, demoSecondWorkshop.name];

  it("'Your visits' lists both workshops' visits, each with its workshop's name", async () => {
    const s = await signIn(t, dev.email);
    const res = await s.agent.get("/api/me/visits").expect(200);
    const up = res.body.upcoming as {
      workshopName: string;
      start: string;
      tradeBusinessName: string;
    }[];
    expect(new Set(up.map((v) => v.workshopName))).toEqual(new Set(names()));
    const second = up.filter((v) => v.workshopName === demoSecondWorkshop.name);
    const d = (n: number) => weekdaysFrom(today(), n);
    expect(second.map((v) => v.start.slice(0, 10))).toEqual([
      d(demoSecondWorkshop.plastererDays.skim),
      d(demoSecondWorkshop.plastererDays.makeGood),
    ]);
    expect(second[0].tradeBusinessName).toBe(
      demoSecondWorkshop.tradeBusinessName,
    );
  });

  it("the feed holds both workshops' visits, each named, with UIDs unique across workshops (RFC 5545 §3.8.4.7)", async () => {
    const s = await signIn(t, dev.email);
    const made = await s.agent
      .post("/api/me/feed")
      .set("X-CSRF-Token", s.csrf)
      .expect(201);
    const text = (
      await (
        await anonymous(t)
      ).agent
        .get(new URL(made.body.url).pathname)
        .expect(200)
    ).text;
    const events = new ICAL.Component(ICAL.parse(text)).getAllSubcomponents(
      "vevent",
    );
    const uids = events.map((e) => String(e.getFirstPropertyValue("uid")));
    expect(new Set(uids).size).toBe(uids.length);
    const m = t.db.ds.manager;
    const mine = await m.findBy(Booking, {
      tradeId: In(
        (await m.findBy(TradeMember, { userId: dev.id })).map((l) => l.tradeId),
      ),
      state: In(["sent", "confirmed", "date-proposed", "needs-reconfirming"]),
    });
    expect(uids.sort()).toEqual(mine.map((b) => b.icalUid).sort());
    for (const name of names())
      expect(
        events.some((e) =>
          String(e.getFirstPropertyValue("description")).startsWith(`${name}:`),
        ),
        name,
      ).toBe(true);
  });

  it("the second workshop's owner sees the first's bookings of the plasterer only as busy, and booking over one is refused as busy", async () => {
    const m = t.db.ds.manager;
    const ines = await signIn(t, demoSecondWorkshop.owner.email);
    const ws = await m.findOneByOrFail(Workshop, {
      name: demoSecondWorkshop.name,
    });
    const record = await m.findOneByOrFail(Trade, {
      workshopId: ws.id,
      businessName: demoSecondWorkshop.tradeBusinessName,
    });
    const from = today();
    const to = weekdaysFrom(from, 30);
    const busy = (
      await ines.agent
        .get(`/api/trades/${record.id}/busy?from=${from}&to=${to}`)
        .expect(200)
    ).body.busy as { start: string; label: string; ownWorkshop: boolean }[];
    const hollin = await m.findOneByOrFail(Workshop, {
      name: DEMO_WORKSHOP_NAME,
    });
    const hollinRecord = await m.findOneByOrFail(Trade, {
      workshopId: hollin.id,
      businessName: "Ashby Plaster & Coving",
    });
    const theirs = (
      await m.findBy(Booking, {
        tradeId: hollinRecord.id,
        state: In(["sent", "confirmed"]),
      })
    ).filter((b) => b.start.slice(0, 10) >= from);
    expect(theirs.length).toBeGreaterThan(0);
    for (const b of theirs)
      expect(busy).toContainEqual({
        start: b.start,
        finish: b.finish,
        label: "Busy (another workshop)",
        ownWorkshop: false,
      });
    expect(busy.filter((b) => b.ownWorkshop)).toHaveLength(2);
    const text = JSON.stringify(busy);
    for (const word of ["Alcove", "Template coving", "Larkspur", "Rosa"])
      expect(text).not.toContain(word);

    // Booking the plasterer over the first workshop's visit is refused, naming only "busy".
    const job = await m.findOneByOrFail(Job, {
      title: demoSecondWorkshop.jobTitle,
    });
    const patch = await buildTask(m, job, {
      name: "Patch the pantry ceiling",
      party: "plasterer",
      durationDays: 0.5,
    });
    const clash = await ines.agent
      .post(`/api/jobs/${job.id}/bookings`)
      .set("X-CSRF-Token", ines.csrf)
      .send({
        taskId: patch.id,
        tradeId: record.id,
        start: theirs[0].start,
        arrivalWindow: "morning",
      });
    expect(clash.status).toBe(409);
    expect(clash.body.error.message).toMatch(/busy for another workshop/);
    for (const word of ["Alcove", "Template coving", "Larkspur", "Rosa"])
      expect(clash.body.error.message).not.toContain(word);
  });
});
