import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { AddressInfo } from "node:net";
import S3rver from "s3rver";

export interface S3Fake {
  endpoint: string;
  port: number;
  bucket: string;
  close(): Promise<void>;
}

/**
 * A local S3-compatible service on loopback (s3rver) for development and tests. It speaks the S3
 * protocol, so Sitecue's storage code runs unchanged against it; it does not check signatures,
 * so permission tests go through Sitecue's own routes.
 */
export async function startS3Fake(
  opts: { dir?: string; port?: number; bucket?: string } = {},
): Promise<S3Fake> {
  const temporary = !opts.dir;
  const dir = opts.dir ?? fs.mkdtempSync(path.join(os.tmpdir(), "sitecue-s3-"));
  fs.mkdirSync(dir, { recursive: true });
  const bucket = opts.bucket ?? "sitecue";
  const server = new S3rver({
    address: "127.0.0.1",
    port: opts.port ?? 0,
    silent: true,
    directory: dir,
    configureBuckets: [{ name: bucket, configs: [] }],
  });
  const address = (await server.run()) as AddressInfo;
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    port: address.port,
    bucket,
    async close() {
      await server.close();
      if (temporary) fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
