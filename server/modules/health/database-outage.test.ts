// Issue 13: with the database gone, /api/health said 200 "degraded" and a 10 s outage wrote
// thousands of stack traces (every poll of the outbox worker, every request). A real app process
// runs against MariaDB through a TCP proxy the test cuts: health must answer 503 (RFC 9110
// §15.6.4, 503 Service Unavailable: "temporarily unable to handle the request"), requests that
// need the database 503 too, and the loss is logged once per outage, and once when it is back.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, expect, it } from "vitest";
import {
  appProcessEnv,
  freePort,
  ProcessOutput,
  stopProcess,
} from "../../../tests/setup/app-process";
import { startTcpProxy, type TcpProxy } from "../../../tests/setup/tcp-proxy";
import {
  createTestDatabase,
  type TestDatabase,
} from "../../../tests/setup/test-db";
import {
  DEMO_PASSWORD,
  demoAccounts,
  loadDemoScenario,
} from "../../../tests/factories/demo-scenario";
import { startSmtpFake, type SmtpFake } from "../../infra/mail/smtp-fake";
import { startS3Fake, type S3Fake } from "../../infra/storage/s3-fake";
import { localToday } from "../jobs/jobs.presenter";

const root = path.resolve(import.meta.dirname, "../../..");
let db: TestDatabase;
let proxy: TcpProxy;
let mail: SmtpFake;
let s3: S3Fake;
let child: ChildProcess;
let url: string;
const output = new ProcessOutput();

beforeAll(async () => {
  db = await createTestDatabase();
  await loadDemoScenario(db.ds, localToday("Europe/London"));
  proxy = await startTcpProxy(db.settings.port);
  mail = await startSmtpFake();
  s3 = await startS3Fake();
  const port = await freePort();
  url = `http://127.0.0.1:${port}`;
  child = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], {
    cwd: root,
    env: appProcessEnv({
      db: { ...db.settings, port: proxy.port },
      mail,
      s3,
      port,
    }),
    stdio: ["ignore", "pipe", "pipe"],
  });
  output.attach(child);
  await output.next(/Sitecue is ready/);
}, 40_000);

afterAll(async () => {
  if (child) await stopProcess(child);
  await proxy?.close();
  await s3?.close();
  await mail?.close();
  await db?.drop();
}, 20_000);

async function signIn() {
  const first = await fetch(`${url}/api/auth/session`);
  const cookie = first.headers.getSetCookie()[0].split(";")[0];
  const { csrfToken } = await first.json();
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: "POST",
    headers: {
      cookie,
      "content-type": "application/json",
      "x-csrf-token": csrfToken,
    },
    body: JSON.stringify({
      email: demoAccounts.owner.email,
      password: DEMO_PASSWORD,
    }),
  });
  expect(res.status).toBe(200);
  return res.headers.getSetCookie()[0]?.split(";")[0] ?? cookie;
}

it("answers 503 while the database is gone, and logs the outage once and the return once", async () => {
  const up = await fetch(`${url}/api/health`);
  expect(up.status).toBe(200);
  expect(await up.json()).toMatchObject({ status: "ok", database: "up" });
  const cookie = await signIn();

  const before = output.lines.length;
  await proxy.cut();
  // About 4 s of outage: the app's own pollers (outbox every second) and a client polling its
  // session and the health route every 50 ms.
  const statuses = new Map<string, number[]>();
  const record = (what: string, status: number) =>
    statuses.set(what, [...(statuses.get(what) ?? []), status]);
  const end = Date.now() + 4000;
  let healthBody: unknown = null;
  while (Date.now() < end) {
    const h = await fetch(`${url}/api/health`);
    record("health", h.status);
    healthBody = await h.json();
    const s = await fetch(`${url}/api/jobs`, { headers: { cookie } });
    record("jobs", s.status);
    await s.arrayBuffer();
    await new Promise((r) => setTimeout(r, 50));
  }
  const during = output.lines.slice(before);
  console.log(
    `outage: ${statuses.get("health")!.length} health polls ${JSON.stringify(count(statuses.get("health")!))}, jobs ${JSON.stringify(count(statuses.get("jobs")!))}, ${during.length} log lines, ${during.filter((l) => /^\s+at /.test(l)).length} stack frames`,
  );
  expect(new Set(statuses.get("health"))).toEqual(new Set([503]));
  expect(healthBody).toMatchObject({ status: "degraded", database: "down" });
  expect(new Set(statuses.get("jobs"))).toEqual(new Set([503]));
  expect(
    during.filter((l) => /database is not answering/.test(l)),
  ).toHaveLength(1);
  expect(during.filter((l) => /^\s+at /.test(l))).toEqual([]);
  expect(during.length).toBeLessThanOrEqual(2);

  await proxy.restore();
  const back = output.next(/database is back/, 10_000);
  let status = 0;
  for (let i = 0; i < 100 && status !== 200; i++) {
    status = (await fetch(`${url}/api/health`)).status;
    if (status !== 200) await new Promise((r) => setTimeout(r, 100));
  }
  expect(status).toBe(200);
  await back;
  const jobs = await fetch(`${url}/api/jobs`, { headers: { cookie } });
  expect(jobs.status).toBe(200);
  const all = output.lines.slice(before);
  expect(all.filter((l) => /database is back/.test(l))).toHaveLength(1);
  expect(all.filter((l) => /database is not answering/.test(l))).toHaveLength(
    1,
  );
}, 40_000);

function count(xs: number[]) {
  const c: Record<number, number> = {};
  for (const x of xs) c[x] = (c[x] ?? 0) + 1;
  return c;
}
