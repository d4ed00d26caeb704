// Drawings, templates and site photos end to end (issue 7): real MariaDB, a real S3 protocol
// (s3rver) and real SMTP (the fake), through the HTTP API only.
import { createHash } from "node:crypto";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import sharp from "sharp";
import { In } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Response } from "superagent";
import {
  drawingDetailSchema,
  jobDrawingsResponseSchema,
  type CaughtMail,
  type DrawingDetail,
  type ProgrammeResponse,
} from "../../../shared/schemas";
import { buildUser, linkTradeUser } from "../../../tests/factories/builders";
import {
  DEMO_DRAWING_TITLE,
  loadDemoDrawings,
} from "../../../tests/factories/demo-drawings";
import {
  demoAccounts,
  demoJobTitles,
} from "../../../tests/factories/demo-scenario";
import {
  signIn,
  startTestApp,
  type Session,
  type TestApp,
} from "../../../tests/setup/test-app";
import {
  sampleDxf,
  sampleElf,
  sampleJpeg,
  samplePdf,
  samplePng,
  sampleSvg,
} from "../../../tests/setup/uploads";
import { Customer } from "../customers/customers.entity";
import { StoredFile } from "../files/files.entity";
import { Job } from "../jobs/jobs.entity";
import { OutboxMessage } from "../../infra/outbox/outbox.entity";
import { Task } from "../programme/programme.entity";
import { Trade } from "../trades/trades.entity";
import { Drawing, DrawingRevision } from "./drawings.entity";

let t: TestApp;
let alcoves: Job;
let wardrobe: Job;
const tasks: Record<string, Task> = {};
const s: Record<
  "owner" | "fitter" | "dev" | "sam" | "nell" | "ola" | "rosa" | "tom",
  Session
> = {} as never;
const emails = {
  owner: demoAccounts.owner.email,
  fitter: demoAccounts.fitter.email,
  dev: demoAccounts.trade.email, // Ashby Plaster & Coving: template (sent) and coving (confirmed)
  sam: "sam@brightwire.example.test", // Brightwire Electrical: first and second fix
  nell: "nell@kestreldecorating.example.test", // Kestrel Decorating: painting
  ola: "ola@tarnfloors.example.test", // Tarn Floors: on the wardrobe job only
  rosa: demoAccounts.customer.email, // the alcove job's customer
  tom: "tom.fennimore@example.test", // the wardrobe job's customer
};

beforeAll(async () => {
  t = await startTestApp({ demo: true });
  const m = t.db.ds.manager;
  alcoves = await m.findOneByOrFail(Job, { title: demoJobTitles.alcoves });
  wardrobe = await m.findOneByOrFail(Job, { title: demoJobTitles.wardrobe });
  for (const task of await m.findBy(Task, { jobId: alcoves.id }))
    tasks[task.name] = task;
  // Accounts for the trades that have none in the demo, and for the other customer.
  for (const [key, business] of [
    ["sam", "Brightwire Electrical"],
    ["nell", "Kestrel Decorating"],
    ["ola", "Tarn Floors"],
  ] as const) {
    const trade = await m.findOneByOrFail(Trade, {
      businessName: business,
      workshopId: alcoves.workshopId,
    });
    await linkTradeUser(m, trade, await buildUser(m, { email: emails[key] }));
  }
  const tom = await buildUser(m, { email: emails.tom, name: "Tom Fennimore" });
  await m.update(Customer, { email: emails.tom }, { userId: tom.id });
  for (const key of Object.keys(emails) as (keyof typeof emails)[])
    s[key] = await signIn(t, emails[key]);
}, 120_000);
afterAll(async () => t?.close());

/** Collects a binary response body as a Buffer (supertest would otherwise try to parse it). */
const binary = (
  res: Response,
  cb: (err: Error | null, body: Buffer) => void,
) => {
  const chunks: Buffer[] = [];
  res.on("data", (c: Buffer) => chunks.push(c));
  res.on("end", () => cb(null, Buffer.concat(chunks)));
};
const sha256 = (b: Buffer) => createHash("sha256").update(b).digest("hex");

/** Every object key in the test bucket, read over the S3 protocol. */
async function bucketKeys(app: TestApp = t): Promise<string[]> {
  const client = new S3Client({
    endpoint: app.s3.endpoint,
    region: "eu-west-2",
    forcePathStyle: true,
    credentials: { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" },
  });
  try {
    const out = await client.send(
      new ListObjectsV2Command({ Bucket: app.s3.bucket }),
    );
    return (out.Contents ?? []).map((o) => o.Key!).sort();
  } finally {
    client.destroy();
  }
}
const storedCount = (app: TestApp = t) => app.db.ds.manager.count(StoredFile);

interface Upload {
  title?: string;
  kind?: string;
  note?: string;
  taskIds?: string[];
  shareTradeKinds?: string[];
  shareTradeIds?: string[];
  shareWithCustomer?: boolean;
  /** `claimedType`: the Content-Type the client sends for the part (the server must not trust it). */
  file?: { bytes: Buffer; name: string; claimedType?: string };
}

/** POST /jobs/:jobId/drawings as multipart, the way the browser's FormData sends it. */
function upload(who: Session, jobId: string, u: Upload) {
  let req = who.agent
    .post(`/api/jobs/${jobId}/drawings`)
    .set("X-CSRF-Token", who.csrf);
  if (u.title !== undefined) req = req.field("title", u.title);
  if (u.kind !== undefined) req = req.field("kind", u.kind);
  if (u.note !== undefined) req = req.field("note", u.note);
  // Tasks as one comma-separated field; trade kinds repeated: the schema takes both forms.
  if (u.taskIds) req = req.field("taskIds", u.taskIds.join(","));
  for (const k of u.shareTradeKinds ?? [])
    req = req.field("shareTradeKinds", k);
  for (const id of u.shareTradeIds ?? []) req = req.field("shareTradeIds", id);
  if (u.shareWithCustomer) req = req.field("shareWithCustomer", "true");
  if (u.file)
    req = req.attach("file", u.file.bytes, {
      filename: u.file.name,
      ...(u.file.claimedType ? { contentType: u.file.claimedType } : {}),
    });
  return req;
}

function revise(
  who: Session,
  drawingId: string,
  note: string,
  file: Upload["file"],
) {
  let req = who.agent
    .post(`/api/drawings/${drawingId}/revisions`)
    .set("X-CSRF-Token", who.csrf)
    .field("note", note);
  if (file) req = req.attach("file", file.bytes, file.name);
  return req;
}

const fetchFile = (who: Session, path: string) =>
  who.agent.get(path).buffer(true).parse(binary);

const trade = (name: string) =>
  t.db.ds.manager.findOneByOrFail(Trade, {
    businessName: name,
    workshopId: alcoves.workshopId,
  });

/** Messages caught so far whose subject contains `subject`, by recipient. */
const recipientsOf = (subject: string) =>
  t.mail
    .messages()
    .filter((m) => m.subject.includes(subject))
    .flatMap((m) => m.to)
    .sort();

/** Waits until the outbox has sent everything queued so far. */
async function outboxDrained(): Promise<void> {
  for (let i = 0; i < 200; i++) {
    const left = await t.db.ds.manager.count(OutboxMessage, {
      where: [{ state: "pending" }, { state: "sending" }],
    });
    if (left === 0) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("the outbox did not drain");
}

let elevation: DrawingDetail;
let pdfBytes: Buffer;

describe("upload, download and revisions", () => {
  it("stores a PDF in S3 and sends back the same bytes, with a sniffed type and safe headers", async () => {
    pdfBytes = samplePdf("Elevation, alcoves");
    const before = await bucketKeys();
    const res = await upload(s.owner, alcoves.id, {
      title: "Elevation, alcoves",
      kind: "drawing",
      note: "As surveyed",
      taskIds: [
        tasks["Template coving"].id,
        tasks["Fit coving & make good"].id,
        tasks["Electrician second fix"].id,
      ],
      shareTradeKinds: ["plasterer", "electrician"],
      shareWithCustomer: true,
      // The part claims to be plain text, wrongly: the server goes by the content.
      file: {
        bytes: pdfBytes,
        name: "elevation.pdf",
        claimedType: "text/plain",
      },
    }).expect(201);
    elevation = drawingDetailSchema.parse(res.body);
    expect(elevation.currentRevision).toBe("A");
    expect(elevation.revisions.map((r) => r.letter)).toEqual(["A"]);
    const revA = elevation.revisions[0];
    expect(revA.note).toBe("As surveyed");
    expect(revA.uploadedBy).toEqual({
      name: demoAccounts.owner.name,
      role: "workshop",
      tradeName: null,
    });
    expect(revA.file).toMatchObject({
      name: "elevation.pdf",
      mimeType: "application/pdf",
      sizeBytes: pdfBytes.length,
      hasThumbnail: false,
    });
    expect(elevation.sharing).toEqual({
      tradeKinds: ["plasterer", "electrician"],
      trades: [],
      customer: true,
    });

    // The object in the bucket, read over S3 directly: byte for byte what was sent.
    const row = await t.db.ds.manager.findOneByOrFail(StoredFile, {
      id: revA.file.id,
    });
    expect(row.sha256).toBe(sha256(pdfBytes));
    expect((await bucketKeys()).filter((k) => !before.includes(k))).toEqual([
      row.storageKey,
    ]);
    const object = await t.storage.get(row.storageKey);
    const chunks: Buffer[] = [];
    for await (const c of object.body) chunks.push(c as Buffer);
    expect(Buffer.concat(chunks).equals(pdfBytes)).toBe(true);

    // Through the API: a download by default (RFC 6266 attachment), never sniffed by the browser.
    const dl = await fetchFile(s.owner, revA.downloadUrl).expect(200);
    expect(Buffer.isBuffer(dl.body) && dl.body.equals(pdfBytes)).toBe(true);
    expect(sha256(dl.body)).toBe(row.sha256);
    expect(dl.headers["content-type"]).toBe("application/pdf");
    expect(dl.headers["content-disposition"]).toMatch(
      /^attachment; filename="elevation\.pdf"/,
    );
    expect(dl.headers["x-content-type-options"]).toBe("nosniff");
    // Its own caching, not the API's no-store (RFC 9111 §5.2.2.7 private).
    expect(dl.headers["cache-control"]).toBe("private, max-age=300");
    // ?inline=1 previews a PDF in the browser.
    expect(revA.previewUrl).toBe(`${revA.downloadUrl}?inline=1`);
    const inline = await fetchFile(s.owner, revA.previewUrl!).expect(200);
    expect(inline.headers["content-disposition"]).toMatch(/^inline;/);
    expect(inline.body.equals(pdfBytes)).toBe(true);
    // No thumbnail for a PDF.
    expect(revA.thumbnailUrl).toBeNull();
    await s.owner.agent
      .get(`/api/drawings/${elevation.id}/revisions/A/thumbnail`)
      .expect(404);
  });

  it("keeps a DXF as a download even when a preview is asked for", async () => {
    const dxf = sampleDxf();
    const res = await upload(s.fitter, alcoves.id, {
      title: "Plinth outline",
      kind: "drawing",
      taskIds: [tasks["Fix carcasses & scribes"].id],
      file: { bytes: dxf, name: "plinth.dxf" },
    }).expect(201);
    const rev = drawingDetailSchema.parse(res.body).revisions[0];
    expect(rev.file.mimeType).toBe("image/vnd.dxf");
    expect(rev.previewUrl).toBeNull();
    const dl = await fetchFile(s.fitter, `${rev.downloadUrl}?inline=1`).expect(
      200,
    );
    expect(dl.body.equals(dxf)).toBe(true);
    expect(dl.headers["content-disposition"]).toMatch(
      /^attachment; filename="plinth\.dxf"/,
    );
    expect(dl.headers["x-content-type-options"]).toBe("nosniff");
  });

  it("makes a new upload Rev B, keeps Rev A downloadable, and tells only the people it is shared with", async () => {
    const png = await samplePng(1200, 800);
    const res = await revise(
      s.owner,
      elevation.id,
      "Left alcove 12 mm narrower at the top",
      { bytes: png, name: "elevation-b.png" },
    ).expect(201);
    const d = drawingDetailSchema.parse(res.body);
    expect(d.currentRevision).toBe("B");
    expect(d.revisions.map((r) => r.letter)).toEqual(["B", "A"]);
    expect(d.revisions[0].note).toBe("Left alcove 12 mm narrower at the top");
    expect(d.revisions[0].file).toMatchObject({
      mimeType: "image/png",
      width: 1200,
      height: 800,
      hasThumbnail: true,
    });

    // Rev A is still there, byte for byte.
    const a = await fetchFile(s.dev, d.revisions[1].downloadUrl).expect(200);
    expect(a.body.equals(pdfBytes)).toBe(true);
    const b = await fetchFile(s.dev, d.revisions[0].downloadUrl).expect(200);
    expect(b.body.equals(png)).toBe(true);
    expect(b.headers["content-type"]).toBe("image/png");
    // The server's thumbnail: WebP, within 480 × 480, read back by sharp.
    const thumb = await fetchFile(s.dev, d.revisions[0].thumbnailUrl!).expect(
      200,
    );
    expect(thumb.headers["content-type"]).toBe("image/webp");
    const meta = await sharp(thumb.body).metadata();
    expect(meta.format).toBe("webp");
    expect(meta.width).toBe(480);
    expect(meta.height).toBe(320);

    // Shared with plasterers, electricians and the customer: Dev, Sam and Rosa hear of it.
    const subject = "Elevation, alcoves is now Rev B";
    const expectedTo = [emails.dev, emails.rosa, emails.sam].sort();
    for (const to of expectedTo)
      await t.mail.waitFor(
        (m: CaughtMail) => m.to.includes(to) && m.subject.includes(subject),
        15000,
      );
    await outboxDrained();
    // Nobody else: not the uploader, not the fitter, not the decorator, not the trade off the job.
    expect(recipientsOf(subject)).toEqual(expectedTo);
    const toDev = t.mail
      .messages()
      .find((m) => m.to.includes(emails.dev) && m.subject.includes(subject))!;
    expect(toDev.text).toContain("Left alcove 12 mm narrower at the top");
    expect(toDev.links).toContain(
      `http://localhost/jobs/${alcoves.id}/drawings/${elevation.id}`,
    );
    elevation = d;
  });

  it("shows each linked task with the programme engine's own dates and readiness", async () => {
    const programme: ProgrammeResponse = (
      await s.owner.agent.get(`/api/jobs/${alcoves.id}/programme`).expect(200)
    ).body;
    const engine = new Map(programme.result.tasks.map((r) => [r.id, r]));
    const names = new Map(programme.tasks.map((x) => [x.id, x.name]));
    const d = drawingDetailSchema.parse(
      (await s.owner.agent.get(`/api/drawings/${elevation.id}`).expect(200))
        .body,
    );
    expect(d.tasks.map((x) => x.name).sort()).toEqual(
      [
        "Electrician second fix",
        "Fit coving & make good",
        "Template coving",
      ].sort(),
    );
    for (const task of d.tasks) {
      const r = engine.get(task.id)!;
      expect(task.plannedStart).toBe(r.plannedStart);
      expect(task.plannedFinish).toBe(r.plannedFinish);
      expect(task.readiness.state).toBe(r.readiness.state);
      expect(task.readiness.clearFrom).toBe(
        r.readiness.state === "clear" ? r.plannedStart : null,
      );
      expect(task.readiness.waitingOn).toEqual(
        r.readiness.waitingOn.map((w) => ({
          taskId: w.task,
          name: names.get(w.task),
          plannedFinish: engine.get(w.task)!.plannedFinish,
          allowsFrom: w.allowsFrom,
        })),
      );
    }
    // In the demo the carcasses are being fixed, so the coving template waits on them.
    const template = d.tasks.find((x) => x.name === "Template coving")!;
    expect(template.readiness.state).toBe("waiting");
    expect(template.readiness.waitingOn.map((w) => w.name)).toEqual([
      "Fix carcasses & scribes",
    ]);
    // The workshop sees who is booked for each task.
    expect(
      d.tasks.find((x) => x.name === "Electrician second fix")!.booking,
    ).toMatchObject({ tradeName: "Brightwire Electrical", state: "sent" });
  });

  it("shows a trade their own bookings on the linked tasks, not another trade's, and no contact details", async () => {
    const res = await s.dev.agent
      .get(`/api/drawings/${elevation.id}`)
      .expect(200);
    const d = drawingDetailSchema.parse(res.body);
    const by = (n: string) => d.tasks.find((x) => x.name === n)!;
    expect(by("Template coving").booking).toMatchObject({
      tradeName: "Ashby Plaster & Coving",
      state: "sent",
    });
    expect(by("Fit coving & make good").booking).toMatchObject({
      state: "confirmed",
    });
    expect(by("Electrician second fix").booking).toBeNull();
    expect(d.sharing).toBeNull();
    expect(d.can).toEqual({ edit: false, addRevision: false, delete: false });
    const raw = JSON.stringify(res.body);
    for (const secret of [emails.sam, "01632 960 388", "01632 960 114"])
      expect(raw).not.toContain(secret);
  });

  it("refuses a 27th revision: Rev Z is the last, and nothing is stored", async () => {
    const m = t.db.ds.manager;
    const res = await upload(s.owner, alcoves.id, {
      title: "Much revised",
      kind: "drawing",
      taskIds: [tasks["Hang doors"].id],
      file: { bytes: samplePdf("Much revised"), name: "doors.pdf" },
    }).expect(201);
    await m.update(Drawing, { id: res.body.id }, { currentRevision: "Z" });
    const [keys, count] = [await bucketKeys(), await storedCount()];
    const refused = await revise(s.owner, res.body.id, "One more", {
      bytes: samplePdf("AA"),
      name: "doors-aa.pdf",
    }).expect(409);
    expect(refused.body.error.message).toContain("Rev Z is the last revision");
    expect(await bucketKeys()).toEqual(keys);
    expect(await storedCount()).toBe(count);
  });
});

describe("who sees which drawing", () => {
  let workshopOnly: DrawingDetail;
  let forKestrel: DrawingDetail;

  beforeAll(async () => {
    workshopOnly = (
      await upload(s.owner, alcoves.id, {
        title: "Carcass setting-out",
        kind: "drawing",
        taskIds: [tasks["Fix carcasses & scribes"].id],
        shareTradeKinds: ["plasterer"],
        file: { bytes: samplePdf("Carcass setting-out"), name: "setout.pdf" },
      }).expect(201)
    ).body;
    const kestrel = await trade("Kestrel Decorating");
    forKestrel = (
      await upload(s.owner, alcoves.id, {
        title: "Paint schedule",
        kind: "drawing",
        taskIds: [tasks["Fill, caulk & paint"].id],
        shareTradeIds: [kestrel.id],
        file: { bytes: samplePdf("Paint schedule"), name: "paint.pdf" },
      }).expect(201)
    ).body;
  });

  const titlesFor = async (who: Session) =>
    jobDrawingsResponseSchema
      .parse(
        (await who.agent.get(`/api/jobs/${alcoves.id}/drawings`).expect(200))
          .body,
      )
      .drawings.map((d) => d.title)
      .sort();

  it("lists for each person only what is shared with them", async () => {
    const all = await titlesFor(s.owner);
    expect(all).toEqual(
      expect.arrayContaining([
        "Carcass setting-out",
        "Elevation, alcoves",
        "Paint schedule",
        "Plinth outline",
      ]),
    );
    expect(await titlesFor(s.fitter)).toEqual(all);
    // Dev is a plasterer on the job: the two shared with plasterers.
    expect(await titlesFor(s.dev)).toEqual([
      "Carcass setting-out",
      "Elevation, alcoves",
    ]);
    // Sam, electrician: shared with electricians. Nell, by name.
    expect(await titlesFor(s.sam)).toEqual(["Elevation, alcoves"]);
    expect(await titlesFor(s.nell)).toEqual(["Paint schedule"]);
    // Rosa: only what is shared with the customer.
    expect(await titlesFor(s.rosa)).toEqual(["Elevation, alcoves"]);
    // Not on the job at all: the list is as invisible as the job.
    await s.ola.agent.get(`/api/jobs/${alcoves.id}/drawings`).expect(404);
    await s.tom.agent.get(`/api/jobs/${alcoves.id}/drawings`).expect(404);
  });

  it("answers 404 for a drawing and its files to a trade on the job it is not shared with", async () => {
    const rev = workshopOnly.revisions[0];
    await s.nell.agent.get(`/api/drawings/${workshopOnly.id}`).expect(404);
    await s.nell.agent.get(rev.downloadUrl).expect(404);
    await s.sam.agent.get(rev.downloadUrl).expect(404);
    // The customer: not shared with her either.
    await s.rosa.agent.get(`/api/drawings/${workshopOnly.id}`).expect(404);
    await s.rosa.agent.get(rev.downloadUrl).expect(404);
    // And the same 404 for a revision letter that does not exist (nothing is revealed).
    await s.nell.agent
      .get(`/api/drawings/${workshopOnly.id}/revisions/Q/file`)
      .expect(404);
    // Shared by name: Nell gets it.
    await fetchFile(s.nell, forKestrel.revisions[0].downloadUrl).expect(200);
  });

  it("answers 404 to a trade not on the job even with the drawing id, revision letter and file id", async () => {
    const rev = elevation.revisions[0];
    for (const path of [
      `/api/drawings/${elevation.id}`,
      rev.downloadUrl,
      `${rev.downloadUrl}?inline=1`,
      rev.thumbnailUrl!,
      `/api/drawings/${elevation.id}/revisions/A/file`,
    ]) {
      const res = await s.ola.agent.get(path);
      expect(res.status, path).toBe(404);
      expect(res.body.error.code).toBe("not-found");
      expect(res.headers["content-type"]).toMatch(/json/);
    }
    // Tom, another customer of the workshop, likewise.
    await s.tom.agent.get(rev.downloadUrl).expect(404);
  });

  it("keeps the workshop's rights to itself: renaming and sharing, deleting", async () => {
    await s.dev.agent
      .patch(`/api/drawings/${elevation.id}`)
      .set("X-CSRF-Token", s.dev.csrf)
      .send({ title: "Mine now" })
      .expect(403);
    await s.nell.agent
      .patch(`/api/drawings/${elevation.id}`)
      .set("X-CSRF-Token", s.nell.csrf)
      .send({ title: "Mine now" })
      .expect(404);
    // The fitter re-shares the setting-out with the customer; she sees it at once.
    const res = await s.fitter.agent
      .patch(`/api/drawings/${workshopOnly.id}`)
      .set("X-CSRF-Token", s.fitter.csrf)
      .send({
        shareWithCustomer: true,
        title: "Carcass setting-out (for Rosa)",
      })
      .expect(200);
    expect(res.body.sharing.customer).toBe(true);
    await s.rosa.agent.get(`/api/drawings/${workshopOnly.id}`).expect(200);
    // She is told it is shared with her; Dev, who could already see it, is not told again.
    const subject = "Carcass setting-out (for Rosa) Rev A shared with you";
    await t.mail.waitFor(
      (m) => m.to.includes(emails.rosa) && m.subject.includes(subject),
      15000,
    );
    await outboxDrained();
    expect(recipientsOf(subject)).toEqual([emails.rosa]);
    // Tasks must be this job's; named trades the workshop's.
    const wardrobeTask = await t.db.ds.manager.findOneByOrFail(Task, {
      jobId: wardrobe.id,
      name: "Lay bedroom floor",
    });
    const bad = await s.owner.agent
      .patch(`/api/drawings/${workshopOnly.id}`)
      .set("X-CSRF-Token", s.owner.csrf)
      .send({ taskIds: [wardrobeTask.id] })
      .expect(400);
    expect(bad.body.error.fields.taskIds).toBeDefined();
  });
});

describe("a trade's own uploads", () => {
  it("lets a trade upload a template to their own task: shared with the workshop, who is told", async () => {
    const list = jobDrawingsResponseSchema.parse(
      (await s.dev.agent.get(`/api/jobs/${alcoves.id}/drawings`).expect(200))
        .body,
    );
    expect(list.upload).toEqual({
      kinds: ["template", "site_photo"],
      tasks: [
        { id: tasks["Template coving"].id, name: "Template coving" },
        {
          id: tasks["Fit coving & make good"].id,
          name: "Fit coving & make good",
        },
      ],
      canShare: false,
    });
    const photo = await sampleJpeg(1600, 1200);
    const res = await upload(s.dev, alcoves.id, {
      title: "Coving template, left alcove",
      kind: "template",
      note: "Traced on site",
      taskIds: [tasks["Template coving"].id],
      // A trade's sharing fields are ignored: the upload goes to the workshop (and them).
      shareWithCustomer: true,
      shareTradeKinds: ["decorator"],
      file: { bytes: photo, name: "IMG_2041.jpg" },
    }).expect(201);
    const d = drawingDetailSchema.parse(res.body);
    expect(d.kind).toBe("template");
    expect(d.revisions[0].uploadedBy).toEqual({
      name: demoAccounts.trade.name,
      role: "trade",
      tradeName: "Ashby Plaster & Coving",
    });
    expect(d.can.addRevision).toBe(true);
    await s.owner.agent.get(`/api/drawings/${d.id}`).expect(200);
    await s.rosa.agent.get(`/api/drawings/${d.id}`).expect(404);
    await s.nell.agent.get(`/api/drawings/${d.id}`).expect(404);
    const stored = await t.db.ds.manager.findOneByOrFail(Drawing, { id: d.id });
    expect(stored.shareWithCustomer).toBe(false);
    expect(stored.shareTradeKinds).toEqual([]);

    // The maker is told: the workshop's owner and fitter, not Dev himself.
    const subject = "Ashby Plaster & Coving uploaded a template";
    await t.mail.waitFor(
      (m) => m.to.includes(emails.owner) && m.subject.includes(subject),
      15000,
    );
    await t.mail.waitFor(
      (m) => m.to.includes(emails.fitter) && m.subject.includes(subject),
      15000,
    );
    await outboxDrained();
    expect(recipientsOf(subject)).toEqual([emails.fitter, emails.owner].sort());

    // Dev adds Rev B of his own template (from his phone); the workshop hears again.
    const revB = await revise(s.dev, d.id, "Right alcove too", {
      bytes: await sampleJpeg(800, 600),
      name: "IMG_2042.jpg",
    }).expect(201);
    expect(revB.body.currentRevision).toBe("B");
    await t.mail.waitFor(
      (m) =>
        m.to.includes(emails.owner) &&
        m.subject.includes("Coving template, left alcove Rev B"),
      15000,
    );
  });

  it("refuses a trade's upload to another trade's task (403) and removes what was received", async () => {
    const [keys, count] = [await bucketKeys(), await storedCount()];
    const res = await upload(s.dev, alcoves.id, {
      title: "Not mine",
      kind: "site_photo",
      taskIds: [tasks["Electrician second fix"].id],
      file: { bytes: await sampleJpeg(400, 300), name: "photo.jpg" },
    }).expect(403);
    expect(res.body.error.message).toBe(
      "You can upload only to your own tasks on this job.",
    );
    // A drawing (not a template or site photo) to his own task: the workshop's to make.
    const drawing = await upload(s.dev, alcoves.id, {
      title: "My drawing",
      kind: "drawing",
      taskIds: [tasks["Template coving"].id],
      file: { bytes: samplePdf("Mine"), name: "mine.pdf" },
    }).expect(403);
    expect(drawing.body.error.message).toContain("templates and site photos");
    expect(await bucketKeys()).toEqual(keys);
    expect(await storedCount()).toBe(count);
    // And he may not add a revision to the workshop's drawing he can see.
    await revise(s.dev, elevation.id, "My version", {
      bytes: samplePdf("Mine"),
      name: "mine.pdf",
    }).expect(403);
  });

  it("refuses the customer and people off the job before storing anything", async () => {
    const [keys, count] = [await bucketKeys(), await storedCount()];
    const body = {
      title: "From the customer",
      kind: "site_photo",
      taskIds: [tasks["Template coving"].id],
      file: { bytes: await sampleJpeg(400, 300), name: "photo.jpg" },
    };
    await upload(s.rosa, alcoves.id, body).expect(403);
    await upload(s.ola, alcoves.id, body).expect(404);
    await upload(s.tom, alcoves.id, body).expect(404);
    await revise(s.ola, elevation.id, "x", body.file).expect(404);
    expect(await bucketKeys()).toEqual(keys);
    expect(await storedCount()).toBe(count);
  });
});

describe("refused files leave nothing behind", () => {
  const attempt = async (file: { bytes: Buffer; name: string }) => {
    const [keys, count, drawings] = [
      await bucketKeys(),
      await storedCount(),
      await t.db.ds.manager.count(Drawing),
    ];
    const res = await upload(s.owner, alcoves.id, {
      title: "Refused",
      kind: "drawing",
      taskIds: [tasks["Hang doors"].id],
      file,
    });
    expect(await bucketKeys()).toEqual(keys);
    expect(await storedCount()).toBe(count);
    expect(await t.db.ds.manager.count(Drawing)).toBe(drawings);
    return res;
  };

  it("refuses a text file and an SVG (415)", async () => {
    const txt = await attempt({
      bytes: Buffer.from("measurements: 880 x 2100\n"),
      name: "notes.txt",
    });
    expect(txt.status).toBe(415);
    expect(txt.body.error.code).toBe("file-type-refused");
    const svg = await attempt({ bytes: sampleSvg(), name: "elevation.svg" });
    expect(svg.status).toBe(415);
    expect(svg.body.error.message).toContain("SVG");
  });

  it("refuses an executable named plan.pdf, saying it is not a PDF", async () => {
    const res = await attempt({ bytes: sampleElf(), name: "plan.pdf" });
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/^plan\.pdf is not a PDF/);
  });

  it("refuses an upload with a bad field after the file arrived, removing the file", async () => {
    const [keys, count] = [await bucketKeys(), await storedCount()];
    const wardrobeTask = await t.db.ds.manager.findOneByOrFail(Task, {
      jobId: wardrobe.id,
      name: "Lay bedroom floor",
    });
    const res = await upload(s.owner, alcoves.id, {
      title: "Wrong job",
      kind: "drawing",
      taskIds: [wardrobeTask.id],
      file: { bytes: samplePdf("Wrong job"), name: "wrong.pdf" },
    }).expect(400);
    expect(res.body.error.fields.taskIds).toEqual([
      "Choose tasks of this job.",
    ]);
    const noTitle = await upload(s.owner, alcoves.id, {
      kind: "drawing",
      taskIds: [tasks["Hang doors"].id],
      file: { bytes: samplePdf("No title"), name: "untitled.pdf" },
    }).expect(400);
    expect(noTitle.body.error.fields.title).toBeDefined();
    const noFile = await upload(s.owner, alcoves.id, {
      title: "No file",
      kind: "drawing",
      taskIds: [tasks["Hang doors"].id],
    }).expect(400);
    expect(noFile.body.error.code).toBe("file-missing");
    expect(await bucketKeys()).toEqual(keys);
    expect(await storedCount()).toBe(count);
  });
});

describe("deleting", () => {
  it("lets the owner delete a drawing with every revision's file; the fitter may not", async () => {
    const created = await upload(s.owner, alcoves.id, {
      title: "To delete",
      kind: "site_photo",
      taskIds: [tasks["Hang doors"].id],
      file: { bytes: await samplePng(300, 200), name: "before.png" },
    }).expect(201);
    await revise(s.owner, created.body.id, "After", {
      bytes: await samplePng(310, 200),
      name: "after.png",
    }).expect(201);
    const rows = await t.db.ds.manager.find(DrawingRevision, {
      where: { drawingId: created.body.id },
      relations: { file: true },
    });
    const keys = rows.flatMap((r) => [
      r.file!.storageKey,
      r.file!.thumbnailKey!,
    ]);
    expect(keys).toHaveLength(4);
    expect((await bucketKeys()).filter((k) => keys.includes(k))).toHaveLength(
      4,
    );
    await s.fitter.agent
      .delete(`/api/drawings/${created.body.id}`)
      .set("X-CSRF-Token", s.fitter.csrf)
      .expect(403);
    await s.owner.agent
      .delete(`/api/drawings/${created.body.id}`)
      .set("X-CSRF-Token", s.owner.csrf)
      .expect(204);
    expect((await bucketKeys()).filter((k) => keys.includes(k))).toEqual([]);
    expect(
      await t.db.ds.manager.countBy(StoredFile, {
        id: rows[0].fileId,
      }),
    ).toBe(0);
    await s.owner.agent.get(`/api/drawings/${created.body.id}`).expect(404);
  });
});

describe("deleting a job", () => {
  it("removes its drawings' and thread attachments' files from the bucket and stored_files", async () => {
    const bookcase = await t.db.ds.manager.findOneByOrFail(Job, {
      title: demoJobTitles.bookcase,
    });
    const survey = await t.db.ds.manager.findOneByOrFail(Task, {
      jobId: bookcase.id,
    });
    const drawing = await upload(s.owner, bookcase.id, {
      title: "Bookcase elevation",
      kind: "drawing",
      taskIds: [survey.id],
      file: { bytes: await samplePng(400, 300), name: "bookcase.png" },
    }).expect(201);
    await revise(s.owner, drawing.body.id, "Shelves moved", {
      bytes: samplePdf("Bookcase Rev B"),
      name: "bookcase-b.pdf",
    }).expect(201);
    await s.owner.agent
      .post(`/api/jobs/${bookcase.id}/thread/messages/upload`)
      .set("X-CSRF-Token", s.owner.csrf)
      .field("audience", "workshop")
      .field("text", "Survey photo")
      .attach("file", await sampleJpeg(300, 200), "survey.jpg")
      .expect(201);
    const before = await bucketKeys();
    const ours = await t.db.ds.manager.query(
      "SELECT r.fileId FROM drawing_revisions r JOIN drawings d ON d.id = r.drawingId WHERE d.jobId = ? " +
        "UNION SELECT a.fileId FROM thread_attachments a JOIN thread_messages m ON m.seq = a.messageSeq WHERE m.jobId = ?",
      [bookcase.id, bookcase.id],
    );
    expect(ours).toHaveLength(3);
    const files = await t.db.ds.manager.findBy(StoredFile, {
      id: In(ours.map((r: { fileId: string }) => r.fileId)),
    });
    const keys = files.flatMap((f) =>
      [f.storageKey, f.thumbnailKey].filter((k): k is string => !!k),
    );
    // bookcase.png and survey.jpg have thumbnails; the PDF has none.
    expect(keys).toHaveLength(5);
    expect(before.filter((k) => keys.includes(k))).toHaveLength(5);

    await s.owner.agent
      .delete(`/api/jobs/${bookcase.id}`)
      .set("X-CSRF-Token", s.owner.csrf)
      .expect(204);
    const after = await bucketKeys();
    expect(after.filter((k) => keys.includes(k))).toEqual([]);
    // Nothing else in the bucket was touched.
    expect(after).toEqual(before.filter((k) => !keys.includes(k)));
    expect(
      await t.db.ds.manager.countBy(StoredFile, {
        id: In(files.map((f) => f.id)),
      }),
    ).toBe(0);
  });
});

describe("the size limit", () => {
  let small: TestApp;
  beforeAll(async () => {
    small = await startTestApp({ demo: true, uploadMaxBytes: 50_000 });
  }, 120_000);
  afterAll(async () => small?.close());

  it("refuses a file over the limit (413) with nothing left in S3 or stored_files", async () => {
    const owner = await signIn(small, emails.owner);
    const job = await small.db.ds.manager.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const task = await small.db.ds.manager.findOneByOrFail(Task, {
      jobId: job.id,
      name: "Hang doors",
    });
    const big = samplePdf("Big", 200_000);
    expect(big.length).toBeGreaterThan(50_000);
    const res = await upload(owner, job.id, {
      title: "Too big",
      kind: "drawing",
      taskIds: [task.id],
      file: { bytes: big, name: "big.pdf" },
    }).expect(413);
    expect(res.body.error.code).toBe("file-too-large");
    expect(await bucketKeys(small)).toEqual([]);
    expect(await storedCount(small)).toBe(0);
    expect(await small.db.ds.manager.count(Drawing)).toBe(0);
    // Just under the limit goes through.
    await upload(owner, job.id, {
      title: "Fits",
      kind: "drawing",
      taskIds: [task.id],
      file: { bytes: samplePdf("Fits", 40_000), name: "fits.pdf" },
    }).expect(201);
    expect(await storedCount(small)).toBe(1);
  });

  it("loads the demo drawing: Elevation, alcoves Rev A for the plasterer and the electrician", async () => {
    await loadDemoDrawings(
      small.db.ds,
      small.storage,
      demoJobTitles.alcoves,
      demoAccounts.owner.email,
    );
    const job = await small.db.ds.manager.findOneByOrFail(Job, {
      title: demoJobTitles.alcoves,
    });
    const dev = await signIn(small, emails.dev);
    const list = jobDrawingsResponseSchema.parse(
      (await dev.agent.get(`/api/jobs/${job.id}/drawings`).expect(200)).body,
    );
    const demo = list.drawings.find((d) => d.title === DEMO_DRAWING_TITLE)!;
    expect(demo.currentRevision).toBe("A");
    expect(demo.current.file.mimeType).toBe("image/png");
    const png = await fetchFile(dev, demo.current.downloadUrl).expect(200);
    const row = await small.db.ds.manager.findOneByOrFail(StoredFile, {
      id: demo.current.file.id,
    });
    expect(sha256(png.body)).toBe(row.sha256);
    expect((await sharp(png.body).metadata()).width).toBe(row.width);
    const thumb = await fetchFile(dev, demo.current.thumbnailUrl!).expect(200);
    expect((await sharp(thumb.body).metadata()).format).toBe("webp");
    const owner = await signIn(small, emails.owner);
    const detail = drawingDetailSchema.parse(
      (await owner.agent.get(`/api/drawings/${demo.id}`).expect(200)).body,
    );
    expect(detail.sharing).toEqual({
      tradeKinds: ["plasterer", "electrician"],
      trades: [],
      customer: false,
    });
    expect(detail.tasks.map((x) => x.name).sort()).toEqual(
      [
        "Electrician second fix",
        "Fit coving & make good",
        "Template coving",
      ].sort(),
    );
    // Not shared with the customer.
    const rosa = await signIn(small, emails.rosa);
    await rosa.agent.get(`/api/drawings/${demo.id}`).expect(404);
  });
});
