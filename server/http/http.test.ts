import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  anonymous,
  signIn,
  startTestApp,
  type TestApp,
} from "../../tests/setup/test-app";
import { demoAccounts } from "../../tests/factories/demo-scenario";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ demo: true });
}, 120_000);
afterAll(async () => t?.close());

describe("the API's edges", () => {
  it("answers an unknown route with a JSON 404", async () => {
    const res = await request(t.sitecue.app).get("/api/no-such-thing");
    expect(res.status).toBe(404);
    expect(res.headers["content-type"]).toMatch(/application\/json/);
    expect(res.body).toEqual({
      error: {
        code: "not-found",
        message: "No API route for GET /no-such-thing.",
      },
    });
  });

  it("answers a malformed id in the address with 404, not a database error", async () => {
    const s = await signIn(t, demoAccounts.owner.email);
    const res = await s.agent.get("/api/jobs/not-a-uuid");
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("not-found");
  });

  it("refuses a body over the limit with 413", async () => {
    const s = await anonymous(t);
    const res = await s.agent
      .post("/api/auth/password-reset")
      .set("X-CSRF-Token", s.csrf)
      .send({ email: "a@example.test", padding: "x".repeat(1_100_000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe("too-large");
  });

  it("reports the database in /api/health", async () => {
    const res = await request(t.sitecue.app).get("/api/health").expect(200);
    expect(res.body).toEqual({
      status: "ok",
      database: "up",
      version: expect.any(String),
    });
  });

  it("sends security headers: a CSP without inline script, nosniff, no framing", async () => {
    const res = await request(t.sitecue.app).get("/api/health");
    const csp = res.headers["content-security-policy"];
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain("unsafe-inline");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
    expect(res.headers["x-powered-by"]).toBeUndefined();
  });
});

describe("caching", () => {
  // RFC 9111 §5.2.2.5: no-store keeps per-person API answers out of browser and proxy caches.
  it("marks every API answer no-store: data, errors, sign-in state and health", async () => {
    const s = await signIn(t, demoAccounts.owner.email);
    const answers = [
      await s.agent.get("/api/jobs"),
      await s.agent.get("/api/auth/session"),
      await request(t.sitecue.app).get("/api/health"),
      await request(t.sitecue.app).get("/api/jobs"),
      await request(t.sitecue.app).get("/api/no-such-thing"),
      await s.agent
        .post("/api/auth/sign-out")
        .set("X-CSRF-Token", "not-the-token"),
    ];
    expect(answers.map((r) => r.status)).toEqual([
      200, 200, 200, 401, 404, 403,
    ]);
    for (const r of answers)
      expect(r.headers["cache-control"]).toBe("no-store");
  });
});

describe("OpenAPI", () => {
  it("describes every registered route as OpenAPI 3.1, with its schemas", async () => {
    const doc = (
      await request(t.sitecue.app).get("/api/openapi.json").expect(200)
    ).body;
    expect(doc.openapi).toBe("3.1.0");
    for (const spec of t.sitecue.routes.specs) {
      const path = "/api" + spec.path.replace(/:(\w+)/g, "{$1}");
      expect(
        doc.paths[path]?.[spec.method],
        `${spec.method} ${path}`,
      ).toBeDefined();
    }
    const signInBody =
      doc.paths["/api/auth/sign-in"].post.requestBody.content[
        "application/json"
      ].schema;
    expect(signInBody.required).toEqual(
      expect.arrayContaining(["email", "password"]),
    );
  });
});
