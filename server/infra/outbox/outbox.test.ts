import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { createDataSource } from "../../db/data-source";
import {
  createTestDatabase,
  type TestDatabase,
} from "../../../tests/setup/test-db";
import { createMailer, type Mailer } from "../mail/mailer";
import { startSmtpFake, type SmtpFake } from "../mail/smtp-fake";
import { OutboxMessage } from "./outbox.entity";
import {
  enqueueMail,
  OutboxWorker,
  pruneSentMail,
  requeueFailedMail,
  type OutboxWorkerOptions,
} from "./outbox";
import { newId } from "../../db/columns";

let db: TestDatabase;
let fake: SmtpFake;
let mailer: Mailer;
const logged: string[] = [];
const workers: OutboxWorker[] = [];

beforeAll(async () => {
  db = await createTestDatabase();
  fake = await startSmtpFake();
  mailer = createMailer({
    host: "127.0.0.1",
    port: fake.port,
    secure: false,
    from: "Sitecue <no-reply@sitecue.example.test>",
  });
});
afterEach(async () => {
  await Promise.all(workers.splice(0).map((w) => w.stop()));
  await db.ds.getRepository(OutboxMessage).clear();
  logged.length = 0;
});
afterAll(async () => {
  mailer?.close();
  await fake?.close();
  await db?.drop();
});

function worker(o: Partial<OutboxWorkerOptions> = {}) {
  const w = new OutboxWorker({
    ds: db.ds,
    transport: mailer,
    workerId: `test-${workers.length}`,
    pollMs: 20,
    batchSize: 10,
    maxAttempts: 10,
    backoff: () => 0,
    log: (msg) => logged.push(msg),
    ...o,
  });
  workers.push(w);
  return w;
}

/** A mailer pointed at a loopback port where nothing listens (a fake started, then stopped). */
async function mailerToNowhere(from = "x@sitecue.example.test") {
  const down = await startSmtpFake();
  const port = down.port;
  await down.close();
  return {
    port,
    transport: createMailer({ host: "127.0.0.1", port, secure: false, from }),
  };
}

let serial = 0;
/** A unique address per message, so each test reads only its own mail at the shared fake. */
const address = () => `outbox-${Date.now()}-${++serial}@example.test`;

const queue = (to: string, extra: { workshopId?: string } = {}) =>
  db.ds.transaction((m) =>
    enqueueMail(m, { to, subject: `For ${to}`, text: `Hello ${to}`, ...extra }),
  );

const rows = () => db.ds.getRepository(OutboxMessage).find();
const caughtFor = (f: SmtpFake, to: string) =>
  f.messages().filter((m) => m.to.includes(to));

/** Polls `check` until it returns true, or fails after `ms`. */
async function until(check: () => Promise<boolean> | boolean, ms = 10_000) {
  const deadline = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error("Condition not met in time");
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe("enqueueMail", () => {
  it("writes nothing when the caller's transaction rolls back; a committed one is sent once with its Message-ID", async () => {
    const lost = address();
    await expect(
      db.ds.transaction(async (m) => {
        await enqueueMail(m, { to: lost, subject: "Lost", text: "Never" });
        throw new Error("the change failed");
      }),
    ).rejects.toThrow("the change failed");
    const w = worker();
    expect(await w.runOnce()).toBe(0);
    expect(await rows()).toHaveLength(0);

    const to = address();
    const { id, messageId } = await db.ds.transaction((m) =>
      enqueueMail(m, {
        to,
        subject: "Your visit",
        text: "Plain",
        html: "<p>Rich</p>",
        workshopId: null,
      }),
    );
    expect(messageId).toMatch(
      /^<[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}@sitecue\.example\.test>$/,
    );
    expect(await w.runOnce()).toBe(1);
    expect(await w.runOnce()).toBe(0);
    const [mail, ...more] = caughtFor(fake, to);
    expect(more).toHaveLength(0);
    expect(mail.messageId).toBe(messageId);
    expect(mail.subject).toBe("Your visit");
    expect(mail.html).toContain("<p>Rich</p>");
    expect(caughtFor(fake, lost)).toHaveLength(0);
    const row = await db.ds
      .getRepository(OutboxMessage)
      .findOneByOrFail({ id });
    expect(row).toMatchObject({
      state: "sent",
      attempts: 0,
      lastError: null,
      claimedBy: "test-0",
    });
    expect(row.sentAt).toBeInstanceOf(Date);
  });

  it("sends the calendar part as text/calendar with its method", async () => {
    const to = address();
    const content =
      "BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//Sitecue//test//EN\r\nMETHOD:REQUEST\r\nEND:VCALENDAR\r\n";
    const { messageId } = await db.ds.transaction((m) =>
      enqueueMail(m, {
        to,
        subject: "Invitation",
        text: "See the invitation",
        calendar: { method: "REQUEST", content, filename: "visit.ics" },
      }),
    );
    const raw: string[] = [];
    const spy: Pick<Mailer, "send"> = {
      async send(mail) {
        raw.push(JSON.stringify(mail));
        await mailer.send(mail);
      },
    };
    expect(await worker({ transport: spy }).runOnce()).toBe(1);
    expect(JSON.parse(raw[0])).toMatchObject({
      messageId,
      icalEvent: { method: "REQUEST", content, filename: "visit.ics" },
    });
    expect(caughtFor(fake, to)).toHaveLength(1);
  });
});

describe("OutboxWorker", () => {
  it("loses nothing while the SMTP server is down, and sends everything exactly once when it is back", async () => {
    const { port, transport } = await mailerToNowhere(
      "Sitecue <no-reply@sitecue.example.test>",
    );
    const to = [address(), address(), address()];
    const ids = [];
    for (const t of to) ids.push((await queue(t)).messageId);
    const w = worker({ transport, backoff: () => 0 });

    expect(await w.runOnce()).toBe(0);
    expect(await w.runOnce()).toBe(0);
    const failing = await rows();
    expect(failing).toHaveLength(3);
    for (const r of failing) {
      expect(r.state).toBe("pending");
      expect(r.attempts).toBe(2);
      expect(r.lastError).toMatch(/ECONNREFUSED|connect/i);
      expect(r.claimedBy).toBeNull();
    }
    expect(logged.filter((l) => l.includes("failed (attempt"))).toHaveLength(6);

    const back = await startSmtpFake({ port });
    try {
      let sent = 0;
      await until(async () => (sent += await w.runOnce()) === 3);
      expect(await w.runOnce()).toBe(0);
      const caught = back.messages();
      expect(caught.map((m) => m.messageId).sort()).toEqual([...ids].sort());
      expect(caught.map((m) => m.to[0]).sort()).toEqual([...to].sort());
      expect((await rows()).map((r) => [r.state, r.attempts])).toEqual([
        ["sent", 2],
        ["sent", 2],
        ["sent", 2],
      ]);
    } finally {
      transport.close();
      await back.close();
    }
  });

  it("waits out the backoff before trying again", async () => {
    const { transport } = await mailerToNowhere();
    try {
      await queue(address());
      const w = worker({ transport, backoff: () => 60_000 });
      expect(await w.runOnce()).toBe(0);
      expect(await w.runOnce()).toBe(0);
      const [r] = await rows();
      expect(r.attempts).toBe(1); // the second poll found nothing due
      const [{ wait }] = await db.ds.query(
        "SELECT TIMESTAMPDIFF(SECOND, UTC_TIMESTAMP(3), nextAttemptAt) wait FROM outbox_messages",
      );
      expect(Number(wait)).toBeGreaterThan(55);
      expect(Number(wait)).toBeLessThanOrEqual(60);
    } finally {
      transport.close();
    }
  });

  it("marks a message failed after maxAttempts and leaves it alone after that", async () => {
    const { transport } = await mailerToNowhere();
    try {
      await queue(address());
      const w = worker({ transport, maxAttempts: 3 });
      for (let i = 0; i < 3; i++) expect(await w.runOnce()).toBe(0);
      let [r] = await rows();
      expect(r).toMatchObject({ state: "failed", attempts: 3 });
      expect(r.lastError).toBeTruthy();
      expect(logged.at(-1)).toContain("giving up");
      expect(await w.runOnce()).toBe(0);
      [r] = await rows();
      expect(r).toMatchObject({ state: "failed", attempts: 3 });
    } finally {
      transport.close();
    }
  });

  it("resends, with the same Message-ID, a message whose worker died between sending and marking", async () => {
    const to = address();
    const { id, messageId } = await queue(to);
    const fresh = address();
    const other = await queue(fresh);
    // The dead worker claimed and sent the first ten minutes ago; another claimed the second just now.
    await mailer.send({
      to,
      subject: `For ${to}`,
      text: "first copy",
      messageId,
    });
    await db.ds.query(
      "UPDATE outbox_messages SET state = 'sending', claimedBy = 'dead-worker', claimedAt = UTC_TIMESTAMP(3) - INTERVAL 10 MINUTE WHERE id = ?",
      [id],
    );
    await db.ds.query(
      "UPDATE outbox_messages SET state = 'sending', claimedBy = 'busy-worker', claimedAt = UTC_TIMESTAMP(3) WHERE id = ?",
      [other.id],
    );

    const w = worker({ leaseMs: 2 * 60_000 });
    expect(await w.runOnce()).toBe(1);
    const copies = caughtFor(fake, to);
    expect(copies).toHaveLength(2);
    expect(copies.map((m) => m.messageId)).toEqual([messageId, messageId]);
    const repo = db.ds.getRepository(OutboxMessage);
    const resent = await repo.findOneByOrFail({ id });
    expect(resent).toMatchObject({
      state: "sent",
      attempts: 1,
      claimedBy: "test-0",
    });
    expect(resent.lastError).toContain("dead-worker");
    // A claim inside its lease is left to its worker.
    expect(await repo.findOneByOrFail({ id: other.id })).toMatchObject({
      state: "sending",
      claimedBy: "busy-worker",
    });
    expect(caughtFor(fake, fresh)).toHaveLength(0);
  });

  it("two workers on two connection pools send 50 messages, each exactly once", async () => {
    const second = createDataSource(db.settings);
    await second.initialize();
    try {
      const to = Array.from({ length: 50 }, address);
      const ids = new Set<string>();
      await db.ds.transaction(async (m) => {
        for (const t of to)
          ids.add(
            (await enqueueMail(m, { to: t, subject: "Fan-out", text: t }))
              .messageId,
          );
      });
      const a = worker({ workerId: "worker-a", batchSize: 5, pollMs: 5 });
      const b = worker({
        ds: second,
        workerId: "worker-b",
        batchSize: 5,
        pollMs: 5,
      });
      const started = Date.now();
      a.start();
      b.start();
      const sent = () =>
        db.ds.getRepository(OutboxMessage).countBy({ state: "sent" });
      await until(async () => (await sent()) === 50, 20_000);
      await Promise.all([a.stop(), b.stop()]);
      const took = Date.now() - started;

      const caught = fake.messages().filter((m) => m.subject === "Fan-out");
      const perId = new Map<string, number>();
      for (const m of caught)
        perId.set(m.messageId!, (perId.get(m.messageId!) ?? 0) + 1);
      expect(caught).toHaveLength(50);
      expect([...perId.keys()].sort()).toEqual([...ids].sort());
      expect([...perId.values()].every((n) => n === 1)).toBe(true);
      const by = await db.ds.query(
        "SELECT claimedBy, COUNT(*) n FROM outbox_messages GROUP BY claimedBy",
      );
      expect(logged).toEqual([]);
      // Not asserted (scheduling decides it), but shown: how the work was shared, and how long.
      console.log(`50 messages in ${took} ms:`, JSON.stringify(by));
    } finally {
      await second.destroy();
    }
  });

  it("stop() waits for the batch in flight to be sent and marked", async () => {
    const to = [address(), address(), address()];
    for (const t of to) await queue(t);
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    let calls = 0;
    const slow: Pick<Mailer, "send"> = {
      async send(mail) {
        calls++;
        await gate;
        await mailer.send(mail);
      },
    };
    const w = worker({ transport: slow });
    w.start();
    await until(() => calls === 3);
    let stopped = false;
    const stopping = w.stop().then(() => (stopped = true));
    await new Promise((r) => setTimeout(r, 50));
    expect(stopped).toBe(false);
    release();
    await stopping;
    expect((await rows()).map((r) => r.state)).toEqual([
      "sent",
      "sent",
      "sent",
    ]);
    for (const t of to) expect(caughtFor(fake, t)).toHaveLength(1);
  });

  it("gives up at once on a permanent SMTP refusal (5xx), records when, and sends it after a re-queue with the same Message-ID", async () => {
    const to = address();
    const other = address();
    fake.refuse(to);
    const { id, messageId } = await queue(to, { workshopId: newId() });
    await queue(other);
    const w = worker({ maxAttempts: 10 });
    // RFC 5321 §4.2.1: a 5yz reply is permanent; the other message in the batch still goes.
    expect(await w.runOnce()).toBe(1);
    const repo = db.ds.getRepository(OutboxMessage);
    const failed = await repo.findOneByOrFail({ id });
    expect(failed).toMatchObject({ state: "failed", attempts: 1 });
    expect(failed.lastError).toMatch(/550 5\.1\.1/);
    expect(failed.lastAttemptAt).toBeInstanceOf(Date);
    expect(Math.abs(failed.lastAttemptAt!.getTime() - Date.now())).toBeLessThan(
      60_000,
    );
    expect(logged.at(-1)).toContain("giving up");
    expect(caughtFor(fake, to)).toHaveLength(0);
    expect(caughtFor(fake, other)).toHaveLength(1);
    expect(await w.runOnce()).toBe(0);

    // Only a failed row of the same workshop goes back.
    expect(await requeueFailedMail(db.ds.manager, id, newId())).toBe(false);
    fake.accept(to);
    const row = await repo.findOneByOrFail({ id });
    expect(await requeueFailedMail(db.ds.manager, id, row.workshopId!)).toBe(
      true,
    );
    expect(await requeueFailedMail(db.ds.manager, id, row.workshopId!)).toBe(
      false,
    );
    expect(await repo.findOneByOrFail({ id })).toMatchObject({
      state: "pending",
      attempts: 0,
      lastError: null,
      lastAttemptAt: null,
    });
    expect(await w.runOnce()).toBe(1);
    const [mail, ...more] = caughtFor(fake, to);
    expect(more).toHaveLength(0);
    expect(mail.messageId).toBe(messageId);
    expect(await repo.findOneByOrFail({ id })).toMatchObject({
      state: "sent",
      messageId,
    });
  });

  it("a 4xx or a refused connection is still retried, not given up on", async () => {
    const { transport } = await mailerToNowhere();
    try {
      await queue(address());
      expect(await worker({ transport }).runOnce()).toBe(0);
      const [r] = await rows();
      expect(r).toMatchObject({ state: "pending", attempts: 1 });
      expect(r.lastAttemptAt).toBeInstanceOf(Date);
    } finally {
      transport.close();
    }
  });
});

describe("pruneSentMail", () => {
  const DAY = 86_400_000;
  /** A row as the worker leaves it, sent (or failed, or pending) `daysAgo` days ago. */
  async function aged(state: OutboxMessage["state"], daysAgo: number) {
    const at = new Date(Date.now() - daysAgo * DAY);
    const { id } = await queue(address());
    await db.ds.getRepository(OutboxMessage).update(id, {
      state,
      sentAt: state === "sent" ? at : null,
      lastAttemptAt: state === "failed" ? at : null,
      nextAttemptAt: at,
    });
    return id;
  }
  const left = async () =>
    (await rows()).map((r) => r.id).sort((a, b) => a.localeCompare(b));

  it("deletes sent rows older than the retention in bounded batches; keeps recent sent, failed and pending ones", async () => {
    const old: string[] = [];
    for (let i = 0; i < 7; i++) old.push(await aged("sent", 31 + i));
    const kept = [
      await aged("sent", 29),
      await aged("sent", 0),
      await aged("failed", 90),
      await aged("pending", 90),
    ];
    // maxBatches bounds one call: two batches of three.
    expect(
      await pruneSentMail(db.ds, { keepDays: 30, batchSize: 3, maxBatches: 2 }),
    ).toBe(6);
    // Oldest first: the one left of the old ones is the newest of them (31 days).
    expect(await left()).toEqual(
      [old[0], ...kept].sort((a, b) => a.localeCompare(b)),
    );
    expect(await pruneSentMail(db.ds, { keepDays: 30, batchSize: 3 })).toBe(1);
    expect(await pruneSentMail(db.ds, { keepDays: 30, batchSize: 3 })).toBe(0);
    expect(await left()).toEqual([...kept].sort((a, b) => a.localeCompare(b)));
    // A shorter retention takes the 29-day one too, never the failed or pending ones.
    expect(await pruneSentMail(db.ds, { keepDays: 1 })).toBe(1);
    expect((await rows()).map((r) => r.state).sort()).toEqual([
      "failed",
      "pending",
      "sent",
    ]);
  });

  it("two processes pruning at once delete each old row once, without errors", async () => {
    const second = createDataSource(db.settings);
    await second.initialize();
    try {
      for (let i = 0; i < 40; i++) await aged("sent", 40);
      const recent = await aged("sent", 2);
      const [a, b] = await Promise.all([
        pruneSentMail(db.ds, { keepDays: 30, batchSize: 4 }),
        pruneSentMail(second, { keepDays: 30, batchSize: 4 }),
      ]);
      expect(a + b).toBe(40);
      expect(await left()).toEqual([recent]);
    } finally {
      await second.destroy();
    }
  });
});
