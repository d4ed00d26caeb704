import http from "node:http";
import type { AddressInfo } from "node:net";
import { createApp } from "./app";
import { loadEnv, startupWarnings } from "./config/env";
import { createDataSource } from "./db/data-source";
import { DatabaseWatch } from "./db/database-watch";
import { migrate } from "./db/migrate";
import { seedDemoIfEmpty } from "./db/seed";
import { mountClient } from "./http/client";
import { createMailer } from "./infra/mail/mailer";
import { startSmtpFake, type SmtpFake } from "./infra/mail/smtp-fake";
import { OutboxWorker, pruneSentMail } from "./infra/outbox/outbox";
import { startInboundSmtp } from "./infra/mail/inbound";
import { startS3Fake, type S3Fake } from "./infra/storage/s3-fake";
import { createStorage } from "./infra/storage/storage";
import { PORT_TAKEN_EXIT_CODE } from "./infra/supervise.mjs";

const log = (msg: string) => console.log(`[sitecue] ${msg}`);
const warn = (msg: string) => console.warn(`[sitecue] ${msg}`);

/** An error as one log line: its message and where it was thrown (the first stack frame). */
function oneLine(err: unknown): string {
  if (!(err instanceof Error)) return String(err);
  const at = err.stack
    ?.split("\n")
    .find((l) => /^\s+at /.test(l))
    ?.trim();
  return `${err.name}: ${err.message}${at ? ` (${at})` : ""}`;
}

// Express 5 already hands a rejected handler promise to the error handler (a 500 for that request
// alone). What is left is code outside any request: a promise nobody awaits, an "error" event
// nobody listens to. A rejection leaves nothing half-done, so it is logged and the app serves on.
// A thrown exception may have left any state half-changed (Node's docs: "it is not safe to resume
// normal operation after 'uncaughtException'"), so the app logs it and exits; the bootstrap's
// supervisor starts it again within seconds (server/infra/supervise.mjs; DEVELOPERS.md Decisions).
process.on("unhandledRejection", (reason) => {
  console.error(
    `[sitecue] A promise failed and nothing handled it; still serving: ${oneLine(reason)}`,
  );
});
process.on("uncaughtException", (err) => {
  console.error(
    `[sitecue] Unexpected error outside any request; the app stops (npm start starts it again): ${oneLine(err)}`,
  );
  process.exit(1);
});

async function main() {
  const env = loadEnv();
  for (const w of startupWarnings(env)) warn(w);
  const production = env.NODE_ENV === "production";
  const db = {
    host: env.DB_HOST,
    port: env.DB_PORT,
    user: env.DB_USER,
    password: env.DB_PASSWORD,
    database: env.DB_NAME,
  };
  const ds = createDataSource(db);
  await ds.initialize();
  // Requests and pollers report the database's errors here: an outage is one line, not a stack each.
  const database = new DatabaseWatch({ ds, log: warn });
  const ran = await migrate(ds);
  log(
    ran.length
      ? `Migrated: ${ran.join(", ")}`
      : "Database schema is up to date",
  );

  let mailbox: SmtpFake | null = null;
  let smtp = {
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE === "1",
    user: env.SMTP_USER,
    password: env.SMTP_PASSWORD,
    from: env.MAIL_FROM,
  };
  if (env.SMTP_FAKE === "1") {
    if (production)
      throw new Error(
        "SMTP_FAKE=1 is for development only; set SMTP_HOST and friends in production.",
      );
    mailbox = await startSmtpFake({ dir: env.SITECUE_MAIL_DIR });
    smtp = {
      ...smtp,
      host: "127.0.0.1",
      port: mailbox.port,
      secure: false,
      user: undefined,
      password: undefined,
    };
    log(
      `Local SMTP fake listening on 127.0.0.1:${mailbox.port} (mailbox at /dev/mail)`,
    );
  }
  const mailer = createMailer(smtp);

  // Uploaded files live in an S3 bucket; development runs a local S3 fake on loopback.
  let s3Fake: S3Fake | null = null;
  let s3 = {
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    bucket: env.S3_BUCKET,
    accessKeyId: env.S3_ACCESS_KEY_ID,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY,
    forcePathStyle: env.S3_FORCE_PATH_STYLE === "1",
  };
  if (env.S3_FAKE === "1") {
    if (production)
      throw new Error(
        "S3_FAKE=1 is for development only; set S3_ENDPOINT, S3_BUCKET and the S3_ credentials in production.",
      );
    s3Fake = await startS3Fake({
      dir: env.SITECUE_S3_DIR,
      bucket: env.S3_BUCKET,
    });
    s3 = {
      ...s3,
      endpoint: s3Fake.endpoint,
      accessKeyId: "S3RVER",
      secretAccessKey: "S3RVER",
      forcePathStyle: true,
    };
    log(`Local S3 fake listening on ${s3Fake.endpoint} (bucket ${s3.bucket})`);
  }
  const storage = createStorage(s3);
  if (!production) await storage.ensureBucket();
  // Services write e-mail to the outbox in their transactions; this process sends its share.
  // Every app process runs one: rows are claimed with SKIP LOCKED, so they never collide.
  const outbox = new OutboxWorker({
    ds,
    transport: mailer,
    log: warn,
    database,
  });

  if (!production) {
    const seeded = await seedDemoIfEmpty(ds, { production, storage });
    if (seeded) log("Loaded the demo scenario (Hollin & Vane Joinery)");
  }

  const appUrl = env.APP_URL ?? `http://localhost:${env.PORT}`;
  const sitecue = createApp({
    ds,
    db,
    mailer,
    mailbox,
    storage,
    uploadMaxBytes: env.UPLOAD_MAX_BYTES,
    appUrl,
    sessionSecret: env.SESSION_SECRET,
    production,
    devClient: !production,
    trustProxy: env.TRUST_PROXY === "1",
    replyDomain: env.REPLY_DOMAIN,
    threadNoticeDelayMs: env.THREAD_NOTICE_MINUTES * 60 * 1000,
    database,
  });
  const server = http.createServer(sitecue.app);
  const closeClient =
    env.SITECUE_CLIENT === "none"
      ? async () => {}
      : await mountClient(sitecue.app, production ? "static" : "vite", server);
  // Another program can take the port after the bootstrap checked it: say so and exit with the
  // code that makes the supervisor start again on the next free port (issue 13).
  await new Promise<void>((resolve, reject) => {
    const refused = (err: NodeJS.ErrnoException) => {
      if (err.code !== "EADDRINUSE") return reject(err);
      warn(
        `Port ${env.PORT} was taken by another program before Sitecue could listen`,
      );
      process.exit(PORT_TAKEN_EXIT_CODE);
    };
    server.once("error", refused);
    server.listen(env.PORT, "127.0.0.1", () => {
      server.off("error", refused);
      resolve();
    });
  });
  // After listening the server can still emit "error" (e.g. EMFILE when accepting): one line, and
  // the server keeps accepting. A broken request line or a reset socket is "clientError", which
  // Node answers itself (400/408/431, then closes that socket): nothing to add there.
  server.on("error", (err) => warn(`HTTP server: ${oneLine(err)}`));
  const port = (server.address() as AddressInfo).port;
  const took = env.SITECUE_BOOT_STARTED
    ? ` (${((Date.now() - env.SITECUE_BOOT_STARTED) / 1000).toFixed(1)} s after npm start)`
    : "";
  outbox.start();
  // Calendar apps mail their iTIP REPLYs to booking-<id>@REPLY_DOMAIN; point that domain's mail here.
  const inbound = await startInboundSmtp({
    host: env.INBOUND_SMTP_HOST,
    port: env.INBOUND_SMTP_PORT,
    onMail: (mail) => sitecue.receiveMail(mail),
    onError: (err) =>
      console.warn(`[sitecue] inbound mail refused: ${err.message}`),
  });
  log(
    `Inbound SMTP for calendar replies on ${env.INBOUND_SMTP_HOST}:${inbound.port}`,
  );
  // Day-before reminders: checked every 15 minutes (each reminder is claimed once, across processes).
  const reminders = setInterval(
    () => {
      sitecue.sendReminders().catch((err) => {
        if (!database.lost(err)) warn(`reminders: ${oneLine(err)}`);
      });
    },
    15 * 60 * 1000,
  );
  // Thread notice e-mails: swept every minute (each notice is claimed once, across processes).
  const threadNotices = setInterval(() => {
    sitecue.sendThreadNotices().catch((err) => {
      if (!database.lost(err)) warn(`thread notices: ${oneLine(err)}`);
    });
  }, 60 * 1000);
  // Sent e-mail older than OUTBOX_KEEP_DAYS: pruned hourly in bounded batches (SKIP LOCKED, so
  // processes pruning at once take different rows). Failed rows stay until sent again.
  const prune = () =>
    pruneSentMail(ds, { keepDays: env.OUTBOX_KEEP_DAYS })
      .then((n) => {
        if (n) log(`Outbox: pruned ${n} sent e-mail(s)`);
      })
      .catch((err) => {
        if (!database.lost(err)) warn(`outbox pruning: ${oneLine(err)}`);
      });
  void prune();
  const outboxPrune = setInterval(prune, 60 * 60 * 1000);
  // APP_URL may be a public address in front of this one; then say where it really listens too.
  const where = env.APP_URL ? ` (listening on 127.0.0.1:${port})` : "";
  log(`Sitecue is ready at ${appUrl}${where}${took}`);

  let closing = false;
  const shutdown = async () => {
    if (closing) return;
    closing = true;
    log("Shutting down");
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await closeClient();
    await sitecue.close();
    clearInterval(reminders);
    clearInterval(threadNotices);
    clearInterval(outboxPrune);
    await inbound.close();
    await outbox.stop();
    database.close();
    mailer.close();
    await mailbox?.close();
    storage.close();
    await s3Fake?.close();
    await ds.destroy();
    process.exit(0);
  };
  process.on("SIGTERM", shutdown);
  process.on("SIGINT", shutdown);
}

main().catch((err) => {
  console.error(
    `[sitecue] ${err instanceof Error ? err.message : String(err)}`,
  );
  process.exit(1);
});
