import http from "node:http";
import { createApp } from "./app";
import { loadEnv } from "./config/env";
import { createDataSource } from "./db/data-source";
import { migrate } from "./db/migrate";
import { seedDemoIfEmpty } from "./db/seed";
import { mountClient } from "./http/client";
import { createMailer } from "./infra/mail/mailer";
import { startSmtpFake, type SmtpFake } from "./infra/mail/smtp-fake";
import { OutboxWorker, pruneSentMail } from "./infra/outbox/outbox";
import { startInboundSmtp } from "./infra/mail/inbound";
import { startS3Fake, type S3Fake } from "./infra/storage/s3-fake";
import { createStorage } from "./infra/storage/storage";

const log = (msg: string) => console.log(`[sitecue] ${msg}`);

async function main() {
  const env = loadEnv();
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
    log: (msg) => console.warn(`[sitecue] ${msg}`),
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
  });
  const server = http.createServer(sitecue.app);
  const closeClient =
    env.SITECUE_CLIENT === "none"
      ? async () => {}
      : await mountClient(sitecue.app, production ? "static" : "vite", server);
  await new Promise<void>((resolve) =>
    server.listen(env.PORT, "127.0.0.1", resolve),
  );
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
      sitecue
        .sendReminders()
        .catch((err) =>
          console.warn(
            `[sitecue] reminders: ${err instanceof Error ? err.message : String(err)}`,
          ),
        );
    },
    15 * 60 * 1000,
  );
  // Thread notice e-mails: swept every minute (each notice is claimed once, across processes).
  const threadNotices = setInterval(() => {
    sitecue
      .sendThreadNotices()
      .catch((err) =>
        console.warn(
          `[sitecue] thread notices: ${err instanceof Error ? err.message : String(err)}`,
        ),
      );
  }, 60 * 1000);
  // Sent e-mail older than OUTBOX_KEEP_DAYS: pruned hourly in bounded batches (SKIP LOCKED, so
  // processes pruning at once take different rows). Failed rows stay until sent again.
  const prune = () =>
    pruneSentMail(ds, { keepDays: env.OUTBOX_KEEP_DAYS })
      .then((n) => {
        if (n) log(`Outbox: pruned ${n} sent e-mail(s)`);
      })
      .catch((err) =>
        console.warn(
          `[sitecue] outbox pruning: ${err instanceof Error ? err.message : String(err)}`,
        ),
      );
  void prune();
  const outboxPrune = setInterval(prune, 60 * 60 * 1000);
  log(`Sitecue is ready at ${appUrl}${took}`);

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
