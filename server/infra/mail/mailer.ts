import nodemailer, { type Transporter } from "nodemailer";
import type Mail from "nodemailer/lib/mailer";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  /**
   * RFC 5322 §3.6.4 Message-ID, angle brackets included. The outbox passes the one it stored, so a
   * resend after a crash carries the same id and mail clients fold the two copies.
   */
  messageId?: string;
  /** An iCalendar part (RFC 6047): nodemailer adds it as a `text/calendar; method=…` alternative and as an .ics attachment. */
  icalEvent?: Mail.IcalAttachment;
  attachments?: Mail.Attachment[];
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  close(): void;
}

export interface SmtpSettings {
  host: string;
  port: number;
  secure: boolean;
  user?: string;
  password?: string;
  from: string;
}

/** Sends e-mail over SMTP with nodemailer (the local fake in development and tests). */
export function createMailer(smtp: SmtpSettings): Mailer {
  const transport: Transporter = nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    auth: smtp.user
      ? { user: smtp.user, pass: smtp.password ?? "" }
      : undefined,
    // The local fake speaks plain SMTP on loopback; a real relay negotiates STARTTLS.
    ignoreTLS: smtp.host === "127.0.0.1" && !smtp.secure,
    // Bounded waits (nodemailer's defaults are 2 and 10 minutes), so a hung relay fails a send
    // well inside the outbox's claim lease instead of outliving it.
    connectionTimeout: 30_000,
    greetingTimeout: 30_000,
    socketTimeout: 60_000,
  });
  return {
    async send(mail) {
      await transport.sendMail({ from: smtp.from, ...mail });
    },
    close() {
      transport.close();
    },
  };
}
