// Issue 13: one crash made the app exit, the bootstrap then stopped MariaDB too, and nothing came
// back until someone typed `npm start`. These run the real server/main.ts under the same
// supervisor `npm start` uses (superviseApp), against a test database, as `NODE_ENV=production
// npm start` would run it, and hurt it the ways it was hurt: a port taken between the check and the
// listen, a promise nobody handles, an exception outside any request, SIGKILL.
import net from "node:net";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, expect, it } from "vitest";
import {
  appProcessEnv,
  freePort,
  ProcessOutput,
} from "../../tests/setup/app-process";
import {
  createTestDatabase,
  type TestDatabase,
} from "../../tests/setup/test-db";
import { startSmtpFake, type SmtpFake } from "./mail/smtp-fake";
import { startS3Fake, type S3Fake } from "./storage/s3-fake";
import { superviseApp, type AppSupervisor } from "./supervise.mjs";

const root = path.resolve(import.meta.dirname, "../..");
const faults = pathToFileURL(
  path.join(root, "tests/setup/faults-on-signal.mjs"),
).href;
let db: TestDatabase;
let mail: SmtpFake;
let s3: S3Fake;
let sup: AppSupervisor | null = null;
let blocker: net.Server | null = null;
let takenPort = 0;
let firstReady: Promise<string>;
const out = new ProcessOutput();

const listenOn = (port: number) =>
  new Promise<net.Server>((resolve, reject) => {
    const s = net.createServer((socket) => socket.destroy());
    s.once("error", reject);
    s.listen(port, "127.0.0.1", () => resolve(s));
  });

const health = async () =>
  (await fetch(`http://127.0.0.1:${sup!.port}/api/health`)).status;

const stackLines = (lines: string[]) => lines.filter((l) => /^\s+at /.test(l));

beforeAll(async () => {
  db = await createTestDatabase();
  mail = await startSmtpFake();
  s3 = await startS3Fake();
  firstReady = out.next(/Sitecue is ready at/, 40_000);
  sup = superviseApp({
    root,
    preferredPort: await freePort(),
    env: async (port) => {
      // The race from issue 13: another program takes the port after the supervisor found it
      // free and before the app listens (here, on the first start only).
      if (!blocker) {
        takenPort = port;
        blocker = await listenOn(port);
      }
      return appProcessEnv({
        db: db.settings,
        mail,
        s3,
        extra: { NODE_ENV: "production" },
      });
    },
    stdio: ["ignore", "pipe", "pipe"],
    onSpawn: (child) => out.attach(child),
    log: (m) => out.push(`[supervisor] ${m}`),
    execArgv: ["--import", faults],
  });
}, 40_000);

afterAll(async () => {
  await sup?.stop();
  await new Promise((r) => (blocker ? blocker.close(r) : r(null)));
  await s3?.close();
  await mail?.close();
  await db?.drop();
}, 30_000);

it("moves to the next free port when another program took the checked one, and says the real port", async () => {
  const ready = await firstReady;
  expect(out.lines).toContain(
    `[supervisor] Port ${takenPort} was taken before the app could listen; trying another`,
  );
  expect(sup!.port).not.toBe(takenPort);
  // APP_URL was not set, so main.ts makes it from the port it really listens on.
  expect(ready).toContain(`Sitecue is ready at http://localhost:${sup!.port}`);
  expect(await health()).toBe(200);
  // No unhandled 'error' event: no stack trace from the refused listen.
  expect(stackLines(out.lines)).toEqual([]);
}, 40_000);

it("says at start-up, in one line, that production over plain HTTP needs TRUST_PROXY=1", () => {
  const lines = out.lines.filter((l) => /TRUST_PROXY=1/.test(l));
  expect(lines.length).toBeGreaterThan(0);
  expect(lines[0]).toContain(
    "NODE_ENV=production without TRUST_PROXY=1: the session cookie is Secure but Sitecue serves plain HTTP, so nobody can sign in.",
  );
});

it("logs a promise nobody handled in one line and keeps serving", async () => {
  const pid = sup!.child!.pid!;
  const from = out.lines.length;
  const line = out.next(/A promise failed and nothing handled it/);
  process.kill(pid, "SIGUSR2");
  expect(await line).toContain("a promise nobody awaited (test fault)");
  expect(await health()).toBe(200);
  expect(sup!.child!.pid).toBe(pid);
  expect(stackLines(out.lines.slice(from))).toEqual([]);
}, 20_000);

it("starts the app again after SIGKILL, and it answers HTTP again", async () => {
  const pid = sup!.child!.pid!;
  const stopped = out.next(/^\[supervisor\] The app stopped/);
  const ready = out.next(/Sitecue is ready at/);
  process.kill(pid, "SIGKILL");
  expect(await stopped).toBe(
    "[supervisor] The app stopped (killed by SIGKILL); starting it again in 1 s",
  );
  await ready;
  expect(sup!.child!.pid).not.toBe(pid);
  expect(await health()).toBe(200);
}, 40_000);

it("exits on an exception outside any request, with one line, and is started again after a longer wait", async () => {
  const pid = sup!.child!.pid!;
  const from = out.lines.length;
  const said = out.next(/Unexpected error outside any request/);
  const stopped = out.next(/^\[supervisor\] The app stopped/);
  const ready = out.next(/Sitecue is ready at/);
  process.kill(pid, "SIGWINCH");
  expect(await said).toContain("thrown outside any request (test fault)");
  // The second restart in a row waits twice as long as the first.
  expect(await stopped).toBe(
    "[supervisor] The app stopped (exit code 1); starting it again in 2 s",
  );
  await ready;
  expect(sup!.child!.pid).not.toBe(pid);
  expect(await health()).toBe(200);
  expect(stackLines(out.lines.slice(from))).toEqual([]);
}, 40_000);

it("stop() stops the app for good", async () => {
  const child = sup!.child!;
  const port = sup!.port;
  await sup!.stop();
  expect(child.exitCode ?? child.signalCode).not.toBeNull();
  await new Promise((r) => setTimeout(r, 1500));
  expect(sup!.child).toBeNull();
  await expect(fetch(`http://127.0.0.1:${port}/api/health`)).rejects.toThrow();
  expect(out.lines.filter((l) => /starting it again/.test(l))).toHaveLength(2);
}, 30_000);
