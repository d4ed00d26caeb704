// Uploads that go wrong (issue 13, item 1): a body cut off mid-stream, a file over the limit, a
// malformed multipart body, a huge-dimension image. Each must be answered (or, when the client has
// gone, simply dropped) with nothing stored and the app still up. The app runs in its own process
// (tests/setup/app-process.ts) so that an unhandled stream error really ends it, as in production;
// in vitest's own process vitest would catch it.
import http from "node:http";
import net from "node:net";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import {
  demoAccounts,
  demoJobTitles,
} from "../../../tests/factories/demo-scenario";
import {
  startAppProcess,
  type AppProcess,
} from "../../../tests/setup/app-process";
import { signIn, type Session } from "../../../tests/setup/test-app";
import {
  hugeDimensionPng,
  noisyPng,
  samplePdf,
} from "../../../tests/setup/uploads";
import { Drawing } from "../drawings/drawings.entity";
import { Job } from "../jobs/jobs.entity";
import { Task } from "../programme/programme.entity";
import { ThreadMessage } from "../thread/thread.entity";
import { StoredFile } from "./files.entity";

/** The test app's upload limit: small, so an over-size image is quick to send. */
const LIMIT = 200_000;

let app: AppProcess;
let owner: Session;
let dev: Session; // a trade on the alcove job (Template coving is his task)
let rosa: Session; // the alcove job's customer
let jobId: string;
let devTaskId: string;

/** Starts the app process and signs the three people in. */
async function launch() {
  app = await startAppProcess({ uploadMaxBytes: LIMIT });
  const job = await app.ds.manager.findOneByOrFail(Job, {
    title: demoJobTitles.alcoves,
  });
  jobId = job.id;
  devTaskId = (
    await app.ds.manager.findOneByOrFail(Task, {
      jobId,
      name: "Template coving",
    })
  ).id;
  owner = await signIn(app.url, demoAccounts.owner.email);
  dev = await signIn(app.url, demoAccounts.trade.email);
  rosa = await signIn(app.url, demoAccounts.customer.email);
}
beforeAll(launch, 120_000);
// A test that took the app down (today's code did) must not fail the ones after it as well.
beforeEach(async () => {
  const up = await fetch(`${app.url}/api/health`)
    .then((r) => r.ok)
    .catch(() => false);
  if (up) return;
  await expect.poll(() => app.exited(), { timeout: 10_000 }).not.toBeNull();
  await app.close();
  await launch();
}, 120_000);
afterAll(async () => app?.close());

const BOUNDARY = "----sitecue-test-boundary-7d41";

type Part =
  | { name: string; value: string }
  | { name: string; filename: string; type: string; bytes: Buffer };

/** A multipart/form-data body (RFC 7578 §4), as a browser's FormData writes it. */
function multipart(parts: Part[], boundary = BOUNDARY): Buffer {
  const chunks: Buffer[] = [];
  for (const p of parts) {
    if ("filename" in p) {
      chunks.push(
        Buffer.from(
          `--${boundary}\r\nContent-Disposition: form-data; name="${p.name}"; filename="${p.filename}"\r\nContent-Type: ${p.type}\r\n\r\n`,
        ),
        p.bytes,
        Buffer.from("\r\n"),
      );
    } else {
      chunks.push(
        Buffer.from(
          `--${boundary}\r\nContent-Disposition: form-data; name="${p.name}"\r\n\r\n${p.value}\r\n`,
        ),
      );
    }
  }
  chunks.push(Buffer.from(`--${boundary}--\r\n`));
  return Buffer.concat(chunks);
}

const drawingParts = (file: Buffer, filename: string): Part[] => [
  { name: "title", value: "Coving template, left alcove" },
  { name: "kind", value: "site_photo" },
  { name: "taskIds", value: devTaskId },
  { name: "file", filename, type: "image/png", bytes: file },
];
const threadParts = (file: Buffer, filename: string): Part[] => [
  { name: "audience", value: "job" },
  { name: "text", value: "Here is the alcove as it is now" },
  { name: "file", filename, type: "image/png", bytes: file },
];

const headers = (who: Session, contentType: string, length: number) =>
  [
    `Host: ${new URL(app.url).host}`,
    `Cookie: ${who.cookie}`,
    `X-CSRF-Token: ${who.csrf}`,
    `Content-Type: ${contentType}`,
    `Content-Length: ${length}`,
  ].join("\r\n");

/**
 * Writes the request line, headers and the first `sendBytes` of `body` on a raw socket, waits
 * until the server has had time to start on them, then destroys the socket: a phone losing signal
 * part-way through an upload.
 */
async function cutOff(
  who: Session,
  path: string,
  body: Buffer,
  sendBytes: number,
) {
  const { port } = new URL(app.url);
  const socket = net.connect(Number(port), "127.0.0.1");
  socket.on("error", () => undefined); // the server may reset the connection; that is fine
  await new Promise<void>((r) => socket.once("connect", r));
  socket.write(
    `POST ${path} HTTP/1.1\r\n${headers(who, `multipart/form-data; boundary=${BOUNDARY}`, body.length)}\r\n\r\n`,
  );
  await new Promise<void>((r) =>
    socket.write(body.subarray(0, sendBytes), () => r()),
  );
  await new Promise((r) => setTimeout(r, 400));
  socket.destroy();
}

/** POSTs a hand-written body with the given Content-Type and reads the JSON answer. */
function rawPost(
  who: Session,
  path: string,
  contentType: string,
  body: Buffer,
): Promise<{
  status: number;
  body: { error?: { code: string; message: string } };
}> {
  return new Promise((resolve, reject) => {
    const req = http.request(
      `${app.url}${path}`,
      {
        method: "POST",
        headers: {
          Cookie: who.cookie,
          "X-CSRF-Token": who.csrf,
          "Content-Type": contentType,
          "Content-Length": body.length,
        },
      },
      (res) => {
        let text = "";
        res.on("data", (c: Buffer) => (text += c.toString()));
        res.on("end", () => {
          try {
            resolve({ status: res.statusCode!, body: JSON.parse(text) });
          } catch {
            reject(new Error(`Not JSON (${res.statusCode}): ${text}`));
          }
        });
      },
    );
    req.on("error", reject);
    req.end(body);
  });
}

/** What is stored now: rows that upload paths write, and every object in the bucket. */
async function stored() {
  const m = app.ds.manager;
  return {
    files: await m.count(StoredFile),
    drawings: await m.count(Drawing),
    messages: await m.count(ThreadMessage),
    objects: await app.bucketKeys(),
  };
}

/** The app process is still running and answering. */
async function stillUp() {
  const res = await fetch(`${app.url}/api/health`).catch(async (err) => {
    await new Promise((r) => setTimeout(r, 1_000)); // a dying process may still be exiting
    throw new Error(
      `/api/health did not answer (${err.cause?.code ?? err}); the app process: ${app.exited() ?? "still running"}\n${app.stderr()}`,
    );
  });
  expect(res.status).toBe(200);
  expect(((await res.json()) as { status: string }).status).toBe("ok");
}

/** Waits a moment for the server to finish with a request whose client has gone, then checks nothing changed. */
async function nothingStoredSince(before: Awaited<ReturnType<typeof stored>>) {
  await new Promise((r) => setTimeout(r, 800));
  await expect.poll(stored, { timeout: 10_000 }).toEqual(before);
}

const drawingsPath = () => `/api/jobs/${jobId}/drawings`;
const threadPath = () => `/api/jobs/${jobId}/thread/messages/upload`;

describe("an upload cut off mid-stream", () => {
  it("on a drawing (a trade's site photo): the app stays up and keeps nothing", async () => {
    const before = await stored();
    const body = multipart(
      drawingParts(await noisyPng(200, 200), "alcove.png"),
    );
    expect(body.length).toBeLessThan(LIMIT);
    await cutOff(dev, drawingsPath(), body, Math.floor(body.length / 2));
    await stillUp();
    await nothingStoredSince(before);
    await stillUp();
  });

  it("on a thread attachment (the customer's photo): the app stays up and keeps nothing", async () => {
    const before = await stored();
    const body = multipart(threadParts(await noisyPng(200, 200), "alcove.png"));
    await cutOff(rosa, threadPath(), body, Math.floor(body.length / 2));
    await stillUp();
    await nothingStoredSince(before);
    // And the same person can then send it whole.
    const ok = await rawPost(
      rosa,
      threadPath(),
      `multipart/form-data; boundary=${BOUNDARY}`,
      body,
    );
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    expect((await stored()).objects.length).toBe(before.objects.length + 2); // the photo and its thumbnail
  });
});

describe("an image over the upload limit", () => {
  it("is refused with 413 on a thread message, keeps nothing, and the app stays up", async () => {
    const png = await noisyPng(300, 300);
    expect(png.length).toBeGreaterThan(LIMIT);
    const before = await stored();
    const res = await rosa.agent
      .post(threadPath())
      .set("X-CSRF-Token", rosa.csrf)
      .field("audience", "job")
      .field("text", "The whole wall")
      .attach("file", png, "wall.png");
    expect(res.status, JSON.stringify(res.body)).toBe(413);
    expect(res.body.error).toEqual({
      code: "file-too-large",
      message: "wall.png is larger than the 0.2 MB limit.",
    });
    await stillUp();
    expect(await stored()).toEqual(before);
  });

  it("is refused with 413 on a drawing, keeps nothing, and the app stays up", async () => {
    const before = await stored();
    const res = await rawPost(
      dev,
      drawingsPath(),
      `multipart/form-data; boundary=${BOUNDARY}`,
      multipart(drawingParts(await noisyPng(300, 300), "wall.png")),
    );
    expect(res.status, JSON.stringify(res.body)).toBe(413);
    expect(res.body.error?.code).toBe("file-too-large");
    await stillUp();
    expect(await stored()).toEqual(before);
  });
});

describe("a malformed multipart body", () => {
  const pdfParts = () => drawingParts(samplePdf("Rev B"), "rev-b.pdf");

  it.each([
    {
      what: "a Content-Type with no boundary",
      contentType: "multipart/form-data",
      body: () => multipart(pdfParts()),
      code: "upload-malformed",
      message: /boundary/,
    },
    {
      what: "a body that uses another boundary than the header names",
      contentType: "multipart/form-data; boundary=not-the-one-used",
      body: () => multipart(pdfParts()),
      code: "upload-incomplete",
      message: /ended before/,
    },
    {
      what: "an empty body",
      contentType: `multipart/form-data; boundary=${BOUNDARY}`,
      body: () => Buffer.alloc(0),
      code: "upload-incomplete",
      message: /ended before/,
    },
    {
      what: "a body that ends before the closing boundary",
      contentType: `multipart/form-data; boundary=${BOUNDARY}`,
      body: () => {
        const whole = multipart(pdfParts());
        return whole.subarray(
          0,
          whole.length - `--${BOUNDARY}--\r\n`.length - 200,
        );
      },
      code: "upload-incomplete",
      message: /ended before/,
    },
    {
      what: "a raw CR LF inside a file name (HTML forms escape it as %0D%0A)",
      contentType: `multipart/form-data; boundary=${BOUNDARY}`,
      body: () => multipart(drawingParts(samplePdf("Rev B"), "rev\r\nb.pdf")),
      code: "upload-malformed",
      message: /headers/,
    },
  ])("$what → 400 with a clear message, nothing stored", async (c) => {
    const before = await stored();
    const res = await rawPost(owner, drawingsPath(), c.contentType, c.body());
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    expect(res.body.error?.code).toBe(c.code);
    expect(res.body.error?.message).toMatch(c.message);
    expect(await stored()).toEqual(before);
    await stillUp();
  });
});

describe("non-ASCII file names", () => {
  /** RFC 8187 §3.2.1: attr-char = ALPHA / DIGIT / "!" / "#" / "$" / "&" / "+" / "-" / "." / "^" / "_" / "`" / "|" / "~"; anything else is %-encoded UTF-8. */
  const EXT_VALUE = /^UTF-8''((?:[A-Za-z0-9!#$&+\-.^_`|~]|%[0-9A-F]{2})*)$/;

  it.each(["Küche – Rev B.pdf", "Mrs O'Neil's alcove (Rev B).pdf"])(
    "%s is read as UTF-8 (RFC 7578 §4.2) and sent back with filename* (RFC 6266 §4.3, RFC 8187)",
    async (name) => {
      const res = await owner.agent
        .post(drawingsPath())
        .set("X-CSRF-Token", owner.csrf)
        .field("title", "Elevation, kitchen")
        .field("kind", "drawing")
        .field("taskIds", devTaskId)
        .attach("file", samplePdf("Kitchen"), name); // form-data writes the name as raw UTF-8, as browsers do
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      const revision = res.body.revisions[0];
      expect(revision.file.name).toBe(name);
      expect(
        (
          await app.ds.manager.findOneByOrFail(StoredFile, {
            id: revision.file.id,
          })
        ).originalName,
      ).toBe(name);
      const down = await owner.agent.get(revision.downloadUrl).expect(200);
      const disposition = down.headers["content-disposition"] as string;
      const params = Object.fromEntries(
        disposition
          .split(/;\s*/)
          .slice(1)
          .map((p) => [
            p.slice(0, p.indexOf("=")),
            p.slice(p.indexOf("=") + 1),
          ]),
      );
      expect(disposition).toMatch(/^attachment;/);
      const ext = EXT_VALUE.exec(params["filename*"]);
      expect(ext, params["filename*"]).not.toBeNull();
      expect(decodeURIComponent(ext![1])).toBe(name);
      // The plain filename is the ASCII fallback for old clients: a quoted-string, no raw UTF-8.
      expect(params.filename).toMatch(/^"[\x20-\x7e]+"$/);
    },
  );
});

describe("an image too large in pixels", () => {
  it("a 20,000 × 20,000 px PNG is refused as too large in pixels, with the limit, and nothing is kept", async () => {
    const png = hugeDimensionPng(20_000, 20_000);
    expect(png.length).toBeLessThan(1_000);
    const before = await stored();
    const res = await rosa.agent
      .post(threadPath())
      .set("X-CSRF-Token", rosa.csrf)
      .field("audience", "job")
      .attach("file", png, "scan.png");
    expect(res.status, JSON.stringify(res.body)).toBe(413);
    expect(res.body.error).toEqual({
      code: "file-too-large",
      message:
        "scan.png is 20,000 × 20,000 pixels; Sitecue takes images of up to 100 megapixels (for example 10,000 × 10,000). Save it smaller and send it again.",
    });
    expect(await stored()).toEqual(before);
    await stillUp();
  });
});
