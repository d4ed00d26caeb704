import mysql from "mysql2/promise";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  anonymous,
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  demoAccounts,
  DEMO_WORKSHOP_NAME,
} from "../../../tests/factories/demo-scenario";
import { Workshop } from "../workshops/workshops.entity";

// Issue 13 item 5: a reset (or an invitation that sets a new account's password) ends every other session of
// that person and voids every other outstanding reset link — OWASP ASVS v4.0.3 3.3.3 ("the
// application gives the option to terminate all other active sessions after a successful
// password change (including change via password reset/recovery)") and 2.5.x (recovery links
// are single-use, 2.5.1 / 2.5.2 / 2.5.7 — a newer recovery must not leave an older path open).

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

/** Asks for a reset link for `email` and returns the link's token, from the e-mail it sent. */
async function resetLink(email: string): Promise<string> {
  const before = new Set(t.mail.messages());
  const s = await anonymous(t);
  await s.agent
    .post("/api/auth/password-reset")
    .set("X-CSRF-Token", s.csrf)
    .send({ email })
    .expect(202);
  const mail = await t.mail.waitFor(
    (m) =>
      !before.has(m) &&
      m.to.includes(email) &&
      m.subject === "Reset your Sitecue password",
  );
  return mail.links.find((l) => l.includes("/reset/"))!.split("/reset/")[1];
}

function setPassword(s: Session, token: string, password: string) {
  return s.agent
    .post("/api/auth/set-password")
    .set("X-CSRF-Token", s.csrf)
    .send({ token, password });
}

describe("a new password ends the person's other sessions", () => {
  it("a reset signs out every other session; the resetter is signed in afresh", async () => {
    const email = demoAccounts.customer.email;
    const phone = await signIn(t, email);
    const laptop = await signIn(t, email);
    expect((await phone.agent.get("/api/jobs")).status).toBe(200);

    // The resetter's own browser was signed in too (the "forgot my password" page is open to all).
    const resetter = await signIn(t, email);
    const token = await resetLink(email);
    const set = await setPassword(resetter, token, "rosa-second-password");
    expect(set.status).toBe(200);
    expect(set.body.user.email).toBe(email);

    for (const other of [phone, laptop]) {
      const jobs = await other.agent.get("/api/jobs");
      expect(jobs.status).toBe(401);
      expect(jobs.body.error.code).toBe("unauthenticated");
      expect((await other.agent.get("/api/auth/session")).body.user).toBeNull();
    }
    // The resetter carries on, signed in, with the token the new session handed out.
    expect((await resetter.agent.get("/api/jobs")).status).toBe(200);
    const me = await resetter.agent.get("/api/auth/session");
    expect(me.body.user.email).toBe(email);
    expect(me.body.csrfToken).toBe(set.body.csrfToken);
    // Nothing was lost: the ended sessions can sign in again with the new password.
    const again = await signIn(t, email, "rosa-second-password");
    expect((await again.agent.get("/api/jobs")).status).toBe(200);
  });

  it("an invitation for an existing account cannot set its password; accepting signed in keeps its sessions", async () => {
    // Issue 14: an invitation is not a reset. The trade contact already has an account; the
    // owner invites that address as a fitter. The link may not overwrite the password (that
    // would end their sessions in every workshop); they sign in to accept it instead.
    const email = demoAccounts.trade.email;
    const before = await signIn(t, email);
    expect((await before.agent.get("/api/auth/session")).body.user.email).toBe(
      email,
    );
    const owner = await signIn(t, demoAccounts.owner.email);
    await owner.agent
      .post(`/api/workshops/${workshopId}/invitations`)
      .set("X-CSRF-Token", owner.csrf)
      .send({ role: "fitter", name: demoAccounts.trade.name, email })
      .expect(201);
    const mail = await t.mail.waitFor(
      (m) => m.to.includes(email) && m.subject.includes("invites you"),
    );
    const token = mail.links
      .find((l) => l.includes("/invite/"))!
      .split("/invite/")[1];
    const set = await setPassword(
      await anonymous(t),
      token,
      "dev-chosen-password",
    );
    expect(set.status).toBe(409);
    expect((await before.agent.get("/api/jobs")).status).toBe(200);
    const accepting = await signIn(t, email);
    const ok = await accepting.agent
      .post("/api/auth/accept-invitation")
      .set("X-CSRF-Token", accepting.csrf)
      .send({ token });
    expect(ok.status).toBe(200);
    expect(ok.body.user.memberships).toEqual([
      expect.objectContaining({ role: "fitter", workshopId }),
    ]);
    // The other session carries on, and the password is the one they had.
    expect((await before.agent.get("/api/jobs")).status).toBe(200);
    expect((await before.agent.get("/api/auth/session")).body.user.email).toBe(
      email,
    );
    await signIn(t, email);
  });

  it("another person's sessions are left alone", async () => {
    const owner = await signIn(t, demoAccounts.owner.email);
    const token = await resetLink(demoAccounts.fitter.email);
    await setPassword(await anonymous(t), token, "joel-new-password").expect(
      200,
    );
    expect((await owner.agent.get("/api/jobs")).status).toBe(200);
  });
});

describe("using a reset link voids the person's other reset links", () => {
  it("after the newer link is used, the older one is refused and says why", async () => {
    const email = demoAccounts.owner.email;
    const older = await resetLink(email);
    const newer = await resetLink(email);
    expect(older).not.toBe(newer);
    await setPassword(await anonymous(t), newer, "martha-new-password").expect(
      200,
    );

    const info = await request(t.sitecue.app).get(`/api/auth/tokens/${older}`);
    expect(info.status).toBe(404);
    expect(info.body.error.code).toBe("token-invalid");
    expect(info.body.error.message).toBe(
      "A newer link has been used to set this account's password, so this one no longer works. Sign in with the new password, or ask for a new link.",
    );
    const use = await setPassword(
      await anonymous(t),
      older,
      "attacker-chosen-password",
    );
    expect(use.status).toBe(404);
    expect(use.body.error.message).toBe(info.body.error.message);
    // The older link changed nothing: the newer link's password still works, the other does not.
    await signIn(t, email, "martha-new-password");
    await expect(signIn(t, email, "attacker-chosen-password")).rejects.toThrow(
      /401/,
    );
  });

  it("a link used twice says it was used, not that it was replaced", async () => {
    const email = demoAccounts.owner.email;
    const token = await resetLink(email);
    await setPassword(
      await anonymous(t),
      token,
      "martha-third-password",
    ).expect(200);
    const again = await setPassword(
      await anonymous(t),
      token,
      "martha-fourth-password",
    );
    expect(again.status).toBe(404);
    expect(again.body.error.message).toBe(
      "This link has already been used. Sign in, or ask for a new link.",
    );
  });
});

describe("anonymous visitors get no stored session", () => {
  async function sessionRows(): Promise<number> {
    const conn = await mysql.createConnection(t.db.settings);
    try {
      const [rows] = await conn.query("SELECT COUNT(*) n FROM sessions");
      return Number((rows as { n: number }[])[0].n);
    } finally {
      await conn.end();
    }
  }

  it("50 cookieless GETs of /api/auth/session store no session rows", async () => {
    const before = await sessionRows();
    const tokens = new Set<string>();
    for (let i = 0; i < 50; i++) {
      const res = await request(t.sitecue.app)
        .get("/api/auth/session")
        .expect(200);
      expect(res.body.user).toBeNull();
      tokens.add(res.body.csrfToken);
    }
    expect(tokens.size).toBe(50);
    expect(await sessionRows()).toBe(before);
  });

  it("a fresh visitor still signs in with the token it was given, and only then gets a session row", async () => {
    const before = await sessionRows();
    const s = await anonymous(t);
    // Anonymous forms work without a stored session (the reset request is one).
    await s.agent
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", s.csrf)
      .send({ email: "nobody-at-all@example.test" })
      .expect(202);
    expect(await sessionRows()).toBe(before);
    const res = await s.agent
      .post("/api/auth/sign-in")
      .set("X-CSRF-Token", s.csrf)
      .send({
        email: demoAccounts.fitter.email,
        password: "joel-new-password",
      });
    expect(res.status).toBe(200);
    expect(await sessionRows()).toBe(before + 1);
  });

  it("an anonymous token works only in the browser it was given to", async () => {
    const a = await anonymous(t);
    const b = await anonymous(t);
    const crossed = await b.agent
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", a.csrf)
      .send({ email: "nobody-at-all@example.test" });
    expect(crossed.status).toBe(403);
    expect(crossed.body.error.code).toBe("csrf");
    // No cookie at all: the token alone is not enough (double-submit, OWASP CSRF Cheat Sheet).
    const bare = await request(t.sitecue.app)
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", a.csrf)
      .send({ email: "nobody-at-all@example.test" });
    expect(bare.status).toBe(403);
  });

  it("signing out leaves no session row behind", async () => {
    const s = await signIn(t, demoAccounts.fitter.email, "joel-new-password");
    const before = await sessionRows();
    const out = await s.agent
      .post("/api/auth/sign-out")
      .set("X-CSRF-Token", s.csrf)
      .expect(200);
    expect(await sessionRows()).toBe(before - 1);
    // The page can carry on as an anonymous visitor with the token it was given.
    await s.agent
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", out.body.csrfToken)
      .send({ email: "nobody-at-all@example.test" })
      .expect(202);
  });
});
