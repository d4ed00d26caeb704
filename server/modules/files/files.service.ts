import { createHash } from "node:crypto";
import path from "node:path";
import { finished, PassThrough, Transform, type Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import type { Request, Response } from "express";
import { fileTypeFromBuffer } from "file-type";
import multer, { MulterError } from "multer";
import sharp from "sharp";
import type { DataSource } from "typeorm";
import type { z } from "zod";
import { ALLOWED_UPLOAD_LABELS } from "../../../shared/schemas/files";
import { HttpError, notFound } from "../../http/errors";
import { parse } from "../../http/validate";
import type { Storage } from "../../infra/storage/storage";
import { newId } from "../../db/columns";
import { StoredFile } from "./files.entity";

export interface FilesDeps {
  ds: DataSource;
  storage: Storage;
  /** The largest file accepted, in bytes. */
  maxBytes: number;
}

/** Bytes read before deciding a file's type (file-type needs up to 4100 for some formats). */
const SNIFF_BYTES = 4100;
const THUMBNAIL_SIZE = 480;
/**
 * The most pixels Sitecue decodes from one image (sharp's `limitInputPixels`): a decompression
 * bomb (a few KB claiming 20,000 × 20,000) stops here. 100 megapixels is well beyond any phone
 * camera or scanned drawing.
 */
const MAX_IMAGE_PIXELS = 100_000_000;

/** The sniffed type → what Sitecue stores it as. */
const ACCEPTED: Record<string, { mimeType: string; extension: string }> = {
  "application/pdf": { mimeType: "application/pdf", extension: "pdf" },
  "image/png": { mimeType: "image/png", extension: "png" },
  "image/jpeg": { mimeType: "image/jpeg", extension: "jpg" },
  "image/webp": { mimeType: "image/webp", extension: "webp" },
};
const IMAGE_TYPES = new Set(["image/png", "image/jpeg", "image/webp"]);
/** Shown in the browser when asked; anything else is always a download. */
const INLINE_TYPES = new Set([...IMAGE_TYPES, "application/pdf"]);

/** What the claimed extension promises, for "plan.pdf is not a PDF" messages. */
const EXTENSION_LABEL: Record<string, string> = {
  pdf: "PDF",
  png: "PNG",
  jpg: "JPEG",
  jpeg: "JPEG",
  webp: "WebP",
  dxf: "DXF",
  svg: "SVG",
};

const megabytes = (n: number) =>
  `${Math.round((n / (1024 * 1024)) * 10) / 10} MB`;

/** A name safe to keep and to send back in Content-Disposition: no folders, no control characters. */
export function cleanFileName(raw: string, extension: string): string {
  const base = path
    .basename(raw.replace(/\\/g, "/"))
    .normalize("NFC")
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f"<>|:*?]/g, "")
    .trim();
  const stem = base.replace(/\.[^.]*$/, "").slice(0, 200) || "file";
  return `${stem}.${extension}`;
}

/**
 * DXF is text (or a binary variant with a fixed sentinel) that file-type does not detect. An ASCII
 * DXF opens with group code 0 and SECTION, optionally after 999 comment groups (AutoCAD DXF
 * reference, "DXF Format", from memory).
 */
function looksLikeDxf(head: Buffer): boolean {
  if (
    head.subarray(0, 22).toString("latin1") ===
    "AutoCAD Binary DXF\r\n\u001a\u0000"
  )
    return true;
  const text = head.toString("latin1");
  return /^(?:\s*999\r?\n[^\n]*\n)*\s*0\r?\n\s*SECTION\r?\n/.test(text);
}

const looksLikeSvg = (head: Buffer) =>
  /^\s*(?:<\?xml[^>]*>\s*)?(?:<!--[\s\S]*?-->\s*)*(?:<!DOCTYPE svg[^>]*>\s*)?<svg[\s>]/i.test(
    head.toString("utf8"),
  );

/** Decides the stored type from the first bytes; refuses with a message that says why. */
async function classify(
  head: Buffer,
  name: string,
): Promise<{ mimeType: string; extension: string }> {
  if (head.length === 0)
    throw new HttpError(400, "file-missing", `${name} is empty.`);
  const claimed = path.extname(name).slice(1).toLowerCase();
  const detected = await fileTypeFromBuffer(head);
  if (detected && ACCEPTED[detected.mime]) return ACCEPTED[detected.mime];
  if (!detected && looksLikeDxf(head))
    return { mimeType: "image/vnd.dxf", extension: "dxf" };
  const accepted = `Sitecue accepts ${ALLOWED_UPLOAD_LABELS}.`;
  // file-type reports SVG as generic XML (or not at all), so look for the <svg> root itself.
  if ((!detected || detected.ext === "xml") && looksLikeSvg(head))
    throw new HttpError(
      415,
      "file-type-refused",
      `${name} is an SVG image. SVG files can carry scripts, so Sitecue does not accept them: export it as PDF or PNG. ${accepted}`,
    );
  const what = detected
    ? `its content is ${detected.mime === "application/x-elf" ? "an ELF executable" : `a .${detected.ext} file`} (${detected.mime})`
    : "its content is not a type Sitecue recognises";
  const promised = EXTENSION_LABEL[claimed];
  throw new HttpError(
    415,
    "file-type-refused",
    promised
      ? `${name} is not a ${promised}: ${what}. ${accepted}`
      : `${name} was refused: ${what}. ${accepted}`,
  );
}

/** Reads at least `n` bytes (or to the end) from `stream`, then hands back those bytes and the stream paused. */
function peek(
  stream: Readable,
  n: number,
): Promise<{ head: Buffer; ended: boolean }> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let length = 0;
    const finish = (ended: boolean) => {
      stream.off("data", onData);
      stream.off("end", onEnd);
      stream.off("error", onError);
      resolve({ head: Buffer.concat(chunks), ended });
    };
    const onData = (c: Buffer) => {
      chunks.push(c);
      length += c.length;
      if (length >= n) {
        stream.pause();
        finish(false);
      }
    };
    const onEnd = () => finish(true);
    const onError = (err: Error) => {
      stream.off("data", onData);
      stream.off("end", onEnd);
      reject(err);
    };
    stream.on("data", onData);
    stream.once("end", onEnd);
    stream.once("error", onError);
  });
}

interface Received {
  storageKey: string;
  thumbnailKey: string | null;
  mimeType: string;
  extension: string;
  sizeBytes: number;
  sha256: string;
  width: number | null;
  height: number | null;
  cleanName: string;
}
type ReceivedFile = Express.Multer.File & Partial<Received>;

/**
 * A multer storage engine that streams each part straight to the bucket: the first bytes decide
 * the type (refused before anything is stored), then the rest flows through a hash and a byte
 * count into S3, and for images into sharp for the thumbnail. Nothing is held whole in memory
 * except an image being thumbnailed (bounded by the size limit).
 */
class BucketEngine implements multer.StorageEngine {
  constructor(
    private readonly storage: Storage,
    private readonly workshopId: string,
    private readonly maxBytes: number,
  ) {}

  _handleFile(
    _req: Request,
    file: Express.Multer.File,
    cb: (error?: unknown, info?: Partial<Express.Multer.File>) => void,
  ): void {
    this.store(file).then(
      // multer merges these into req.files[i]; ReceivedFile reads them back.
      (info) => cb(null, info as Partial<Express.Multer.File>),
      (err) => {
        file.stream.resume(); // let busboy finish reading the request
        cb(err);
      },
    );
  }

  _removeFile(
    _req: Request,
    file: ReceivedFile,
    cb: (error: Error | null) => void,
  ): void {
    removeObjects(this.storage, [file.storageKey, file.thumbnailKey]).then(
      () => cb(null),
      (err) => cb(err),
    );
  }

  /** The name of the file being received, for multer's own size refusal. */
  current = "The file";

  /** Every object key this request has put in the bucket, so a refusal can remove them all. */
  readonly keys = new Set<string>();
  /** The files still being received; a refusal waits for them before cleaning up. */
  private readonly pending = new Set<Promise<unknown>>();
  /** Errors this engine refused with (storage failures among them), as opposed to busboy's. */
  private readonly thrown = new WeakSet<object>();

  /** Resolves once no file of this request is still being received or stored. */
  async settled(): Promise<void> {
    while (this.pending.size) await Promise.allSettled([...this.pending]);
  }

  /** Whether `err` came from this engine rather than from reading the multipart body. */
  threw(err: unknown): boolean {
    return typeof err === "object" && err !== null && this.thrown.has(err);
  }

  private store(file: Express.Multer.File): Promise<Received> {
    const p = this.receive(file);
    this.pending.add(p);
    void p.then(
      () => this.pending.delete(p),
      (err: unknown) => {
        if (typeof err === "object" && err !== null) this.thrown.add(err);
        this.pending.delete(p);
      },
    );
    return p;
  }

  private async receive(file: Express.Multer.File): Promise<Received> {
    const name = file.originalname || "The file";
    this.current = name;
    const source = file.stream;
    const { head, ended } = await peek(source, SNIFF_BYTES).catch((err) => {
      throw unreadableUpload(err);
    });
    const type = await classify(head, name);
    const storageKey = `workshops/${this.workshopId}/${newId()}.${type.extension}`;
    const image = IMAGE_TYPES.has(type.mimeType);
    const hash = createHash("sha256");
    // An image is kept whole for sharp (bounded by the size limit); sharp buffers a streamed
    // input whole anyway, and a buffer input has no stream left to emit an error.
    const imageChunks: Buffer[] = [];
    let size = 0;
    const maxBytes = this.maxBytes;
    const counter = new Transform({
      transform(chunk: Buffer, _enc, done) {
        size += chunk.length;
        if (size > maxBytes)
          return done(
            new HttpError(413, "file-too-large", tooLarge(file, maxBytes)),
          );
        hash.update(chunk);
        if (image) imageChunks.push(chunk);
        done(null, chunk);
      },
    });
    const toBucket = new PassThrough();
    // stream.pipeline wires both streams' errors: a refusal in the counter destroys the body
    // lib-storage reads (which aborts its multipart upload), and the other way round.
    const piped = pipeline(counter, toBucket);
    this.keys.add(storageKey);
    const uploaded = this.storage.put(storageKey, toBucket, type.mimeType);
    // A failed bucket upload stops reading: end the pipeline too, or the request would stall.
    uploaded.catch((err: Error) => {
      if (!toBucket.writableFinished) toBucket.destroy(err);
    });
    // Its errors reach us through `piped` and `uploaded`; after the pipeline has finished nothing
    // else listens, and an 'error' with no listener would end the process.
    toBucket.on("error", () => undefined);
    // The part's stream belongs to busboy and is never destroyed here (busboy would wait on it
    // for ever); its failure — the request cut off, a damaged body — stops the pipeline instead.
    const stopWatching = finished(source, { writable: false }, (err) => {
      if (err) counter.destroy(unreadableUpload(err));
    });
    counter.write(head);
    if (ended) counter.end();
    else if (!counter.destroyed) source.pipe(counter);
    try {
      await Promise.all([piped, uploaded]);
    } catch (err) {
      // Let busboy read on to the end of the request, so the refusal can be answered.
      source.unpipe(counter);
      source.resume();
      await Promise.allSettled([piped, uploaded]);
      await removeObjects(this.storage, [storageKey]);
      throw err instanceof HttpError ? err : (counter.errored ?? err);
    } finally {
      stopWatching();
    }
    let thumbnail: Thumbnail | null = null;
    const thumbnailKey = image ? `${storageKey}.thumb.webp` : null;
    if (thumbnailKey) {
      this.keys.add(thumbnailKey);
      try {
        thumbnail = await makeThumbnail(Buffer.concat(imageChunks, size), name);
        await this.storage.put(
          thumbnailKey,
          bufferStream(thumbnail.webp),
          "image/webp",
        );
      } catch (err) {
        await removeObjects(this.storage, [storageKey, thumbnailKey]);
        throw err;
      }
    }
    return {
      storageKey,
      thumbnailKey,
      mimeType: type.mimeType,
      extension: type.extension,
      sizeBytes: size,
      sha256: hash.digest("hex"),
      width: thumbnail?.width ?? null,
      height: thumbnail?.height ?? null,
      cleanName: cleanFileName(file.originalname, type.extension),
    };
  }
}

interface Thumbnail {
  webp: Buffer;
  width: number | null;
  height: number | null;
}

const damagedImage = (name: string) =>
  new HttpError(
    415,
    "file-type-refused",
    `${name} could not be read as an image; it may be damaged. Sitecue accepts ${ALLOWED_UPLOAD_LABELS}.`,
  );

const thousands = (n: number) => n.toLocaleString("en-GB");

/** Reads an image's size and makes its 480 px WebP thumbnail; refuses one too large in pixels or damaged. */
async function makeThumbnail(input: Buffer, name: string): Promise<Thumbnail> {
  // The header alone gives the dimensions, so a decompression bomb is refused, in pixels, before
  // anything is decoded (sharp's own limit below would only say "exceeds pixel limit").
  const meta = await sharp(input, { limitInputPixels: false })
    .metadata()
    .catch(() => {
      throw damagedImage(name);
    });
  const width = meta.autoOrient?.width ?? meta.width ?? null;
  const height = meta.autoOrient?.height ?? meta.height ?? null;
  if (width && height && width * height > MAX_IMAGE_PIXELS) {
    const side = thousands(Math.floor(Math.sqrt(MAX_IMAGE_PIXELS)));
    throw new HttpError(
      413,
      "file-too-large",
      `${name} is ${thousands(width)} × ${thousands(height)} pixels; Sitecue takes images of up to ${MAX_IMAGE_PIXELS / 1_000_000} megapixels (for example ${side} × ${side}). Save it smaller and send it again.`,
    );
  }
  // "truncated" refuses a cut-off image (an interrupted phone upload) but not the harmless
  // warnings some cameras' JPEGs raise.
  const webp = await sharp(input, {
    failOn: "truncated",
    limitInputPixels: MAX_IMAGE_PIXELS,
  })
    .rotate()
    .resize(THUMBNAIL_SIZE, THUMBNAIL_SIZE, {
      fit: "inside",
      withoutEnlargement: true,
    })
    .webp({ quality: 80 })
    .toBuffer()
    .catch(() => {
      throw damagedImage(name);
    });
  return { webp, width, height };
}

/**
 * A multipart body busboy could not read, in Sitecue's words: 400, never a 500 (the client sent
 * it). Busboy's errors carry only a message, so that is what tells them apart.
 */
function unreadableUpload(err: unknown): HttpError {
  if (err instanceof HttpError) return err;
  const message = (err as Error | undefined)?.message ?? "";
  if (
    /^(Unexpected end of (form|file)|Request (aborted|closed))$/.test(
      message,
    ) ||
    (err as { code?: string }).code === "ERR_STREAM_PREMATURE_CLOSE"
  )
    return new HttpError(
      400,
      "upload-incomplete",
      "The upload ended before the whole form arrived (the connection may have dropped). Nothing was kept: please send it again.",
    );
  if (/boundary/i.test(message))
    return new HttpError(
      400,
      "upload-malformed",
      "The upload could not be read: its Content-Type names no multipart boundary. Send it as multipart/form-data, as a browser form does.",
    );
  if (/part header/i.test(message))
    return new HttpError(
      400,
      "upload-malformed",
      "The upload could not be read: the headers of one of its parts are malformed (a file name with a line break in it, for example).",
    );
  return new HttpError(
    400,
    "upload-malformed",
    "The upload could not be read as multipart/form-data.",
  );
}

const bufferStream = (b: Buffer) => {
  const s = new PassThrough();
  s.end(b);
  return s;
};

const tooLarge = (file: { originalname: string }, maxBytes: number) =>
  `${file.originalname || "The file"} is larger than the ${megabytes(maxBytes)} limit.`;

async function removeObjects(
  storage: Storage,
  keys: (string | null | undefined)[],
) {
  for (const key of keys)
    if (key) await storage.delete(key).catch(() => undefined);
}

/** multer's and busboy's refusals, in Sitecue's words; the engine's own errors pass through. */
function uploadError(
  err: unknown,
  engine: BucketEngine,
  maxBytes: number,
  maxFiles: number,
): unknown {
  if (err instanceof HttpError || engine.threw(err)) return err;
  // Anything else multer passes on comes from reading the body (busboy, the request itself).
  if (!(err instanceof MulterError)) return unreadableUpload(err);
  switch (err.code) {
    case "LIMIT_FILE_SIZE":
      return new HttpError(
        413,
        "file-too-large",
        tooLarge({ originalname: engine.current }, maxBytes),
      );
    case "LIMIT_FILE_COUNT":
    case "LIMIT_UNEXPECTED_FILE":
      return new HttpError(
        400,
        "too-many-files",
        err.code === "LIMIT_FILE_COUNT" || err.field === "file"
          ? `Send at most ${maxFiles} file${maxFiles === 1 ? "" : "s"} at once.`
          : `Files go in the "file" field, not "${err.field}".`,
      );
    default:
      return new HttpError(
        400,
        "validation",
        `The upload was refused: ${err.message}.`,
      );
  }
}

/**
 * Receives the request's multipart files (field "file") into the bucket and its text fields,
 * parsed with `fields`. Call it after the permission check. Any refusal removes every object
 * stored for this request, so nothing half-stored is left behind.
 */
export async function receiveUploads<F extends z.ZodType>(
  deps: FilesDeps,
  req: Request,
  res: Response,
  opts: {
    workshopId: string;
    userId: string;
    fields: F;
    maxFiles?: number;
    required?: boolean;
  },
): Promise<{ files: StoredFile[]; fields: z.output<F> }> {
  const maxFiles = opts.maxFiles ?? 1;
  if (!req.is("multipart/form-data"))
    throw new HttpError(
      400,
      "file-missing",
      'Send the file as multipart/form-data in the "file" field.',
    );
  const engine = new BucketEngine(deps.storage, opts.workshopId, deps.maxBytes);
  const upload = multer({
    storage: engine,
    // RFC 7578 §4.2: a file name is sent as UTF-8 (what browsers do); busboy's default is latin1.
    defParamCharset: "utf8",
    limits: {
      fileSize: deps.maxBytes,
      files: maxFiles,
      fields: 50,
      fieldSize: 64 * 1024,
      parts: maxFiles + 50,
    },
  }).array("file", maxFiles);
  // Every object put for this request, removed on any refusal. multer answers an aborted request
  // at once, while a file may still be on its way to the bucket: wait for the engine first.
  const cleanUp = async () => {
    await engine.settled();
    await removeObjects(deps.storage, [...engine.keys]);
  };
  try {
    await new Promise<void>((resolve, reject) =>
      upload(req, res, (err?: unknown) =>
        err
          ? reject(uploadError(err, engine, deps.maxBytes, maxFiles))
          : resolve(),
      ),
    );
  } catch (err) {
    await cleanUp();
    throw err;
  }
  const received = ((req.files as ReceivedFile[] | undefined) ?? []).filter(
    (f): f is ReceivedFile & Received => !!f.storageKey,
  );
  try {
    if ((opts.required ?? true) && received.length === 0)
      throw new HttpError(
        400,
        "file-missing",
        'Choose a file to upload (the "file" field was empty).',
      );
    const fields = parse(opts.fields, req, "body");
    const rows = received.map((f) =>
      deps.ds.manager.create(StoredFile, {
        id: newId(),
        workshopId: opts.workshopId,
        storageKey: f.storageKey,
        originalName: f.cleanName,
        mimeType: f.mimeType,
        extension: f.extension,
        sizeBytes: f.sizeBytes,
        sha256: f.sha256,
        width: f.width,
        height: f.height,
        thumbnailKey: f.thumbnailKey,
        uploadedByUserId: opts.userId,
      }),
    );
    if (rows.length) await deps.ds.manager.save(StoredFile, rows);
    return { files: rows, fields };
  } catch (err) {
    await cleanUp();
    throw err;
  }
}

/**
 * RFC 8187 §3.2.1 ext-value: UTF-8, every byte outside attr-char %-encoded. encodeURIComponent
 * leaves ' ( ) * unencoded, which are not attr-char (the ' would end the language tag).
 */
const extValue = (name: string) =>
  `UTF-8''${encodeURIComponent(name).replace(
    /['()*]/g,
    (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`,
  )}`;

/** RFC 6266 Content-Disposition with an ASCII fallback and the UTF-8 name (RFC 6266 §4.3, RFC 8187). */
export function contentDisposition(
  kind: "inline" | "attachment",
  name: string,
) {
  const ascii = name.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `${kind}; filename="${ascii}"; filename*=${extValue(name)}`;
}

/** Streams a stored file to the response; call it after the permission check. */
export async function sendStoredFile(
  deps: FilesDeps,
  res: Response,
  file: StoredFile,
  opts: { variant?: "original" | "thumbnail"; inline?: boolean } = {},
): Promise<void> {
  const thumbnail = opts.variant === "thumbnail";
  if (thumbnail && !file.thumbnailKey) throw notFound("A preview of that file");
  const key = thumbnail ? file.thumbnailKey! : file.storageKey;
  let object: Awaited<ReturnType<Storage["get"]>>;
  try {
    object = await deps.storage.get(key);
  } catch (err) {
    if ((err as { name?: string }).name === "NoSuchKey")
      throw notFound("That file");
    throw err;
  }
  const type = thumbnail ? "image/webp" : file.mimeType;
  const inline = thumbnail || (opts.inline === true && INLINE_TYPES.has(type));
  const name = thumbnail
    ? file.originalName.replace(/\.[^.]+$/, "") + "-preview.webp"
    : file.originalName;
  res.status(200);
  res.setHeader("Content-Type", type);
  if (object.length !== undefined)
    res.setHeader("Content-Length", String(object.length));
  res.setHeader(
    "Content-Disposition",
    contentDisposition(inline ? "inline" : "attachment", name),
  );
  res.setHeader("X-Content-Type-Options", "nosniff");
  res.setHeader("Cache-Control", "private, max-age=300");
  await new Promise<void>((resolve, reject) => {
    object.body.once("error", reject);
    res.once("close", resolve);
    object.body.pipe(res);
  });
}

/** Removes stored files: their objects first, then their rows. */
export async function deleteStoredFiles(
  deps: FilesDeps,
  files: StoredFile[],
): Promise<void> {
  if (!files.length) return;
  await removeObjects(
    deps.storage,
    files.flatMap((f) => [f.storageKey, f.thumbnailKey]),
  );
  await deps.ds.manager.delete(
    StoredFile,
    files.map((f) => f.id),
  );
}
