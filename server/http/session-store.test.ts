// Issue 15: a signed-in request wrote the session row every time. express-session (`rolling`,
// `resave: false`) calls the store's `touch` on each request that left the session unchanged;
// the store writes the row's expiry at most once a minute per session.
import type session from "express-session";
import { afterAll, beforeAll, expect, it } from "vitest";
import {
  createTestDatabase,
  type TestDatabase,
} from "../../tests/setup/test-db";
import { createSessionStore, TOUCH_EVERY_MS } from "./session-store";

let db: TestDatabase;
beforeAll(async () => {
  db = await createTestDatabase();
}, 120_000);
afterAll(async () => db?.drop());

const call = (fn: (cb: (err?: unknown) => void) => void) =>
  new Promise<void>((resolve, reject) =>
    fn((err) => (err ? reject(err) : resolve())),
  );

it("touches a session's row at most once a minute, and always after a minute", async () => {
  let clock = 1_000_000_000_000;
  const store = createSessionStore(db.settings, { now: () => clock });
  const sid = "touch-test-session";
  const data = {
    cookie: { originalMaxAge: 3600_000, expires: new Date(clock + 3600_000) },
  } as unknown as session.SessionData;
  const expires = async () =>
    Number(
      (
        (await db.ds.query(
          "SELECT expires FROM sessions WHERE session_id = ?",
          [sid],
        )) as { expires: number }[]
      )[0].expires,
    );
  try {
    await call((cb) => store.set(sid, data, cb));
    const first = await expires();
    // Within the minute: the row is not written, whatever the cookie now says.
    clock += TOUCH_EVERY_MS / 2;
    const later = {
      cookie: { originalMaxAge: 3600_000, expires: new Date(clock + 7200_000) },
    } as unknown as session.SessionData;
    await call((cb) => store.touch!(sid, later, cb));
    expect(await expires()).toBe(first);
    // After the minute: written, with the later expiry.
    clock += TOUCH_EVERY_MS;
    await call((cb) => store.touch!(sid, later, cb));
    expect(await expires()).toBeGreaterThan(first);
  } finally {
    await store.close();
  }
});
