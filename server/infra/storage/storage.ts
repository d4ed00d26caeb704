import type { Readable } from "node:stream";
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  CreateBucketCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { Upload } from "@aws-sdk/lib-storage";

/** Where uploaded files live: one S3 bucket (production: any S3-compatible service; dev/tests: s3rver). */
export interface Storage {
  readonly bucket: string;
  /** Streams `body` to `key` (multipart when large, so the whole file is never held in memory). */
  put(key: string, body: Readable, contentType: string): Promise<void>;
  get(key: string): Promise<{ body: Readable; length?: number }>;
  /** Removes `key`; a key that is already gone is not an error. */
  delete(key: string): Promise<void>;
  /** Creates the bucket when it does not exist (development and tests only). */
  ensureBucket(): Promise<void>;
  close(): void;
}

export interface StorageSettings {
  endpoint?: string;
  region: string;
  bucket: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  forcePathStyle: boolean;
}

export function createStorage(s: StorageSettings): Storage {
  const client = new S3Client({
    endpoint: s.endpoint,
    region: s.region,
    forcePathStyle: s.forcePathStyle,
    credentials:
      s.accessKeyId && s.secretAccessKey
        ? { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey }
        : undefined,
    // With the SDK's default checksums, streamed uploads are sent with aws-chunked framing, which
    // some S3-compatible services (the local fake among them) store verbatim. Ask for checksums
    // only where the service requires them.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
  return {
    bucket: s.bucket,
    async put(key, body, contentType) {
      await new Upload({
        client,
        params: {
          Bucket: s.bucket,
          Key: key,
          Body: body,
          ContentType: contentType,
        },
        queueSize: 2,
        partSize: 5 * 1024 * 1024,
      }).done();
    },
    async get(key) {
      const out = await client.send(
        new GetObjectCommand({ Bucket: s.bucket, Key: key }),
      );
      return {
        body: out.Body as Readable,
        length: out.ContentLength,
      };
    },
    async delete(key) {
      await client.send(
        new DeleteObjectCommand({ Bucket: s.bucket, Key: key }),
      );
    },
    async ensureBucket() {
      try {
        await client.send(new HeadBucketCommand({ Bucket: s.bucket }));
      } catch {
        await client.send(new CreateBucketCommand({ Bucket: s.bucket }));
      }
    },
    close: () => client.destroy(),
  };
}
