import http from "node:http";
import type { AddressInfo } from "node:net";
import request from "supertest";
import type TestAgent from "supertest/lib/agent";
import { createApp, type AppDeps, type SitecueApp } from "../../server/app";
import { mountClient } from "../../server/http/client";
import { createMailer } from "../../server/infra/mail/mailer";
import { OutboxWorker } from "../../server/infra/outbox/outbox";
import { startInboundSmtp } from "../../server/infra/mail/inbound";
import {
  startSmtpFake,
  type SmtpFake,
} from "../../server/infra/mail/smtp-fake";
import { startS3Fake, type S3Fake } from "../../server/infra/storage/s3-fake";
import {
  createStorage,
  type Storage,
} from "../../server/infra/storage/storage";
import { localToday } from "../../server/modules/jobs/jobs.presenter";
import { DEMO_PASSWORD, loadDemoScenario } from "../factories/demo-scenario";
import { createTestDatabase, type TestDatabase } from "./test-db";

export interface TestApp {
  sitecue: SitecueApp;
  db: TestDatabase;
  mail: SmtpFake;
  /** The outbox worker sending this app's e-mail to `mail` (polls every 50 ms). */
  outbox: OutboxWorker;
  /** The inbound SMTP receiver for iTIP REPLYs (booking-<id>@replies.sitecue.example.test). */
  inbound: { port: number; close(): Promise<void> };
  /** The local S3 fake (s3rver) this app's uploads go to, and the storage client on it. */
  s3: S3Fake;
  storage: Storage;
  /** Set when `listen` was asked for: the base URL of a real HTTP server (browser tests). */
  url: string | null;
  /** What the app was made from: `createApp(t.deps)` is a second app process on the same database. */
  deps: AppDeps;
  close(): Promise<void>;
}

/**
 * Sitecue against a fresh database, with the SMTP fake on a free loopback port. `demo` loads the
 * demo scenario; `listen` serves the built client over real HTTP for the browser.
 */
export async function startTestApp(
  opts: {
    demo?: boolean;
    listen?: boolean;
    signInLimit?: number;
    /** Failed sign-ins per client address (any account) before the address is refused. */
    signInAddressLimit?: number;
    /** Trust X-Forwarded-For (one proxy), so a test can sign in "from" several addresses. */
    trustProxy?: boolean;
    /** The upload size limit (default 25 MB, as in production). */
    uploadMaxBytes?: number;
  } = {},
): Promise<TestApp> {
  const db = await createTestDatabase();
  const mail = await startSmtpFake();
  const s3 = await startS3Fake();
  const storage = createStorage({
    endpoint: s3.endpoint,
    region: "eu-west-2",
    bucket: s3.bucket,
    accessKeyId: "S3RVER",
    secretAccessKey: "S3RVER",
    forcePathStyle: true,
  });
  const mailer = createMailer({
    host: "127.0.0.1",
    port: mail.port,
    secure: false,
    from: "Sitecue <no-reply@sitecue.example.test>",
  });
  if (opts.demo) await loadDemoScenario(db.ds, localToday("Europe/London"));
  // Services only queue mail; this sends it, fast enough for tests that `waitFor` a message.
  const outbox = new OutboxWorker({
    ds: db.ds,
    transport: mailer,
    workerId: "test-app",
    pollMs: 50,
  });
  outbox.start();
  let url: string | null = null;
  let server: http.Server | null = null;
  const deps: AppDeps = {
    ds: db.ds,
    db: db.settings,
    mailer,
    mailbox: mail,
    storage,
    uploadMaxBytes: opts.uploadMaxBytes,
    appUrl: "http://localhost",
    sessionSecret: process.env.SESSION_SECRET ?? "test-secret-test-secret",
    production: false,
    signInLimit: opts.signInLimit ?? 1000,
    signInAddressLimit: opts.signInAddressLimit,
    trustProxy: opts.trustProxy,
  };
  let sitecue: SitecueApp;
  let madeWith = deps;
  if (opts.listen) {
    // The URL must be known before the app is made (links in e-mails), so listen first.
    server = http.createServer();
    await new Promise<void>((r) => server!.listen(0, "127.0.0.1", r));
    url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    madeWith = { ...deps, appUrl: url };
    sitecue = createApp(madeWith);
    await mountClient(sitecue.app, "static");
    server.on("request", sitecue.app);
  } else {
    sitecue = createApp(deps);
  }
  const inbound = await startInboundSmtp({
    onMail: (m) => sitecue.receiveMail(m),
  });
  return {
    sitecue,
    db,
    mail,
    outbox,
    inbound,
    s3,
    storage,
    url,
    deps: madeWith,
    async close() {
      await outbox.stop();
      await inbound.close();
      if (server) {
        server.closeAllConnections();
        await new Promise<void>((r) => server!.close(() => r()));
      }
      await sitecue.close();
      mailer.close();
      await mail.close();
      storage.close();
      await s3.close();
      await db.drop();
    },
  };
}

/** A supertest agent keeping cookies, with the CSRF token it was given. */
export interface Session {
  agent: TestAgent;
  csrf: string;
  /** The session's `Cookie` header value, for requests written by hand on a raw socket. */
  cookie: string;
}

/** The `name=value` pairs of a response's Set-Cookie headers, as a Cookie header. */
const cookiesOf = (res: request.Response) =>
  ([] as string[])
    .concat(res.headers["set-cookie"] ?? [])
    .map((c) => c.split(";")[0])
    .join("; ");

/** A fresh anonymous session (it has a CSRF token but nobody signed in). `t` may be a base URL. */
export async function anonymous(t: TestApp | string): Promise<Session> {
  const agent = request.agent(typeof t === "string" ? t : t.sitecue.app);
  const res = await agent.get("/api/auth/session").expect(200);
  return { agent, csrf: res.body.csrfToken, cookie: cookiesOf(res) };
}

/** Signs in through the real route and returns the session. */
export async function signIn(
  t: TestApp | string,
  email: string,
  password = DEMO_PASSWORD,
): Promise<Session> {
  const s = await anonymous(t);
  const res = await s.agent
    .post("/api/auth/sign-in")
    .set("X-CSRF-Token", s.csrf)
    .send({ email, password });
  if (res.status !== 200)
    throw new Error(
      `Sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`,
    );
  // Sign-in renews the session (and so its cookie); keep the old one if it was not re-sent.
  return {
    agent: s.agent,
    csrf: res.body.csrfToken,
    cookie: cookiesOf(res) || s.cookie,
  };
}
