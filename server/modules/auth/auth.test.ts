import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import {
  anonymous,
  signIn,
  startTestApp,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  demoAccounts,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import { Workshop } from "../workshops/workshops.entity";
import { AuthToken } from "./auth-tokens.entity";

let t: TestApp;
let workshopId: string;

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  workshopId = (
    await t.db.ds.manager.findOneByOrFail(Workshop, {
      name: DEMO_WORKSHOP_NAME,
    })
  ).id;
}, 120_000);
afterAll(async () => t?.close());

const sid = (res: request.Response) =>
  ([] as string[])
    .concat(res.headers["set-cookie"] ?? [])
    .find((c) => c.startsWith("sitecue.sid="));

describe("sign-in and sign-out", () => {
  it("signs in with the right password, renews the session id and sets safe cookie flags", async () => {
    const s = await anonymous(t);
    const before = sid(await s.agent.get("/api/auth/session"));
    const res = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s.csrf)
      .send({ email: demoAccounts.owner.email, password: "sitecue-demo" });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(demoAccounts.owner.email);
    expect(res.body.user.memberships).toEqual([
      expect.objectContaining({
        role: "owner",
        workshopName: "Hollin & Vane Joinery",
      }),
    ]);
    const after = sid(res);
    expect(after).toBeDefined();
    expect(after!.split(";")[0]).not.toBe(before?.split(";")[0]);
    expect(after).toMatch(/HttpOnly/i);
    expect(after).toMatch(/SameSite=Lax/i);
    // The CSRF token is renewed with the session.
    expect(res.body.csrfToken).not.toBe(s.csrf);
    expect((await s.agent.get("/api/jobs")).status).toBe(200);
  });

  it("treats an e-mail in capitals as the same account", async () => {
    const s = await anonymous(t);
    const res = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s.csrf)
      .send({
        email: demoAccounts.fitter.email.toUpperCase(),
        password: "sitecue-demo",
      });
    expect(res.status).toBe(200);
  });

  it("refuses a wrong password and an unknown e-mail with the same answer", async () => {
    const s = await anonymous(t);
    const wrong = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s.csrf)
      .send({ email: demoAccounts.owner.email, password: "not-the-password" });
    const unknown = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s.csrf)
      .send({ email: "nobody@example.test", password: "not-the-password" });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe("invalid-credentials");
  });

  it("signs out: the session no longer reaches signed-in routes", async () => {
    const s = await signIn(t, demoAccounts.owner.email);
    const out = await s.agent
      .post("/api/auth/sign-out")
      .set("X-CSRF-Token", s.csrf);
    expect(out.status).toBe(200);
    expect(out.body.user).toBeNull();
    const jobs = await s.agent.get("/api/jobs");
    expect(jobs.status).toBe(401);
    expect(jobs.body.error.code).toBe("unauthenticated");
  });

  it("answers bad input with field errors, not a stack trace", async () => {
    const s = await anonymous(t);
    const res = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s.csrf)
      .send({ email: "not-an-email", password: "" });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("validation");
    expect(Object.keys(res.body.error.fields).sort()).toEqual([
      "email",
      "password",
    ]);
    const broken = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s.csrf)
      .set("Content-Type", "application/json")
      .send('{"email":');
    expect(broken.status).toBe(400);
    expect(JSON.stringify(broken.body)).not.toMatch(/at .*\.(ts|js):\d+/);
  });
});

describe("CSRF protection", () => {
  it("refuses a state-changing request without the session's token", async () => {
    const s = await anonymous(t);
    const none = await s.agent
      .post("/api/auth/sign-in")
      .send({ email: demoAccounts.owner.email, password: "sitecue-demo" });
    expect(none.status).toBe(403);
    expect(none.body.error.code).toBe("csrf");
    const wrong = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", "x".repeat(43))
      .send({ email: demoAccounts.owner.email, password: "sitecue-demo" });
    expect(wrong.status).toBe(403);
  });

  it("refuses a signed-in change carrying another session's token", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const other = await anonymous(t);
    const res = await owner.agent
      .post(`/api/workshops/${workshopId}/customers`)
      .set("X-CSRF-Token", other.csrf)
      .send({ name: "X", email: "x@example.test" });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe("csrf");
  });
});

describe("rate limiting", () => {
  it("answers 429 after too many sign-in attempts", async () => {
    const limited = await startTestApp({ signInLimit: 3 });
    try {
      const s = await anonymous(limited);
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const r = await s.agent
          .post("/api/auth/sign-in")
          .set("X-CSRF-Token", s.csrf)
          .send({ email: "nobody@example.test", password: "guess-" + i });
        statuses.push(r.status);
      }
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
    } finally {
      await limited.close();
    }
  });
});

describe("invitations", () => {
  it("lets the owner invite a fitter who sets a password once and joins the workshop", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const email = "new.fitter@hollinvane.example.test";
    const res = await owner.agent
      .post(`/api/workshops/${workshopId}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ role: "fitter", name: "Wren Castle", email });
    expect(res.status).toBe(201);
    const mail = await t.mail.waitFor((m) => m.to.includes(email));
    expect(mail.subject).toBe("Hollin & Vane Joinery invites you to Sitecue");
    const link = mail.links.find((l) => l.includes("/invite/"));
    expect(link).toBeDefined();
    const token = link!.split("/invite/")[1];

    const info = await request(t.sitecue.app).get(`/api/auth/tokens/${token}`);
    expect(info.body).toEqual({
      kind: "invitation",
      email,
      name: "Wren Castle",
      workshopName: "Hollin & Vane Joinery",
      role: "fitter",
      tradeName: null,
      existingAccount: false,
    });

    const s = await anonymous(t);
    const set = await s.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", s.csrf)
      .send({ token, password: "a-good-long-password" });
    expect(set.status).toBe(200);
    expect(set.body.user.memberships).toEqual([
      expect.objectContaining({ role: "fitter", workshopId }),
    ]);
    // Single use.
    const again = await s.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", set.body.csrfToken)
      .send({ token, password: "another-long-password" });
    expect(again.status).toBe(404);
    expect(again.body.error.code).toBe("token-invalid");
    // The token is stored only as its hash.
    const stored = await t.db.ds.getRepository(AuthToken).find();
    expect(stored.some((x) => x.tokenHash === token)).toBe(false);
    // And the new password works.
    await signIn(t, email, "a-good-long-password");
  });

  it("refuses an expired invitation", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const email = "late.fitter@hollinvane.example.test";
    await owner.agent
      .post(`/api/workshops/${workshopId}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ role: "fitter", name: "Late Fitter", email })
      .expect(201);
    const mail = await t.mail.waitFor((m) => m.to.includes(email));
    const token = mail.links
      .find((l) => l.includes("/invite/"))!
      .split("/invite/")[1];
    await t.db.ds
      .getRepository(AuthToken)
      .createQueryBuilder()
      .update()
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where("invitedByUserId IS NOT NULL AND usedAt IS NULL")
      .execute();
    const info = await request(t.sitecue.app).get(`/api/auth/tokens/${token}`);
    expect(info.status).toBe(404);
    expect(info.body.error.code).toBe("token-invalid");
  });

  it("links a trade contact to the workshop's trade record", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const trades = await owner.agent.get(`/api/workshops/${workshopId}/trades`);
    const decorator = trades.body.trades.find(
      (x: { kind: string }) => x.kind === "decorator",
    );
    const email = "nell@kestreldecorating.example.test";
    await owner.agent
      .post(`/api/workshops/${workshopId}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ role: "trade", name: "Nell Brook", email, tradeId: decorator.id })
      .expect(201);
    const mail = await t.mail.waitFor((m) => m.to.includes(email));
    const token = mail.links
      .find((l) => l.includes("/invite/"))!
      .split("/invite/")[1];
    const s = await anonymous(t);
    const set = await s.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", s.csrf)
      .send({ token, password: "decorator-password" });
    expect(set.body.user.trades).toEqual([
      expect.objectContaining({
        tradeId: decorator.id,
        businessName: "Kestrel Decorating",
        kind: "decorator",
      }),
    ]);
    expect(set.body.user.memberships).toEqual([]);
  });

  it("says which field is wrong when a trade invitation names no trade", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const res = await owner.agent
      .post(`/api/workshops/${workshopId}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({
        role: "trade",
        name: "No Trade",
        email: "no.trade@example.test",
      });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.tradeId).toEqual([
      "Choose the trade they speak for",
    ]);
  });
});

describe("password reset", () => {
  it("e-mails a one-hour link that sets a new password; the old one stops working", async () => {
    const s = await anonymous(t);
    const email = demoAccounts.customer.email;
    const res = await s.agent
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", s.csrf)
      .send({ email });
    expect(res.status).toBe(202);
    const mail = await t.mail.waitFor(
      (m) =>
        m.to.includes(email) && m.subject === "Reset your Sitecue password",
    );
    const token = mail.links
      .find((l) => l.includes("/reset/"))!
      .split("/reset/")[1];
    const set = await s.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", s.csrf)
      .send({ token, password: "rosa-new-password" });
    expect(set.status).toBe(200);
    expect(set.body.user.customers).toHaveLength(1);
    const s2 = await anonymous(t);
    const old = await s2.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s2.csrf)
      .send({ email, password: "sitecue-demo" });
    expect(old.status).toBe(401);
    await signIn(t, email, "rosa-new-password");
  });

  it("answers the same for an unknown address and sends nothing", async () => {
    const before = t.mail.messages().length;
    const s = await anonymous(t);
    const res = await s.agent
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", s.csrf)
      .send({ email: "nobody-here@example.test" });
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ ok: true });
    await new Promise((r) => setTimeout(r, 200));
    expect(t.mail.messages().length).toBe(before);
  });

  it("refuses a password that is too short, naming the field", async () => {
    const s = await anonymous(t);
    const res = await s.agent
      .post("/api/auth/set-password")
      .set("X-CSRF-Token", s.csrf)
      .send({ token: "x".repeat(43), password: "short" });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.password).toEqual([
      "Use at least 8 characters",
    ]);
  });
});
