import fs from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { SMTPServer } from "smtp-server";
import { simpleParser, type AddressObject } from "mailparser";
import type { CaughtMail } from "../../../shared/schemas";

export interface SmtpFake {
  port: number;
  /** Newest first. */
  messages(): CaughtMail[];
  /** Waits until a message matching `pred` arrives (tests). */
  waitFor(
    pred: (m: CaughtMail) => boolean,
    timeoutMs?: number,
  ): Promise<CaughtMail>;
  /**
   * Refuses RCPT TO for this address (case-insensitive) with a permanent 550, as a real server
   * does for a mailbox that does not exist (RFC 5321 §4.2.2), until `accept` is called.
   */
  refuse(address: string): void;
  /** Takes an address off the refused list. */
  accept(address: string): void;
  close(): Promise<void>;
}

const addresses = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : [])
    .flatMap((x) => x.value.map((v) => v.address ?? ""))
    .filter(Boolean);

/** The distinct iCalendar objects in a message: the inline text/calendar part and the .ics file are often the same one. */
function calendarsOf(
  attachments: { contentType: string; filename?: string; content: Buffer }[],
): CaughtMail["calendars"] {
  const seen = new Map<string, string | null>();
  for (const a of attachments) {
    const type = a.contentType.toLowerCase();
    if (
      type !== "text/calendar" &&
      type !== "application/ics" &&
      !a.filename?.endsWith(".ics")
    )
      continue;
    const content = a.content.toString("utf8");
    if (!seen.has(content))
      seen.set(content, /^METHOD:(\w+)/im.exec(content)?.[1] ?? null);
  }
  return [...seen].map(([content, method]) => ({ method, content }));
}

const linkPattern = /https?:\/\/[^\s"'<>)]+/g;

/**
 * A local SMTP server on loopback that keeps every message it receives: the development and test
 * stand-in for a real mail relay, spoken to over real SMTP by nodemailer. With `dir`, messages are
 * also kept as JSON files so a restart of `npm start` keeps the mailbox.
 */
export async function startSmtpFake(
  opts: { port?: number; dir?: string } = {},
): Promise<SmtpFake> {
  const store: CaughtMail[] = [];
  const refused = new Set<string>();
  const waiters = new Set<{
    pred: (m: CaughtMail) => boolean;
    resolve: (m: CaughtMail) => void;
  }>();
  if (opts.dir) {
    fs.mkdirSync(opts.dir, { recursive: true });
    for (const f of fs
      .readdirSync(opts.dir)
      .filter((f) => f.endsWith(".json"))
      .sort()) {
      const kept = JSON.parse(fs.readFileSync(path.join(opts.dir, f), "utf8"));
      // Mailboxes kept before the Message-ID was recorded have none.
      store.push({ messageId: null, calendars: [], ...kept });
    }
  }
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onRcptTo(address, _session, callback) {
      if (!refused.has(address.address.toLowerCase())) return callback();
      const err: Error & { responseCode?: number } = new Error(
        `5.1.1 <${address.address}>: Recipient address rejected: mailbox unavailable`,
      );
      err.responseCode = 550;
      callback(err);
    },
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const text = parsed.text ?? "";
          const html = typeof parsed.html === "string" ? parsed.html : null;
          const mail: CaughtMail = {
            id: randomUUID(),
            messageId: parsed.messageId ?? null,
            receivedAt: new Date().toISOString(),
            from: addresses(parsed.from).join(", "),
            to: addresses(parsed.to),
            subject: parsed.subject ?? "",
            text,
            html,
            links: [...new Set(text.match(linkPattern) ?? [])],
            calendars: calendarsOf(parsed.attachments ?? []),
          };
          store.push(mail);
          if (opts.dir)
            fs.writeFileSync(
              path.join(
                opts.dir,
                `${mail.receivedAt.replace(/[:.]/g, "-")}-${mail.id}.json`,
              ),
              JSON.stringify(mail),
            );
          for (const w of waiters)
            if (w.pred(mail)) {
              waiters.delete(w);
              w.resolve(mail);
            }
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 0, "127.0.0.1", () => resolve());
  });
  const address = server.server.address();
  const port = typeof address === "object" && address ? address.port : 0;
  return {
    port,
    messages: () => [...store].reverse(),
    waitFor(pred, timeoutMs = 10000) {
      const found = [...store].reverse().find(pred);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const w = {
          pred,
          resolve: (m: CaughtMail) => {
            clearTimeout(t);
            resolve(m);
          },
        };
        const t = setTimeout(() => {
          waiters.delete(w);
          reject(new Error("No matching e-mail arrived in time"));
        }, timeoutMs);
        waiters.add(w);
      });
    },
    refuse: (a) => void refused.add(a.toLowerCase()),
    accept: (a) => void refused.delete(a.toLowerCase()),
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
