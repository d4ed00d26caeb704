import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signIn, startTestApp, type TestApp } from "../../tests/setup/test-app";
import {
  demoAccounts,
  DEMO_WORKSHOP_NAME,
} from "../../tests/factories/demo-scenario";
import { Workshop } from "../modules/workshops/workshops.entity";

// A lone UTF-16 surrogate ("\ud800" in JSON) is legal JSON text but no Unicode scalar value
// (RFC 8259 §8.2: such strings are "unpredictable"); MariaDB's JSON check refuses it, so it used
// to surface as a 500 from the audit insert. The boundary refuses it with the field named.

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

/** Sends `json` verbatim, so the escape reaches the server as written (not re-encoded). */
async function postRaw(path: string, json: string) {
  const s = await signIn(t, demoAccounts.owner.email);
  return s.agent
    .post(path)
    .set("X-CSRF-Token", s.csrf)
    .set("Content-Type", "application/json")
    .send(json);
}

describe("a lone surrogate in a string", () => {
  const broken =
    "This has a broken character in it (often half of an emoji). Retype it and try again.";

  it("is refused with 400 naming the field: a customer's name", async () => {
    const res = await postRaw(
      `/api/workshops/${workshopId}/customers`,
      '{"name":"Ann \\ud800 Lee","email":"ann.lee@example.test"}',
    );
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("validation");
    expect(res.body.error.fields).toEqual({ name: [broken] });
  });

  it("is refused with 400 naming the field: a trade's names, each one (low surrogates too)", async () => {
    const res = await postRaw(
      `/api/workshops/${workshopId}/trades`,
      JSON.stringify({
        businessName: "Surrogate § Sparks",
        kind: "electrician",
        contactName: "Sam §",
        email: "sam@surrogate.example.test",
        phone: "01234 567890",
      }).replace(/§/g, "\\udc00"),
    );
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({
      businessName: [broken],
      contactName: [broken],
    });
  });

  it("is refused in an invitation's name too, and nothing is stored", async () => {
    const res = await postRaw(
      `/api/workshops/${workshopId}/invitations`,
      '{"role":"fitter","name":"\\ud83d","email":"half.emoji@example.test"}',
    );
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ name: [broken] });
    const invited = await t.db.ds.query(
      "SELECT COUNT(*) n FROM users WHERE email = 'half.emoji@example.test'",
    );
    expect(Number(invited[0].n)).toBe(0);
  });

  it("lets a whole emoji (a surrogate pair) through", async () => {
    const res = await postRaw(
      `/api/workshops/${workshopId}/customers`,
      '{"name":"Ann Lee \\ud83d\\ude00","email":"ann.emoji@example.test"}',
    );
    expect(res.status).toBe(201);
    expect(res.body.name).toBe("Ann Lee \u{1F600}");
  });
});

describe("validation messages over the API (issue 16)", () => {
  it("are plain sentences with the limit, not the schema library's words", async () => {
    const res = await postRaw(
      `/api/workshops/${workshopId}/customers`,
      JSON.stringify({
        name: "A".repeat(500),
        email: "not an address",
        phone: 7,
      }),
    );
    expect(res.status).toBe(400);
    const text = JSON.stringify(res.body.error.fields);
    expect(text).not.toMatch(/Too big|Too small|expected string|Invalid/);
    expect(res.body.error.fields.name[0]).toMatch(/^At most \d+ characters\.$/);
  });
});
