import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import type { DataSource } from "typeorm";
import { createDataSource, type DbSettings } from "../../server/db/data-source";

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
