// Issue 15: the phone's first load was 2.2 MB of JavaScript sent raw. Built assets and API JSON
// go out compressed when the browser asks (RFC 9110 §8.4 Content-Encoding, §12.5.3
// Accept-Encoding, with Vary so caches keep the two apart), and hashed assets may be kept for a
// year without asking again (RFC 8246 `immutable`).
import http from "node:http";
import { gunzipSync } from "node:zlib";
import request from "supertest";
import { afterAll, beforeAll, expect, it } from "vitest";
import { signIn, startTestApp, type TestApp } from "../../tests/setup/test-app";
import { demoAccounts } from "../../tests/factories/demo-scenario";

let t: TestApp;

function rawGet(
  url: string,
  headers: Record<string, string>,
): Promise<{ headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { headers }, (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () =>
          resolve({ headers: res.headers, body: Buffer.concat(chunks) }),
        );
      })
      .on("error", reject);
  });
}
beforeAll(async () => {
  t = await startTestApp({ demo: true, listen: true });
}, 120_000);
afterAll(async () => t?.close());

it("sends the built script gzipped, with Vary and a year-long immutable Cache-Control", async () => {
  const html = (await request(t.url!).get("/").expect(200)).text;
  const script = /<script[^>]+src="([^"]+\.js)"/.exec(html)![1];
  const raw = await request(t.url!)
    .get(script)
    .set("Accept-Encoding", "identity")
    .expect(200);
  expect(raw.headers["content-encoding"]).toBeUndefined();
  // Node's own client, which (unlike supertest) hands over the bytes as they came.
  const zipped = await rawGet(`${t.url}${script}`, {
    "Accept-Encoding": "gzip",
  });
  expect(zipped.headers["content-encoding"]).toBe("gzip");
  expect(zipped.headers.vary).toMatch(/accept-encoding/i);
  expect(zipped.headers["cache-control"]).toMatch(/max-age=31536000/);
  expect(zipped.headers["cache-control"]).toMatch(/immutable/);
  // What arrives unpacks to exactly the script, and is much smaller than it.
  const body = zipped.body;
  const unpacked = gunzipSync(body).toString("utf8");
  expect(unpacked).toBe(raw.text);
  expect(body.length).toBeLessThan(raw.text.length / 2);
  // The page itself is never kept: it names the current hashed files.
  const page = await request(t.url!).get("/").expect(200);
  expect(page.headers["cache-control"]).toBe("no-cache");
});

it("sends API JSON gzipped when asked, and says how many SQL statements it took", async () => {
  const owner = await signIn(t, demoAccounts.owner.email);
  const res = await owner.agent
    .get("/api/jobs")
    .set("Accept-Encoding", "gzip")
    .expect(200);
  expect(res.headers["content-encoding"]).toBe("gzip");
  expect(res.body.jobs.length).toBeGreaterThan(0);
  expect(res.headers["server-timing"]).toMatch(/db;desc="\d+ statements"/);
});
