import nodemailer, { type Transporter } from "nodemailer";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
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
