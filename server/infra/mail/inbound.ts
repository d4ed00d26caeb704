// The inbound SMTP receiver: where a trade's calendar app mails its iTIP REPLY (RFC 6047 §2) to a
// booking's ORGANIZER address. smtp-server on loopback in development and tests; the production
// route (a relay forwarding to it, or another listener) is configured by whoever starts it.
// It only receives and unpacks: deciding whether a reply counts is the bookings service's job.
import { SMTPServer, type SMTPServerDataStream } from "smtp-server";
import { simpleParser, type AddressObject, type Attachment } from "mailparser";

/** A received message as the bookings service needs it. */
export interface InboundMail {
  /** The SMTP envelope sender (MAIL FROM), "" for a null sender. */
  envelopeFrom: string;
  /** The first address of the From: header. */
  from: string;
  /** The envelope recipients (RCPT TO): the booking reply addresses this copy was delivered to. */
  to: string[];
  subject: string;
  /** Each distinct iCalendar object in the message, with the method it was labelled with. */
  calendarParts: { method: string | null; content: string }[];
}

/** A larger message is refused: a calendar reply is a few kilobytes. */
export const inboundSizeLimit = 1024 * 1024;

class SmtpError extends Error {
  constructor(
    message: string,
    readonly responseCode: number,
  ) {
    super(message);
  }
}

function firstAddress(a: AddressObject | AddressObject[] | undefined): string {
  const list = Array.isArray(a) ? a : a ? [a] : [];
  for (const x of list)
    for (const v of x.value) if (v.address) return v.address;
  return "";
}

// A reply is one line of SMTP: no CR/LF from a caller's message may reach the wire.
const oneLine = (s: string) =>
  s
    .replace(/[\r\n]+/g, " ")
    .trim()
    .slice(0, 400) || "Refused";

function isCalendar(att: Attachment): boolean {
  const type = att.contentType.toLowerCase();
  return (
    type === "text/calendar" ||
    type === "application/ics" ||
    /\.ics$/i.test(att.filename ?? "")
  );
}

function methodOf(att: Attachment, content: string): string | null {
  // RFC 6047 §2.4: the method parameter of the text/calendar Content-Type names the iTIP method.
  const header = att.headers.get("content-type") as
    { params?: Record<string, string> } | string | undefined;
  const param =
    header && typeof header === "object" ? header.params?.method : undefined;
  if (param) return param.trim().toUpperCase();
  // An .ics attachment (often application/ics) carries no such parameter: read the object's own
  // METHOD line (RFC 5545 §3.7.2), which is never folded in practice but may be; unfold first.
  const unfolded = content.replace(/\r?\n[ \t]/g, "");
  const m = /^METHOD:([^\r\n]*)$/im.exec(unfolded);
  return m ? m[1].trim().toUpperCase() : null;
}

/** The distinct calendar objects among a message's parts (inline or attached). */
function calendarPartsOf(attachments: Attachment[]) {
  const parts: { method: string | null; content: string }[] = [];
  const seen = new Map<string, { method: string | null; content: string }>();
  for (const att of attachments) {
    if (!isCalendar(att)) continue;
    const content = att.content.toString("utf8");
    // The inline text/calendar part and the .ics attachment are usually the same object
    // (nodemailer and most calendar apps send both): keep it once, by content.
    const key = content.replace(/\r\n/g, "\n").trim();
    const method = methodOf(att, content);
    const known = seen.get(key);
    if (known) {
      known.method ??= method;
      continue;
    }
    const part = { method, content };
    seen.set(key, part);
    parts.push(part);
  }
  return parts;
}

/** Starts the inbound SMTP receiver; each accepted message is handed to `onMail`. */
export async function startInboundSmtp(opts: {
  port?: number;
  host?: string;
  onMail: (mail: InboundMail) => Promise<void>;
  /** Socket-level errors after start-up (default: a console warning). */
  onError?: (err: Error) => void;
}): Promise<{ port: number; close(): Promise<void> }> {
  const server = new SMTPServer({
    // Anyone may deliver to the reply addresses, as to any MX; nobody logs in.
    authOptional: true,
    // Loopback in development and tests; a production listener would add TLS here.
    disabledCommands: ["STARTTLS", "AUTH"],
    size: inboundSizeLimit,
    logger: false,
    onData(stream: SMTPServerDataStream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          // smtp-server reads past the limit but flags it: refuse the whole message
          // (RFC 1870 §6: 552, message size exceeds the fixed limit).
          if (stream.sizeExceeded)
            throw new SmtpError(
              `Message is larger than ${inboundSizeLimit} bytes`,
              552,
            );
          const mailFrom = session.envelope.mailFrom;
          const mail: InboundMail = {
            envelopeFrom: mailFrom ? mailFrom.address : "",
            from: firstAddress(parsed.from),
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? "",
            calendarParts: calendarPartsOf(parsed.attachments),
          };
          try {
            await opts.onMail(mail);
          } catch (err) {
            // RFC 5321 §4.2.3: 550, so the sender's mail system tells them it was refused and why.
            throw new SmtpError(
              oneLine(err instanceof Error ? err.message : String(err)),
              550,
            );
          }
        })
        .then(
          () => callback(),
          (err: unknown) => {
            // Anything else (an unreadable message): a permanent failure with a plain reason.
            const e =
              err instanceof SmtpError
                ? err
                : new SmtpError("Message could not be read", 554);
            callback(
              Object.assign(new Error(e.message), {
                responseCode: e.responseCode,
              }),
            );
          },
        );
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 0, opts.host ?? "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  // Without a listener an emitted socket error would crash the process.
  server.on(
    "error",
    opts.onError ??
      ((err: Error) => console.warn("inbound SMTP:", err.message)),
  );
  const address = server.server.address();
  const port = typeof address === "object" && address ? address.port : 0;
  return {
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
