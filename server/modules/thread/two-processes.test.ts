// Two real Sitecue processes (`node --import tsx server/main.ts`) on one database: a message
// posted through one is read through the other, and a poll with the `after` cursor on one sees
// what was posted on the other — nothing about the thread lives in one process's memory.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, expect, it } from "vitest";
import {
  appProcessEnv,
  freePort,
  ProcessOutput,
  stopProcess,
} from "../../../tests/setup/app-process";
import {
  createTestDatabase,
  type TestDatabase,
} from "../../../tests/setup/test-db";
import {
  DEMO_PASSWORD,
  demoAccounts,
  demoJobTitles,
  loadDemoScenario,
} from "../../../tests/factories/demo-scenario";
import { startSmtpFake, type SmtpFake } from "../../infra/mail/smtp-fake";
import { startS3Fake, type S3Fake } from "../../infra/storage/s3-fake";
import { localToday } from "../jobs/jobs.presenter";
import { Job } from "../jobs/jobs.entity";

const root = path.resolve(import.meta.dirname, "../../..");

let db: TestDatabase;
let mail: SmtpFake;
let s3: S3Fake;
const procs: { child: ChildProcess; url: string; output: ProcessOutput }[] = [];
let jobId: string;

/** Starts one app process and resolves once it says it is ready. */
async function startProcess(port: number) {
  const url = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, ["--import", "tsx", "server/main.ts"], {
    cwd: root,
    env: appProcessEnv({ db: db.settings, mail, s3, port }),
    stdio: ["ignore", "pipe", "pipe"],
  });
  const output = new ProcessOutput();
  output.attach(child);
  const p = { child, url, output };
  procs.push(p);
  const ready = output.next(/Sitecue is ready/);
  const exited = new Promise<never>((_, reject) =>
    child.once("exit", (code) =>
      reject(new Error(`${url} exited (${code}):\n${output.text()}`)),
    ),
  );
  // Whichever loses the race settles later (the process exits at the end too): not an error.
  exited.catch(() => {});
  ready.catch(() => {});
  await Promise.race([ready, exited]);
  return p;
}

/** A signed-in session as a cookie and CSRF token, usable against either process (sessions live in MariaDB). */
async function signIn(baseUrl: string, email: string) {
  const first = await fetch(`${baseUrl}/api/auth/session`);
  const cookie = first.headers.getSetCookie()[0].split(";")[0];
  const { csrfToken } = await first.json();
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: "POST",
    headers: {
      cookie,
      "content-type": "application/json",
      "x-csrf-token": csrfToken,
    },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  expect(res.status).toBe(200);
  // The session id is renewed at sign-in (with a new CSRF token).
  const renewed = res.headers.getSetCookie()[0]?.split(";")[0] ?? cookie;
  return { cookie: renewed, csrf: (await res.json()).csrfToken as string };
}

async function csrfOn(baseUrl: string, cookie: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/session`, {
    headers: { cookie },
  });
  return (await res.json()).csrfToken;
}

beforeAll(async () => {
  // Migrated and seeded before either process starts, so neither races the other doing it.
  db = await createTestDatabase();
  await loadDemoScenario(db.ds, localToday("Europe/London"));
  jobId = (
    await db.ds.manager.findOneByOrFail(Job, { title: demoJobTitles.alcoves })
  ).id;
  mail = await startSmtpFake();
  s3 = await startS3Fake();
  const [portA, portB] = [await freePort(), await freePort()];
  await Promise.all([startProcess(portA), startProcess(portB)]);
}, 40_000);

afterAll(async () => {
  await Promise.all(procs.map(({ child }) => stopProcess(child)));
  await s3?.close();
  await mail?.close();
  await db?.drop();
}, 20_000);

it("a message posted through one process is read through the other, and polled back across", async () => {
  const [a, b] = procs;
  expect(a.url).not.toBe(b.url);
  const owner = await signIn(a.url, demoAccounts.owner.email);
  const text = `Skip arrives Thursday 08:00 (${Date.now()})`;
  const posted = await fetch(`${a.url}/api/jobs/${jobId}/thread/messages`, {
    method: "POST",
    headers: {
      cookie: owner.cookie,
      "content-type": "application/json",
      "x-csrf-token": owner.csrf,
    },
    body: JSON.stringify({ audience: "trades", text }),
  });
  expect(posted.status).toBe(201);
  const sent = await posted.json();

  // The same session cookie works on B: the session is in MariaDB, not in A's memory.
  const viaB = await fetch(`${b.url}/api/jobs/${jobId}/thread`, {
    headers: { cookie: owner.cookie },
  });
  expect(viaB.status).toBe(200);
  const threadB = await viaB.json();
  const seen = threadB.messages.find((x: { id: string }) => x.id === sent.id);
  expect(seen.text).toBe(text);
  expect(seen.author).toEqual({
    name: demoAccounts.owner.name,
    label: "Workshop",
    role: "workshop",
  });

  // The plasterer, signed in on B, replies; the owner's poll on A with B's cursor gets exactly that.
  const dev = await signIn(b.url, demoAccounts.trade.email);
  const devThread = await (
    await fetch(`${b.url}/api/jobs/${jobId}/thread`, {
      headers: { cookie: dev.cookie },
    })
  ).json();
  expect(devThread.messages.map((x: { text: string }) => x.text)).toContain(
    text,
  );
  const cursor = threadB.cursor;
  const reply = await fetch(`${b.url}/api/jobs/${jobId}/thread/messages`, {
    method: "POST",
    headers: {
      cookie: dev.cookie,
      "content-type": "application/json",
      "x-csrf-token": await csrfOn(b.url, dev.cookie),
    },
    body: JSON.stringify({
      audience: "trades",
      text: "I'll be there at 08:30",
    }),
  });
  expect(reply.status).toBe(201);
  const poll = await (
    await fetch(`${a.url}/api/jobs/${jobId}/thread?after=${cursor}`, {
      headers: { cookie: owner.cookie },
    })
  ).json();
  expect(poll.messages.map((x: { text: string }) => x.text)).toEqual([
    "I'll be there at 08:30",
  ]);
  expect(poll.messages[0].author.label).toBe("Ashby Plaster & Coving");
  expect(poll.unreadCount).toBeGreaterThanOrEqual(1);
}, 20_000);
