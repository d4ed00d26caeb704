// The demo's drawing: "Elevation, alcoves" Rev A on the alcove job, shared with the plasterer and
// the electrician. The picture is drawn here (an SVG rendered to PNG by sharp), so the demo needs
// no binary files checked in; sizes are invented like the rest of the scenario.
import { createHash } from "node:crypto";
import { PassThrough } from "node:stream";
import sharp from "sharp";
import type { DataSource } from "typeorm";
import { newId } from "../../server/db/columns";
import type { Storage } from "../../server/infra/storage/storage";
import {
  Drawing,
  DrawingRevision,
  DrawingTask,
} from "../../server/modules/drawings/drawings.entity";
import { StoredFile } from "../../server/modules/files/files.entity";
import { Job } from "../../server/modules/jobs/jobs.entity";
import { Task } from "../../server/modules/programme/programme.entity";
import { User } from "../../server/modules/users/users.entity";

export const DEMO_DRAWING_TITLE = "Elevation, alcoves";

/** A front-room wall: two alcoves either side of the chimney breast, base cabinets, shelves, coving line and cabinet lights. */
export function elevationSvg(): string {
  const ink = "#1F3A4D";
  const blue = "#1F5F8B";
  // 1 px = 2.5 mm; the wall is 3600 mm wide and 2700 mm to the ceiling.
  const x0 = 80;
  const y0 = 120;
  const mm = (v: number) => v / 2.5;
  const wall = { w: mm(3600), h: mm(2700) };
  const left = { x: x0, w: mm(900) };
  const breast = { x: x0 + mm(900), w: mm(1820) };
  const right = { x: x0 + mm(2720), w: mm(880) };
  const floor = y0 + wall.h;
  const base = mm(850);
  const shelves = [1250, 1650, 2050].map((h) => floor - mm(h));
  const alcove = (a: { x: number; w: number }, label: string) => `
    <rect x="${a.x + 4}" y="${floor - base}" width="${a.w - 8}" height="${base}" fill="#EEF3F7" stroke="${blue}" stroke-width="3"/>
    <line x1="${a.x + a.w / 2}" y1="${floor - base}" x2="${a.x + a.w / 2}" y2="${floor}" stroke="${blue}" stroke-width="2"/>
    ${shelves.map((y) => `<rect x="${a.x + 4}" y="${y}" width="${a.w - 8}" height="10" fill="${blue}"/>`).join("")}
    <circle cx="${a.x + a.w / 2}" cy="${shelves[2] + 18}" r="7" fill="#F2B705" stroke="${ink}" stroke-width="2"/>
    <text x="${a.x + a.w / 2}" y="${floor + 40}" font-size="22" text-anchor="middle" fill="${ink}">${label}</text>`;
  return `<svg xmlns="http://www.w3.org/2000/svg" width="1600" height="1360" font-family="sans-serif">
  <rect width="1600" height="1360" fill="#FFFFFF"/>
  <text x="${x0}" y="60" font-size="34" fill="${ink}">Elevation, alcoves — Rev A</text>
  <text x="${x0}" y="96" font-size="20" fill="${ink}">14 Larkspur Terrace, front room · all sizes in mm · check on site</text>
  <rect x="${x0}" y="${y0}" width="${wall.w}" height="${wall.h}" fill="none" stroke="${ink}" stroke-width="3"/>
  <rect x="${breast.x}" y="${y0}" width="${breast.w}" height="${wall.h}" fill="#F4F1EC" stroke="${ink}" stroke-width="3"/>
  <rect x="${breast.x + mm(410)}" y="${floor - mm(1000)}" width="${mm(1000)}" height="${mm(1000)}" fill="#FFFFFF" stroke="${ink}" stroke-width="2"/>
  <rect x="${x0}" y="${y0}" width="${wall.w}" height="${mm(120)}" fill="none" stroke="#8A6A4F" stroke-width="2" stroke-dasharray="10 6"/>
  <text x="${breast.x + breast.w / 2}" y="${y0 + mm(120) + 26}" font-size="20" text-anchor="middle" fill="#8A6A4F">coving line, 120 deep (plasterer)</text>
  ${alcove(left, "Left alcove 900")}
  ${alcove(right, "Right alcove 880")}
  <text x="${breast.x + breast.w / 2}" y="${floor + 40}" font-size="22" text-anchor="middle" fill="${ink}">Chimney breast 1820</text>
  <text x="${x0}" y="${floor + 90}" font-size="20" fill="${ink}">Base cabinets 850 high · shelves at 1250, 1650, 2050 · yellow: cabinet lights (electrician, second fix)</text>
  <text x="${x0}" y="${floor + 122}" font-size="20" fill="${ink}">Left wall out of plumb 12 mm at the top: scribe on the left side</text>
</svg>`;
}

function bodyOf(b: Buffer) {
  const s = new PassThrough();
  s.end(b);
  return s;
}

/**
 * Adds the demo drawing to the alcove job: the picture and its thumbnail into the bucket, then the
 * rows. Loaded after the rest of the scenario (it needs its job, tasks and owner).
 */
export async function loadDemoDrawings(
  ds: DataSource,
  storage: Storage,
  jobTitle: string,
  ownerEmail: string,
): Promise<void> {
  const m = ds.manager;
  const job = await m.findOneByOrFail(Job, { title: jobTitle });
  const owner = await m.findOneByOrFail(User, { email: ownerEmail });
  const tasks = await m.findBy(Task, { jobId: job.id });
  const task = (name: string) => tasks.find((t) => t.name === name)!;
  const png = await sharp(Buffer.from(elevationSvg())).png().toBuffer();
  const { width = null, height = null } = await sharp(png).metadata();
  const thumb = await sharp(png)
    .resize(480, 480, { fit: "inside", withoutEnlargement: true })
    .webp({ quality: 80 })
    .toBuffer();
  const fileId = newId();
  const storageKey = `workshops/${job.workshopId}/${fileId}.png`;
  const thumbnailKey = `${storageKey}.thumb.webp`;
  await storage.put(storageKey, bodyOf(png), "image/png");
  await storage.put(thumbnailKey, bodyOf(thumb), "image/webp");
  await ds.transaction(async (t) => {
    await t.insert(StoredFile, {
      id: fileId,
      workshopId: job.workshopId,
      storageKey,
      originalName: "elevation-alcoves-rev-a.png",
      mimeType: "image/png",
      extension: "png",
      sizeBytes: png.length,
      sha256: createHash("sha256").update(png).digest("hex"),
      width,
      height,
      thumbnailKey,
      uploadedByUserId: owner.id,
    });
    const drawingId = newId();
    await t.insert(Drawing, {
      id: drawingId,
      workshopId: job.workshopId,
      jobId: job.id,
      title: DEMO_DRAWING_TITLE,
      kind: "drawing",
      currentRevision: "A",
      shareTradeKinds: ["plasterer", "electrician"],
      shareTradeIds: [],
      shareWithCustomer: false,
      createdByUserId: owner.id,
      createdByTradeId: null,
    });
    await t.insert(DrawingRevision, {
      id: newId(),
      drawingId,
      letter: "A",
      note: "As surveyed. Coving line and cabinet light positions for the plasterer and electrician.",
      fileId,
      uploadedByUserId: owner.id,
      uploadedByTradeId: null,
    });
    await t.insert(
      DrawingTask,
      [
        "Template coving",
        "Fit coving & make good",
        "Electrician second fix",
      ].map((name) => ({ drawingId, taskId: task(name).id })),
    );
  });
}
