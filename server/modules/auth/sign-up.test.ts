// Issue 14: "Create your workshop", the address check, the password rule, and "until verified,
// the owner can look around but sends nothing to anyone".
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import {
  anonymous,
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import { createJobFromStarter } from "../../../tests/setup/jobs";
import { buildMember, buildUser } from "../../../tests/factories/builders";
import { demoAccounts } from "../../../tests/factories/demo-scenario";
import { OutboxMessage } from "../../infra/outbox/outbox.entity";
import { AuditEntry } from "../audit/audit.entity";
import { ProgrammeStarter } from "../starters/starters.entity";
import { ThreadNotice } from "../thread/thread.entity";
import { User } from "../users/users.entity";
import { Workshop, WorkshopMember } from "../workshops/workshops.entity";
import { AuthToken } from "./auth-tokens.entity";
import { hashToken } from "./tokens";

let t: TestApp;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
}, 120_000);
afterAll(async () => t?.close());

let serial = 0;
const freshEmail = () =>
  `owner-${Date.now()}-${++serial}@newjoinery.example.test`;

const sid = (res: request.Response) =>
  ([] as string[])
    .concat(res.headers["set-cookie"] ?? [])
    .find((c) => c.startsWith("sitecue.sid="))
    ?.split(";")[0];

/** Signs a workshop up through the real route, from a fresh anonymous browser. */
async function signUp(body: {
  workshopName?: string;
  name?: string;
  email: string;
  password?: string;
}) {
  const s = await anonymous(t);
  const res = await s.agent
    .post("/api/auth/sign-up")
    .set("X-CSRF-Token", s.csrf)
    .send({
      workshopName: "Fettle & Grain Joinery",
      name: "Ada Fettle",
      password: "sawdust-and-shellac",
      ...body,
    });
  const session: Session = { ...s, csrf: res.body.csrfToken ?? s.csrf };
  return { res, session };
}

/** The address-check link e-mailed to `to` (one not in `seen`), and its token. */
async function verificationLink(to: string, seen = new Set<unknown>()) {
  const mail = await t.mail.waitFor(
    (m) =>
      m.to.includes(to) &&
      m.subject === "Confirm your e-mail address for Sitecue" &&
      !seen.has(m),
  );
  const link = mail.links.find((l) => l.includes("/verify/"));
  expect(link, "a /verify/ link in the e-mail").toBeDefined();
  return { mail, link: link!, token: link!.split("/verify/")[1]! };
}

const outboxFor = async (workshopId: string) =>
  t.db.ds.getRepository(OutboxMessage).findBy({ workshopId });

describe("create your workshop", () => {
  it("makes the owner, the workshop with its defaults and starters, an audit row and the address-check e-mail, and signs in", async () => {
    const email = freshEmail();
    const before = await anonymous(t);
    const beforeSid = sid(await before.agent.get("/api/auth/session"));
    const res = await before.agent
      .post("/api/auth/sign-up")
      .set("X-CSRF-Token", before.csrf)
      .send({
        workshopName: "  Fettle & Grain Joinery ",
        name: "Ada Fettle",
        // An address typed in capitals is the same account (as at sign-in).
        email: email.toUpperCase(),
        password: "sawdust-and-shellac",
      });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({
      email,
      name: "Ada Fettle",
      emailVerified: false,
      memberships: [{ role: "owner", workshopName: "Fettle & Grain Joinery" }],
    });
    // Signed in straight away on a new session id (session fixation, OWASP ASVS v4.0.3 3.2.1).
    expect(sid(res)).toBeDefined();
    expect(sid(res)).not.toBe(beforeSid);
    expect(res.body.csrfToken).not.toBe(before.csrf);
    const session = await before.agent.get("/api/auth/session");
    expect(session.body.user.email).toBe(email);

    const workshopId = res.body.user.memberships[0].workshopId as string;
    const m = t.db.ds.manager;
    expect(await m.findOneByOrFail(Workshop, { id: workshopId })).toMatchObject(
      {
        name: "Fettle & Grain Joinery",
        timeZone: "Europe/London",
        holidayRegion: "GB-ENG",
        workingWeekdays: [1, 2, 3, 4, 5],
        dayStart: "08:00",
        dayEnd: "17:00",
      },
    );
    const user = await m.findOneByOrFail(User, { email });
    expect(user.emailVerifiedAt).toBeNull();
    expect(user.passwordHash).toMatch(/^\$argon2id\$/);
    expect(
      await m.countBy(WorkshopMember, {
        workshopId,
        userId: user.id,
        role: "owner",
      }),
    ).toBe(1);
    // The same starters the demo workshop gets.
    const starters = await m.findBy(ProgrammeStarter, { workshopId });
    expect(starters.map((s) => s.name).sort()).toContain(
      "Alcove cabinets (pair)",
    );
    expect(starters.length).toBeGreaterThanOrEqual(3);
    expect(
      await m.countBy(AuditEntry, {
        workshopId,
        action: "workshop.created",
        actorUserId: user.id,
      }),
    ).toBe(1);

    const { mail, token } = await verificationLink(email);
    expect(mail.text).toContain("Fettle & Grain Joinery");
    expect(mail.text).toMatch(/expires in 7 days/);
    const stored = await m.findOneByOrFail(AuthToken, {
      userId: user.id,
      kind: "verify-email",
    });
    // Stored only as its SHA-256, valid for 7 days.
    expect(stored.tokenHash).toBe(hashToken(token));
    expect(stored.tokenHash).not.toBe(token);
    const days = (stored.expiresAt.getTime() - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.9);
    expect(days).toBeLessThanOrEqual(7);
    // The only e-mail an unverified workshop causes is this one, to the owner, about the account.
    expect(await outboxFor(workshopId)).toEqual([]);
  });

  it("verifies the address with the e-mailed link once; a used link says so in its own words", async () => {
    const email = freshEmail();
    const { res, session } = await signUp({ email });
    expect(res.status).toBe(201);
    const { token } = await verificationLink(email);
    // Opened in any browser: the link proves the address, it does not sign anyone in.
    const elsewhere = await anonymous(t);
    const used = await elsewhere.agent
      .post("/api/auth/verify-email")
      .set("X-CSRF-Token", elsewhere.csrf)
      .send({ token });
    expect(used.status).toBe(200);
    expect(used.body).toEqual({ email });
    expect(
      (await elsewhere.agent.get("/api/auth/session")).body.user,
    ).toBeNull();
    expect(
      (await session.agent.get("/api/auth/session")).body.user.emailVerified,
    ).toBe(true);

    const again = await elsewhere.agent
      .post("/api/auth/verify-email")
      .set("X-CSRF-Token", elsewhere.csrf)
      .send({ token });
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe("token-invalid");
    expect(again.body.error.message).toBe(
      "This link has already been used: your e-mail address is confirmed. Sign in to carry on.",
    );
    // Already verified: nothing to send again.
    const resend = await session.agent
      .post("/api/auth/verify-email/resend")
      .set("X-CSRF-Token", session.csrf);
    expect(resend.status).toBe(409);
    expect(resend.body.error.message).toBe(
      "Your e-mail address is already confirmed.",
    );
  });

  it("says an expired link has expired, and 'Send it again' e-mails a new one that works", async () => {
    const email = freshEmail();
    const { session } = await signUp({ email });
    const first = await verificationLink(email);
    await t.db.ds
      .getRepository(AuthToken)
      .update(
        { tokenHash: hashToken(first.token) },
        { expiresAt: new Date(Date.now() - 1000) },
      );
    const expired = await session.agent
      .post("/api/auth/verify-email")
      .set("X-CSRF-Token", session.csrf)
      .send({ token: first.token });
    expect(expired.status).toBe(404);
    expect(expired.body.error.message).toBe(
      "This link has expired. Sign in and choose “Send it again” for a new one.",
    );

    const seen = new Set<unknown>(t.mail.messages());
    const resend = await session.agent
      .post("/api/auth/verify-email/resend")
      .set("X-CSRF-Token", session.csrf);
    expect(resend.status).toBe(200);
    expect(resend.body).toEqual({ email });
    const second = await verificationLink(email, seen);
    expect(second.token).not.toBe(first.token);
    const ok = await session.agent
      .post("/api/auth/verify-email")
      .set("X-CSRF-Token", session.csrf)
      .send({ token: second.token });
    expect(ok.status).toBe(200);
  });

  it("does not take an address-check link as a set-password link, or the other way round", async () => {
    const email = freshEmail();
    await signUp({ email });
    const { token } = await verificationLink(email);
    const s = await anonymous(t);
    const set = await s.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", s.csrf)
      .send({ token, password: "a-different-password" });
    expect(set.status).toBe(404);
    expect(
      (await request(t.sitecue.app).get(`/api/auth/tokens/${token}`)).status,
    ).toBe(404);
  });
});

describe("duplicates", () => {
  it("refuses an address that already has an account with a 409 and a field message, and creates nothing", async () => {
    const workshops = await t.db.ds.getRepository(Workshop).count();
    const { res } = await signUp({
      email: demoAccounts.owner.email.toUpperCase(),
      workshopName: "Another Joinery",
    });
    expect(res.status).toBe(409);
    expect(res.body.error).toEqual({
      code: "conflict",
      message:
        "That address already has a Sitecue account — sign in, or reset your password.",
      fields: {
        email: [
          "That address already has a Sitecue account — sign in, or reset your password",
        ],
      },
    });
    expect(await t.db.ds.getRepository(Workshop).count()).toBe(workshops);
  });

  it("refuses the second of two sign-ups for one address made at the same moment", async () => {
    const email = freshEmail();
    const [a, b] = await Promise.all([
      signUp({ email, workshopName: "Race One" }),
      signUp({ email, workshopName: "Race Two" }),
    ]);
    expect([a.res.status, b.res.status].sort()).toEqual([201, 409]);
    expect(await t.db.ds.getRepository(User).countBy({ email })).toBe(1);
  });

  it("allows a workshop name another workshop already has (two firms can share a name)", async () => {
    const one = await signUp({
      email: freshEmail(),
      workshopName: "Oak & Pine",
    });
    const two = await signUp({
      email: freshEmail(),
      workshopName: "Oak & Pine",
    });
    expect([one.res.status, two.res.status]).toEqual([201, 201]);
    expect(
      await t.db.ds.getRepository(Workshop).countBy({ name: "Oak & Pine" }),
    ).toBe(2);
  });
});

describe("the password rule (NIST SP 800-63B §5.1.1.2; OWASP ASVS v4.0.3 2.1.7, 2.1.9)", () => {
  const refusedWith = async (
    password: string,
    extra: { workshopName?: string; email?: string } = {},
  ) => {
    const { res } = await signUp({
      email: freshEmail(),
      password,
      ...extra,
    });
    expect(res.status, password).toBe(400);
    expect(res.body.error.code).toBe("validation");
    return res.body.error.fields.password as string[];
  };

  it("asks for at least 8 characters, and takes 8 with no composition rules", async () => {
    expect(await refusedWith("oak1234")).toEqual(["Use at least 8 characters"]);
    // Eight lower-case letters, no digit or symbol: allowed (no composition rules, ASVS 2.1.9).
    const { res } = await signUp({ email: freshEmail(), password: "mitresaw" });
    expect(res.status).toBe(201);
  });

  it("refuses passwords from breach corpuses, whatever their case", async () => {
    for (const p of ["password1", "iloveyou2", "Qwertyuiop", "1qaz2wsx3edc"])
      expect(await refusedWith(p)).toEqual([
        "That password is on a list of passwords used in breaches — choose another",
      ]);
  });

  it("refuses the e-mail address or the workshop's name as the password (context-specific words)", async () => {
    const email = freshEmail();
    expect(await refusedWith(email, { email })).toEqual([
      "Don't use your e-mail address or the workshop's name as your password — choose another",
    ]);
    expect(
      await refusedWith("Bramble Joinery", { workshopName: "Bramble Joinery" }),
    ).toEqual([
      "Don't use your e-mail address or the workshop's name as your password — choose another",
    ]);
  });

  it("applies the same rule when an invitation or a reset link sets the password", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const workshopId = (await owner.agent.get("/api/auth/session")).body.user
      .memberships[0].workshopId;
    const invitee = `invitee-${Date.now()}@example.test`;
    await owner.agent
      .post(`/api/workshops/${workshopId}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ role: "fitter", name: "Ivy Rule", email: invitee })
      .expect(201);
    const invitation = await t.mail.waitFor((m) => m.to.includes(invitee));
    const inviteToken = invitation.links
      .find((l) => l.includes("/invite/"))!
      .split("/invite/")[1];
    const s = await anonymous(t);
    const setWeak = async (token: string, password: string) =>
      s.agent
        .post("/api/auth/set-password")
        .set("X-CSRF-Token", s.csrf)
        .send({ token, password });
    const weak = await setWeak(inviteToken, "sunshine1");
    expect(weak.status).toBe(400);
    expect(weak.body.error.fields.password).toEqual([
      "That password is on a list of passwords used in breaches — choose another",
    ]);
    const named = await setWeak(inviteToken, "Hollin & Vane Joinery");
    expect(named.status).toBe(400);
    // The refusal used nothing up: the invitation still works, and accepting it proves the address.
    const accepted = await setWeak(inviteToken, "ivy-rule-password");
    expect(accepted.status).toBe(200);
    expect(accepted.body.user.emailVerified).toBe(true);

    const seen = new Set<unknown>(t.mail.messages());
    await s.agent
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", accepted.body.csrfToken)
      .send({ email: invitee })
      .expect(202);
    const reset = await t.mail.waitFor(
      (m) =>
        m.to.includes(invitee) &&
        m.subject === "Reset your Sitecue password" &&
        !seen.has(m),
    );
    const resetToken = reset.links
      .find((l) => l.includes("/reset/"))!
      .split("/reset/")[1];
    const r = await anonymous(t);
    const resetWeak = await r.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", r.csrf)
      .send({ token: resetToken, password: "12345678" });
    expect(resetWeak.status).toBe(400);
    expect(resetWeak.body.error.fields.password).toEqual([
      "That password is on a list of passwords used in breaches — choose another",
    ]);
  });
});

describe("until verified, the owner sends nothing to anyone", () => {
  it("refuses to invite, send a booking or post a message that notifies, queueing no e-mail; after the link, the same actions work", async () => {
    const email = freshEmail();
    const { res, session: owner } = await signUp({
      email,
      workshopName: "Quiet Start Joinery",
    });
    const workshopId = res.body.user.memberships[0].workshopId as string;
    const m = t.db.ds.manager;
    // A second member who would be told of a thread message (added directly: an unverified owner
    // cannot invite one, which is the point of this test).
    const fitter = await buildUser(m, { name: "Finn Quiet" });
    const ws = await m.findOneByOrFail(Workshop, { id: workshopId });
    await buildMember(m, ws, fitter, "fitter");

    // Looking around and preparing work is allowed: a trade, a customer, a job, a draft booking.
    const post = (path: string, body?: object) =>
      owner.agent
        .post(path)
        .set("X-CSRF-Token", owner.csrf)
        .send(body ?? {});
    const trade = await post(`/api/workshops/${workshopId}/trades`, {
      businessName: "Quiet Plastering",
      kind: "plasterer",
      contactName: "Pat Quiet",
      email: "pat@quietplastering.example.test",
      phone: "01632 960 700",
    });
    expect(trade.status).toBe(201);
    const customer = await post(`/api/workshops/${workshopId}/customers`, {
      name: "Cass Quiet",
      email: "cass.quiet@example.test",
    });
    expect(customer.status).toBe(201);
    const jobId = await createJobFromStarter(owner, {
      workshopId,
      customerId: customer.body.id,
      title: "Quiet alcoves",
    });
    const programme = (await owner.agent.get(`/api/jobs/${jobId}/programme`))
      .body as { tasks: { id: string; name: string }[] };
    const template = programme.tasks.find((x) => x.name === "Template coving")!;
    const options = (
      await owner.agent.get(
        `/api/jobs/${jobId}/tasks/${template.id}/booking-options`,
      )
    ).body as { trades: { tradeId: string; firstFree: { start: string } }[] };
    const draft = await post(`/api/jobs/${jobId}/bookings`, {
      taskId: template.id,
      tradeId: trade.body.id,
      start: options.trades[0]!.firstFree.start,
      arrivalWindow: "morning",
      send: false,
    });
    expect(draft.status).toBe(201);
    expect(draft.body.state).toBe("draft");

    const notices = () => m.countBy(ThreadNotice, { jobId });
    const refusal = {
      code: "email-unverified",
      message: `Confirm your e-mail address first (we sent a link to ${email}). Until then Sitecue sends nothing to anyone for this workshop.`,
    };
    const attempts = {
      invite: () =>
        post(`/api/workshops/${workshopId}/invitations`, {
          role: "fitter",
          name: "Nell Quiet",
          email: "nell.quiet@example.test",
        }),
      sendDraft: () => post(`/api/bookings/${draft.body.id}/send`),
      message: () =>
        post(`/api/jobs/${jobId}/thread/messages`, {
          audience: "workshop",
          text: "Finn, can you check the alcove widths?",
        }),
    };
    for (const [name, attempt] of Object.entries(attempts)) {
      const r = await attempt();
      expect(r.status, name).toBe(403);
      expect(r.body.error, name).toEqual(refusal);
    }
    // Nothing queued, nothing owed, nothing half-done.
    expect(await outboxFor(workshopId)).toEqual([]);
    expect(await notices()).toBe(0);
    expect(
      (await owner.agent.get(`/api/jobs/${jobId}/bookings`)).body.bookings.map(
        (b: { state: string }) => b.state,
      ),
    ).toEqual(["draft"]);
    expect(
      (await owner.agent.get(`/api/jobs/${jobId}/thread`)).body.messages.filter(
        (x: { kind: string }) => x.kind === "message",
      ),
    ).toEqual([]);
    // The SMTP fake received nothing for the workshop's people either.
    const others = [
      "nell.quiet@example.test",
      "pat@quietplastering.example.test",
      fitter.email,
    ];
    expect(
      t.mail.messages().filter((x) => others.some((o) => x.to.includes(o))),
    ).toEqual([]);

    const { token } = await verificationLink(email);
    await post("/api/auth/verify-email", { token }).expect(200);

    expect((await attempts.invite()).status).toBe(201);
    expect((await attempts.sendDraft()).status).toBe(200);
    expect((await attempts.message()).status).toBe(201);
    expect(await notices()).toBe(1);
    await t.mail.waitFor((x) => x.to.includes("nell.quiet@example.test"));
    await t.mail.waitFor((x) =>
      x.to.includes("pat@quietplastering.example.test"),
    );
    // The thread notice goes out with the next sweep after its window.
    await t.sitecue.sendThreadNotices(new Date(Date.now() + 60 * 60_000));
    await t.mail.waitFor((x) => x.to.includes(fitter.email));
    expect((await outboxFor(workshopId)).length).toBe(3);
  });

  it("lets an owner who is not yet verified post a note nobody else would be told of", async () => {
    const email = freshEmail();
    const { res, session: owner } = await signUp({ email });
    const workshopId = res.body.user.memberships[0].workshopId as string;
    const customer = await owner.agent
      .post(`/api/workshops/${workshopId}/customers`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ name: "Noor Alone", email: "noor.alone@example.test" });
    const jobId = await createJobFromStarter(owner, {
      workshopId,
      customerId: customer.body.id,
      title: "Alone alcoves",
    });
    const note = await owner.agent
      .post(`/api/jobs/${jobId}/thread/messages`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ audience: "job", text: "Measure again on Monday." });
    expect(note.status).toBe(201);
    expect(await outboxFor(workshopId)).toEqual([]);
  });
});

describe("rate limits", () => {
  let limited: TestApp;
  beforeAll(async () => {
    limited = await startTestApp({ signInLimit: 2 });
  }, 120_000);
  afterAll(async () => limited?.close());

  it("counts every sign-up from an address, a duplicate included, and refuses past the limit with 429", async () => {
    const attempt = async (email: string) => {
      const s = await anonymous(limited);
      return s.agent
        .post("/api/auth/sign-up")
        .set("X-CSRF-Token", s.csrf)
        .send({
          workshopName: "Limit Joinery",
          name: "Lim It",
          email,
          password: "limit-joinery-pass",
        });
    };
    expect((await attempt("limit-one@example.test")).status).toBe(201);
    expect((await attempt("limit-one@example.test")).status).toBe(409);
    const third = await attempt("limit-two@example.test");
    expect(third.status).toBe(429);
    expect(third.body.error.code).toBe("rate-limited");
    expect(third.headers["retry-after"]).toMatch(/^\d+$/);
  });

  it("limits 'Send it again' per address", async () => {
    const u = await buildUser(limited.db.ds.manager, {
      email: "resend-2@example.test",
      emailVerifiedAt: null,
    });
    const owner = await signIn(limited, u.email);
    const resend = () =>
      owner.agent
        .post("/api/auth/verify-email/resend")
        .set("X-CSRF-Token", owner.csrf);
    expect((await resend()).status).toBe(200);
    expect((await resend()).status).toBe(200);
    expect((await resend()).status).toBe(429);
  });
});
