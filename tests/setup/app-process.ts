// Real app processes (`node --import tsx server/main.ts`) for tests about what lives between
// processes or on the wire: the environment they get, and their output as lines to wait on.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import type { DataSource } from "typeorm";
import net from "node:net";
import { createDataSource, type DbSettings } from "../../server/db/data-source";
import type { SmtpFake } from "../../server/infra/mail/smtp-fake";
import type { S3Fake } from "../../server/infra/storage/s3-fake";

/** A port the OS says is free on 127.0.0.1 (it may be taken again before it is used). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

/**
 * The environment of an API-only app process on `db`, sending mail to `mail` and files to `s3`
 * (no SMTP or S3 fake of its own, no client). `port` omitted: the caller sets PORT.
 */
export function appProcessEnv(o: {
  db: DbSettings;
  mail: SmtpFake;
  s3: S3Fake;
  port?: number;
  extra?: Record<string, string>;
}): NodeJS.ProcessEnv {
  return {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    NODE_ENV: "test",
    ...(o.port
      ? { PORT: String(o.port), APP_URL: `http://127.0.0.1:${o.port}` }
      : {}),
    DB_HOST: o.db.host,
    DB_PORT: String(o.db.port),
    DB_USER: o.db.user,
    DB_PASSWORD: o.db.password,
    DB_NAME: o.db.database,
    SESSION_SECRET: "app-processes-share-this-secret",
    // No Vite middleware, no built client: these processes serve the API only.
    SITECUE_CLIENT: "none",
    SMTP_FAKE: "0",
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(o.mail.port),
    S3_FAKE: "0",
    S3_ENDPOINT: o.s3.endpoint,
    S3_BUCKET: o.s3.bucket,
    S3_ACCESS_KEY_ID: "S3RVER",
    S3_SECRET_ACCESS_KEY: "S3RVER",
    INBOUND_SMTP_PORT: "0",
    ...o.extra,
  };
}

/** Everything a set of processes wrote (stdout and stderr), split into lines as they come. */
export class ProcessOutput {
  readonly lines: string[] = [];
  private waiters: { test: (l: string) => boolean; done: () => void }[] = [];
  private partial = new Map<NodeJS.ReadableStream, string>();

  /** Collects `child`'s piped stdout and stderr. */
  attach(child: ChildProcess): void {
    for (const stream of [child.stdout, child.stderr])
      stream?.on("data", (chunk: Buffer) => this.write(stream, chunk));
  }

  /** Adds a line from elsewhere (e.g. the supervisor's own log). */
  push(line: string): void {
    this.lines.push(line);
    this.waiters = this.waiters.filter((w) => {
      if (!w.test(line)) return true;
      w.done();
      return false;
    });
  }

  /** Resolves with the first line from now on matching `pattern`; rejects after `ms` with the output. */
  next(pattern: RegExp, ms = 25_000): Promise<string> {
    return new Promise((resolve, reject) => {
      let found = "";
      const timer = setTimeout(() => {
        this.waiters = this.waiters.filter((w) => w !== waiter);
        reject(
          new Error(`No line matching ${pattern} in ${ms} ms:\n${this.text()}`),
        );
      }, ms);
      const waiter = {
        test: (l: string) => pattern.test(l) && ((found = l), true),
        done: () => {
          clearTimeout(timer);
          resolve(found);
        },
      };
      this.waiters.push(waiter);
    });
  }

  text(): string {
    return this.lines.join("\n");
  }

  private write(stream: NodeJS.ReadableStream, chunk: Buffer) {
    const parts = ((this.partial.get(stream) ?? "") + chunk.toString()).split(
      "\n",
    );
    this.partial.set(stream, parts.pop()!);
    for (const line of parts) this.push(line);
  }
}

/** Asks a process to stop (SIGTERM, SIGKILL after 5 s) and resolves once it has. */
export function stopProcess(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    const kill = setTimeout(() => child.kill("SIGKILL"), 5000);
    child.once("exit", () => {
      clearTimeout(kill);
      resolve();
    });
    child.kill("SIGTERM");
  });
}

/** A test app in a child process (tests/setup/app-process-main.ts), with what a test needs to look inside it. */
export interface AppProcess {
  /** Base URL of its HTTP server. */
  url: string;
  /** A connection to its database (for counting rows). */
  ds: DataSource;
  /** Every object key in its bucket, read over the S3 protocol. */
  bucketKeys(): Promise<string[]>;
  /** Null while it runs; its exit code or signal once it has exited. */
  exited(): string | null;
  /** What it wrote to stderr (for failure messages). */
  stderr(): string;
  close(): Promise<void>;
}

/**
 * Starts Sitecue's test app (demo data) in its own Node process, so a test can prove that a
 * request does not take the process down: in vitest's own process an uncaught error would be
 * caught by vitest instead.
 */
export async function startAppProcess(
  opts: { uploadMaxBytes?: number } = {},
): Promise<AppProcess> {
  const main = path.join(import.meta.dirname, "app-process-main.ts");
  const child: ChildProcess = spawn(
    process.execPath,
    ["--import", "tsx", main, String(opts.uploadMaxBytes ?? "")],
    { env: process.env, stdio: ["pipe", "pipe", "pipe"] },
  );
  let stderr = "";
  let exit: string | null = null;
  child.stderr!.on("data", (c: Buffer) => (stderr += c.toString()));
  const gone = new Promise<void>((resolve) =>
    child.once("exit", (code, signal) => {
      exit = signal ?? `exit code ${code}`;
      resolve();
    }),
  );
  const ready = await new Promise<{
    url: string;
    db: DbSettings;
    s3: { endpoint: string; bucket: string };
  }>((resolve, reject) => {
    let out = "";
    child.stdout!.on("data", (c: Buffer) => {
      out += c.toString();
      const line = out.split("\n")[0];
      if (out.includes("\n")) resolve(JSON.parse(line));
    });
    void gone.then(() =>
      reject(new Error(`The app process exited (${exit}):\n${stderr}`)),
    );
  });
  const ds = createDataSource(ready.db);
  await ds.initialize();
  const s3 = new S3Client({
    endpoint: ready.s3.endpoint,
    region: "eu-west-2",
    forcePathStyle: true,
    credentials: { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" },
  });
  return {
    url: ready.url,
    ds,
    async bucketKeys() {
      const out = await s3.send(
        new ListObjectsV2Command({ Bucket: ready.s3.bucket }),
      );
      return (out.Contents ?? []).map((o) => o.Key!).sort();
    },
    exited: () => exit,
    stderr: () => stderr,
    async close() {
      s3.destroy();
      await ds.destroy();
      if (exit === null) {
        child.stdin!.end();
        const timer = setTimeout(() => child.kill("SIGKILL"), 15_000);
        await gone;
        clearTimeout(timer);
      }
    },
  };
}
