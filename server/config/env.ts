import { z } from "zod";

// The environment is read once, through this schema, and start-up fails with the names that are
// wrong (style.md: "Environment read once").
const envSchema = z.object({
  NODE_ENV: z
    .enum(["development", "production", "test"])
    .default("development"),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  APP_URL: z.url().optional(),
  DB_HOST: z.string().default("127.0.0.1"),
  DB_PORT: z.coerce.number().int().default(3306),
  DB_NAME: z.string().default("sitecue"),
  DB_USER: z.string().default("sitecue"),
  DB_PASSWORD: z.string().default(""),
  SESSION_SECRET: z
    .string()
    .min(16, "SESSION_SECRET must be at least 16 characters"),
  SMTP_FAKE: z.enum(["0", "1"]).default("0"),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().default(2525),
  SMTP_SECURE: z.enum(["0", "1"]).default("0"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default("Sitecue <no-reply@sitecue.example.test>"),
  SITECUE_MAIL_DIR: z.string().optional(),
  SITECUE_BOOT_STARTED: z.coerce.number().optional(),
  /** Domain of per-booking reply addresses; its mail must reach the inbound SMTP receiver. */
  REPLY_DOMAIN: z.string().default("replies.sitecue.example.test"),
  INBOUND_SMTP_HOST: z.string().default("127.0.0.1"),
  INBOUND_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(0),
  TRUST_PROXY: z.enum(["0", "1"]).default("0"),
  /** 1 = start the local S3 fake (s3rver) on loopback, for development only. */
  S3_FAKE: z.enum(["0", "1"]).default("0"),
  /** Folder the S3 fake keeps its objects in. */
  SITECUE_S3_DIR: z.string().optional(),
  S3_ENDPOINT: z.url().optional(),
  S3_REGION: z.string().default("eu-west-2"),
  S3_BUCKET: z.string().min(3).default("sitecue"),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  /** Path-style URLs (bucket in the path): needed by most S3-compatible services and the fake. */
  S3_FORCE_PATH_STYLE: z.enum(["0", "1"]).default("1"),
  /** "none" serves the API only (no Vite middleware, no built client): for processes started by tests. */
  SITECUE_CLIENT: z.enum(["auto", "none"]).default("auto"),
  /** Minutes thread messages gather before one notice e-mail per person per job. */
  THREAD_NOTICE_MINUTES: z.coerce
    .number()
    .min(0)
    .max(24 * 60)
    .default(5),
  /** Days a sent e-mail is kept in the outbox before it is pruned (failed ones stay until sent again). */
  OUTBOX_KEEP_DAYS: z.coerce.number().int().min(1).max(3650).default(30),
  /** The largest upload accepted, in bytes (25 MB unless set). */
  UPLOAD_MAX_BYTES: z.coerce
    .number()
    .int()
    .min(1024)
    .default(25 * 1024 * 1024),
});

export type Env = z.infer<typeof envSchema>;

/** Parses process.env; throws one line per wrong variable. */
export function loadEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map(
      (i) => `  ${i.path.join(".")}: ${i.message}`,
    );
    throw new Error(
      `Sitecue cannot start; fix these environment variables:\n${lines.join("\n")}`,
    );
  }
  return parsed.data;
}

/**
 * Settings that start but cannot work, each as one line saying what to set. Production marks the
 * session cookie `Secure` (RFC 6265 §4.1.2.5), and express-session only sets a Secure cookie on a
 * request it knows came over HTTPS; Sitecue itself speaks plain HTTP, so without TRUST_PROXY=1
 * (an HTTPS reverse proxy in front, trusted for X-Forwarded-Proto) nobody can ever sign in: every
 * form says "This form has expired".
 */
export function startupWarnings(env: Env): string[] {
  const warnings: string[] = [];
  if (env.NODE_ENV === "production" && env.TRUST_PROXY !== "1")
    warnings.push(
      "NODE_ENV=production without TRUST_PROXY=1: the session cookie is Secure but Sitecue serves plain HTTP, so nobody can sign in. Serve it behind an HTTPS reverse proxy and set TRUST_PROXY=1.",
    );
  return warnings;
}
