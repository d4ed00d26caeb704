import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import express from "express";
import request from "supertest";
import { fileTypeFromBuffer } from "file-type";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { z } from "zod";
import { errorHandler } from "../../http/errors";
import { startS3Fake, type S3Fake } from "../../infra/storage/s3-fake";
import { createStorage, type Storage } from "../../infra/storage/storage";
import {
  createTestDatabase,
  type TestDatabase,
} from "../../../tests/setup/test-db";
import { buildUser, buildWorkshop } from "../../../tests/factories/builders";
import {
  sampleDxf,
  sampleElf,
  sampleJpeg,
  samplePdf,
  samplePng,
  sampleSvg,
} from "../../../tests/setup/uploads";
import { StoredFile } from "./files.entity";
import {
  cleanFileName,
  receiveUploads,
  sendStoredFile,
  type FilesDeps,
} from "./files.service";

// The upload path on its own, against MariaDB and the S3 fake over HTTP (the S3 protocol through
// @aws-sdk/client-s3). The routes that use it (drawings, thread) test permissions.

let db: TestDatabase;
let s3: S3Fake;
let storage: Storage;
let deps: FilesDeps;
let workshopId: string;
let userId: string;
let app: express.Express;
const MAX = 6 * 1024 * 1024;

const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");

/** Every object key in the fake's folder for the bucket (s3rver keeps one file per object). */
function objectCount(): Promise<number> {
  return Promise.resolve(
    (
      fs.readdirSync(path.join(s3Dir(), s3.bucket), {
        recursive: true,
      }) as string[]
    ).filter((f) => f.endsWith("._S3rver_object")).length,
  );
}
let dir = "";
const s3Dir = () => dir;

beforeAll(async () => {
  db = await createTestDatabase();
  dir = fs.mkdtempSync(
    path.join(process.env.TMPDIR ?? "/tmp", "sitecue-files-test-"),
  );
  s3 = await startS3Fake({ dir });
  storage = createStorage({
    endpoint: s3.endpoint,
    region: "eu-west-2",
    bucket: s3.bucket,
    accessKeyId: "S3RVER",
    secretAccessKey: "S3RVER",
    forcePathStyle: true,
  });
  deps = { ds: db.ds, storage, maxBytes: MAX };
  const ws = await buildWorkshop(db.ds.manager, {
    name: "Upload Test Joinery",
  });
  workshopId = ws.id;
  userId = (
    await buildUser(db.ds.manager, { email: "up@uploadtest.example.test" })
  ).id;

  app = express();
  app.post("/upload", async (req, res, next) => {
    try {
      const out = await receiveUploads(deps, req, res, {
        workshopId,
        userId,
        fields: z.object({ note: z.string().max(20).optional() }),
        maxFiles: 2,
      });
      res.json({
        ids: out.files.map((f) => f.id),
        note: out.fields.note ?? null,
      });
    } catch (err) {
      next(err);
    }
  });
  app.get("/files/:id", async (req, res, next) => {
    try {
      const f = await db.ds.manager.findOneByOrFail(StoredFile, {
        id: req.params.id,
      });
      await sendStoredFile(deps, res, f, {
        variant: req.query.thumb ? "thumbnail" : "original",
        inline: req.query.inline === "1",
      });
    } catch (err) {
      next(err);
    }
  });
  app.use(errorHandler((err) => console.error(err)));
});

afterAll(async () => {
  storage?.close();
  await s3?.close();
  fs.rmSync(dir, { recursive: true, force: true });
  await db?.drop();
});

const binary = (
  res: request.Response,
  cb: (err: Error | null, body: Buffer) => void,
) => {
  const chunks: Buffer[] = [];
  res.on("data", (c: Buffer) => chunks.push(c));
  res.on("end", () => cb(null, Buffer.concat(chunks)));
};

describe("receiveUploads and sendStoredFile", () => {
  it("stores a PDF in the bucket and streams back the same bytes, as an attachment by default", async () => {
    const pdf = samplePdf("Elevation, alcoves", 1_500_000);
    const up = await request(app)
      .post("/upload")
      .field("note", "Rev A")
      .attach("file", pdf, {
        filename: "../../etc/Elevation A.pdf",
        contentType: "application/octet-stream",
      })
      .expect(200);
    expect(up.body.note).toBe("Rev A");
    const row = await db.ds.manager.findOneByOrFail(StoredFile, {
      id: up.body.ids[0],
    });
    // The type is sniffed from the content, not taken from the browser's claim.
    expect(row.mimeType).toBe("application/pdf");
    expect(row.originalName).toBe("Elevation A.pdf");
    expect(row.storageKey).toMatch(
      new RegExp(`^workshops/${workshopId}/[0-9a-f-]{36}\\.pdf$`),
    );
    expect(row.sizeBytes).toBe(pdf.length);
    expect(row.sha256).toBe(sha(pdf));
    expect(row.thumbnailKey).toBeNull();

    const down = await request(app)
      .get(`/files/${row.id}`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    expect(sha(down.body as Buffer)).toBe(sha(pdf));
    expect(down.headers["content-type"]).toBe("application/pdf");
    expect(down.headers["content-length"]).toBe(String(pdf.length));
    expect(down.headers["x-content-type-options"]).toBe("nosniff");
    // RFC 6266: attachment with an ASCII filename and the RFC 8187 UTF-8 form.
    expect(down.headers["content-disposition"]).toBe(
      `attachment; filename="Elevation A.pdf"; filename*=UTF-8''Elevation%20A.pdf`,
    );
    const inline = await request(app)
      .get(`/files/${row.id}?inline=1`)
      .expect(200);
    expect(inline.headers["content-disposition"]).toMatch(/^inline;/);
  });

  it("makes a WebP thumbnail for an image that fits 480 × 480 and keeps the original's size", async () => {
    const png = await samplePng(1600, 900);
    const up = await request(app)
      .post("/upload")
      .attach("file", png, {
        filename: "coving template.png",
        contentType: "image/png",
      })
      .expect(200);
    const row = await db.ds.manager.findOneByOrFail(StoredFile, {
      id: up.body.ids[0],
    });
    expect([row.width, row.height]).toEqual([1600, 900]);
    const thumb = await request(app)
      .get(`/files/${row.id}?thumb=1`)
      .buffer(true)
      .parse(binary)
      .expect(200);
    expect(thumb.headers["content-type"]).toBe("image/webp");
    // Checked by sharp (libvips) and by file-type, independent readers of the format.
    const meta = await sharp(thumb.body as Buffer).metadata();
    expect(meta.format).toBe("webp");
    expect([meta.width, meta.height]).toEqual([480, 270]);
    expect((await fileTypeFromBuffer(thumb.body as Buffer))?.mime).toBe(
      "image/webp",
    );
  });

  it("corrects a wrong extension to the sniffed type (a PNG named .jpg is stored as .png)", async () => {
    const up = await request(app)
      .post("/upload")
      .attach("file", await samplePng(20, 20), {
        filename: "photo.jpg",
        contentType: "image/jpeg",
      })
      .expect(200);
    const row = await db.ds.manager.findOneByOrFail(StoredFile, {
      id: up.body.ids[0],
    });
    expect(row.mimeType).toBe("image/png");
    expect(row.originalName).toBe("photo.png");
  });

  it("accepts a DXF (recognised from its group codes) and never serves it inline", async () => {
    const up = await request(app)
      .post("/upload")
      .attach("file", sampleDxf(), {
        filename: "plinth.dxf",
        contentType: "application/dxf",
      })
      .expect(200);
    const row = await db.ds.manager.findOneByOrFail(StoredFile, {
      id: up.body.ids[0],
    });
    expect(row.mimeType).toBe("image/vnd.dxf");
    const down = await request(app)
      .get(`/files/${row.id}?inline=1`)
      .expect(200);
    expect(down.headers["content-disposition"]).toMatch(/^attachment;/);
  });

  it("refuses an executable renamed .pdf, saying what it really is, and keeps nothing", async () => {
    const before = await objectCount();
    const rows = await db.ds.manager.count(StoredFile);
    const res = await request(app)
      .post("/upload")
      .attach("file", sampleElf(), {
        filename: "plan.pdf",
        contentType: "application/pdf",
      })
      .expect(415);
    expect(res.body.error.code).toBe("file-type-refused");
    expect(res.body.error.message).toBe(
      "plan.pdf is not a PDF: its content is an ELF executable (application/x-elf). Sitecue accepts PDF, PNG, JPEG, WebP, DXF.",
    );
    expect(await objectCount()).toBe(before);
    expect(await db.ds.manager.count(StoredFile)).toBe(rows);
  });

  it("refuses SVG and plain text with the reason", async () => {
    const svg = await request(app)
      .post("/upload")
      .attach("file", sampleSvg(), {
        filename: "elevation.svg",
        contentType: "image/svg+xml",
      })
      .expect(415);
    expect(svg.body.error.message).toMatch(
      /^elevation\.svg is an SVG image\. SVG files can carry scripts/,
    );
    const txt = await request(app)
      .post("/upload")
      .attach("file", Buffer.from("measurements: 880 x 2400\n"), {
        filename: "notes.txt",
      })
      .expect(415);
    expect(txt.body.error.message).toBe(
      "notes.txt was refused: its content is not a type Sitecue recognises. Sitecue accepts PDF, PNG, JPEG, WebP, DXF.",
    );
  });

  it("refuses a file over the limit with 413 and leaves no object behind, even after part of it was sent to the bucket", async () => {
    const before = await objectCount();
    const rows = await db.ds.manager.count(StoredFile);
    const big = samplePdf("Too big", MAX + 200_000);
    const res = await request(app)
      .post("/upload")
      .attach("file", big, { filename: "huge.pdf" })
      .expect(413);
    expect(res.body.error.code).toBe("file-too-large");
    expect(res.body.error.message).toBe(
      "huge.pdf is larger than the 6 MB limit.",
    );
    expect(await objectCount()).toBe(before);
    expect(await db.ds.manager.count(StoredFile)).toBe(rows);
  });

  it("removes the files already stored when a later part or a field is refused", async () => {
    const before = await objectCount();
    const mixed = await request(app)
      .post("/upload")
      .attach("file", samplePdf("first"), { filename: "first.pdf" })
      .attach("file", sampleElf(), { filename: "second.pdf" })
      .expect(415);
    expect(mixed.body.error.message).toMatch(/^second\.pdf is not a PDF/);
    const badField = await request(app)
      .post("/upload")
      .field("note", "x".repeat(40))
      .attach("file", await samplePng(30, 30), { filename: "ok.png" })
      .expect(400);
    expect(badField.body.error.fields.note).toBeDefined();
    expect(await objectCount()).toBe(before);
  });

  it("asks for a file when none is sent, and for multipart when JSON is sent", async () => {
    const none = await request(app)
      .post("/upload")
      .field("note", "hi")
      .expect(400);
    expect(none.body.error.code).toBe("file-missing");
    const json = await request(app)
      .post("/upload")
      .send({ note: "hi" })
      .expect(400);
    expect(json.body.error.message).toMatch(/multipart\/form-data/);
    const three = await request(app)
      .post("/upload")
      .attach("file", samplePdf("1"), { filename: "1.pdf" })
      .attach("file", samplePdf("2"), { filename: "2.pdf" })
      .attach("file", samplePdf("3"), { filename: "3.pdf" })
      .expect(400);
    expect(three.body.error.code).toBe("too-many-files");
  });

  it("refuses an image cut off part-way (an interrupted phone upload)", async () => {
    const jpeg = await sampleJpeg(400, 300);
    const damaged = jpeg.subarray(0, Math.floor(jpeg.length / 2));
    const res = await request(app)
      .post("/upload")
      .attach("file", damaged, { filename: "site.jpg" })
      .expect(415);
    expect(res.body.error.message).toMatch(
      /^site\.jpg could not be read as an image/,
    );
  });

  it("cleans names: no folders, no control characters, the sniffed extension", () => {
    expect(cleanFileName("C:\\Users\\x\\Plan\u0007 v2.PDF", "pdf")).toBe(
      "Plan v2.pdf",
    );
    expect(cleanFileName("", "png")).toBe("file.png");
  });
});
