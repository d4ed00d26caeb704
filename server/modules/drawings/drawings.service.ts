import type { Request, Response } from "express";
import { In, type DataSource, type EntityManager } from "typeorm";
import {
  addRevisionFieldsSchema,
  createDrawingFieldsSchema,
  drawingKinds,
  tradeUploadKinds,
  type DrawingDetail,
  type JobDrawingsResponse,
  type UpdateDrawingBody,
} from "../../../shared/schemas";
import type { z } from "zod";
import { newId } from "../../db/columns";
import { HttpError, notFound } from "../../http/errors";
import { authorize, can, requireActor, type Actor } from "../../policies";
import { audit } from "../audit/audit.service";
import { Booking } from "../bookings/bookings.entity";
import { StoredFile } from "../files/files.entity";
import {
  deleteStoredFiles,
  receiveUploads,
  sendStoredFile,
  type FilesDeps,
} from "../files/files.service";
import { ACTIVE_STATES } from "../jobs/job-access";
import { Job } from "../jobs/jobs.entity";
import { loadProgramme } from "../programme/programme-input";
import { Task } from "../programme/programme.entity";
import { schedule } from "../programme/programme.service";
import { Trade } from "../trades/trades.entity";
import { User } from "../users/users.entity";
import { Workshop } from "../workshops/workshops.entity";
import {
  drawingJobAccess,
  drawingJobAccesses,
  drawingResource,
  uploadResource,
  type DrawingJobAccess,
} from "./drawing-access";
import {
  queueRevisionNotices,
  queueSharedNotices,
  sharedAudience,
} from "./drawing-notices";
import { Drawing, DrawingRevision, DrawingTask } from "./drawings.entity";
import {
  presentDetail,
  presentDrawingTask,
  presentSummary,
  type RevisionRow,
  type Viewer,
} from "./drawings.presenter";

export interface DrawingDeps {
  ds: DataSource;
  files: FilesDeps;
  appUrl: string;
}

/** Rev Z is the last: 26 revisions of one drawing means it has become a different drawing. */
export function nextLetter(current: string): string | null {
  return current >= "Z" ? null : String.fromCharCode(current.charCodeAt(0) + 1);
}

const invalid = (field: string, message: string) =>
  new HttpError(400, "validation", message, { [field]: [message] });

function viewerFor(actor: Actor, access: DrawingJobAccess): Viewer {
  const ws = access.job.workshopId;
  return {
    staff: actor.memberships.has(ws),
    customer: actor.customers.get(access.job.customerId) === ws,
    tradeIds: new Set(
      [...actor.trades.entries()].filter(([, w]) => w === ws).map(([id]) => id),
    ),
  };
}

async function loadJob(ds: DataSource, jobId: string): Promise<Job> {
  const job = await ds.manager.findOneBy(Job, { id: jobId });
  if (!job) throw notFound("That job");
  return job;
}

/** A drawing, its job and the policy's view of both; 404 before anything else if it does not exist. */
async function loadDrawing(ds: DataSource, drawingId: string) {
  const drawing = await ds.manager.findOneBy(Drawing, { id: drawingId });
  if (!drawing) throw notFound("That drawing");
  const job = await ds.manager.findOneByOrFail(Job, { id: drawing.jobId });
  const access = await drawingJobAccess(ds, job);
  return {
    drawing,
    job,
    access,
    resource: drawingResource(access, drawing),
  };
}

/** Revisions newest first, each with its file, uploader's name and trade. */
async function revisionRows(
  m: EntityManager,
  drawingIds: string[],
): Promise<Map<string, RevisionRow[]>> {
  const out = new Map<string, RevisionRow[]>();
  if (!drawingIds.length) return out;
  const revisions = await m.find(DrawingRevision, {
    where: { drawingId: In(drawingIds) },
    relations: { file: true },
    order: { letter: "DESC" },
  });
  const userIds = [...new Set(revisions.map((r) => r.uploadedByUserId))];
  const tradeIds = [
    ...new Set(
      revisions.map((r) => r.uploadedByTradeId).filter((x) => x !== null),
    ),
  ];
  const [users, trades] = await Promise.all([
    userIds.length ? m.findBy(User, { id: In(userIds) }) : [],
    tradeIds.length ? m.findBy(Trade, { id: In(tradeIds) }) : [],
  ]);
  const userName = new Map(users.map((u) => [u.id, u.name]));
  const tradeById = new Map(trades.map((t) => [t.id, t]));
  for (const r of revisions) {
    const rows = out.get(r.drawingId) ?? [];
    rows.push({
      revision: r,
      file: r.file!,
      uploaderName: userName.get(r.uploadedByUserId) ?? "Someone",
      uploaderTrade: r.uploadedByTradeId
        ? (tradeById.get(r.uploadedByTradeId) ?? null)
        : null,
    });
    out.set(r.drawingId, rows);
  }
  return out;
}

async function tradesById(
  m: EntityManager,
  ids: string[],
): Promise<Map<string, Trade>> {
  const unique = [...new Set(ids)];
  const list = unique.length ? await m.findBy(Trade, { id: In(unique) }) : [];
  return new Map(list.map((t) => [t.id, t]));
}

/** GET /jobs/:jobId/drawings: the drawings this person may see, and what they may upload. */
export async function listJobDrawings(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
): Promise<JobDrawingsResponse> {
  requireActor(actor);
  const job = await loadJob(ds, jobId);
  const access = await drawingJobAccess(ds, job);
  authorize(actor, "drawings.list", access.job);
  return (await drawingsOfJobs(ds.manager, actor, [job])).get(job.id)!;
}

/**
 * What `listJobDrawings` answers, for many jobs in a fixed number of statements (a trade's visits
 * across many jobs: issue 15). A job the person may not list drawings of gets an empty answer;
 * callers that must refuse (404/403) ask the policy first, as `listJobDrawings` does.
 */
export async function drawingsOfJobs(
  m: EntityManager,
  actor: Actor,
  jobs: readonly Job[],
): Promise<Map<string, JobDrawingsResponse>> {
  const out = new Map<string, JobDrawingsResponse>();
  if (!jobs.length) return out;
  const jobIds = jobs.map((j) => j.id);
  const accesses = await drawingJobAccesses(m, jobs);
  const [all, tasks] = await Promise.all([
    m.find(Drawing, {
      where: { jobId: In(jobIds) },
      order: { updatedAt: "DESC" },
    }),
    m.find(Task, { where: { jobId: In(jobIds) }, order: { sortOrder: "ASC" } }),
  ]);
  const visible = all.filter((d) => {
    const access = accesses.get(d.jobId)!;
    return (
      can(actor, "drawings.list", access.job) &&
      can(actor, "drawing.read", drawingResource(access, d))
    );
  });
  const ids = visible.map((d) => d.id);
  const viewers = new Map(
    jobs.map((j) => [j.id, viewerFor(actor, accesses.get(j.id)!)]),
  );
  const staffJobs = new Set(
    jobs.filter((j) => viewers.get(j.id)!.staff).map((j) => j.id),
  );
  const ownTradeIds = [
    ...new Set([...viewers.values()].flatMap((v) => [...v.tradeIds])),
  ];
  const [revisions, links, trades, own] = await Promise.all([
    revisionRows(m, ids),
    ids.length
      ? m.findBy(DrawingTask, { drawingId: In(ids) })
      : Promise.resolve([]),
    tradesById(
      m,
      visible
        .filter((d) => staffJobs.has(d.jobId))
        .flatMap((d) => d.shareTradeIds),
    ),
    ownTradeIds.length
      ? m.find(Booking, {
          where: {
            jobId: In(jobIds),
            tradeId: In(ownTradeIds),
            state: In(ACTIVE_STATES),
          },
          select: { jobId: true, taskId: true, tradeId: true },
        })
      : Promise.resolve([]),
  ]);
  const taskById = new Map(tasks.map((t) => [t.id, t]));
  for (const job of jobs) {
    const access = accesses.get(job.id)!;
    const viewer = viewers.get(job.id)!;
    const jobTasks = tasks.filter((t) => t.jobId === job.id);
    let upload: JobDrawingsResponse["upload"] = null;
    if (can(actor, "drawings.upload", access.job)) {
      if (viewer.staff) {
        upload = {
          kinds: [...drawingKinds],
          tasks: jobTasks.map((t) => ({ id: t.id, name: t.name })),
          canShare: true,
        };
      } else {
        const ownIds = new Set(
          own
            .filter((b) => b.jobId === job.id && viewer.tradeIds.has(b.tradeId))
            .map((b) => b.taskId),
        );
        upload = {
          kinds: [...tradeUploadKinds],
          tasks: jobTasks
            .filter((t) => ownIds.has(t.id))
            .map((t) => ({ id: t.id, name: t.name })),
          canShare: false,
        };
      }
    }
    out.set(job.id, {
      jobId: job.id,
      upload,
      drawings: visible
        .filter((d) => d.jobId === job.id)
        .map((d) =>
          presentSummary(d, {
            viewer,
            revisions: revisions.get(d.id) ?? [],
            tasks: links
              .filter((l) => l.drawingId === d.id)
              .map((l) => taskById.get(l.taskId))
              .filter((t): t is Task => t !== undefined)
              .sort((a, b) => a.sortOrder - b.sortOrder),
            trades: viewer.staff ? trades : new Map<string, Trade>(),
          }),
        ),
    });
  }
  return out;
}

async function detail(
  ds: DataSource,
  actor: Actor,
  loaded: Awaited<ReturnType<typeof loadDrawing>>,
): Promise<DrawingDetail> {
  const { drawing: d, job, access, resource } = loaded;
  const m = ds.manager;
  const viewer = viewerFor(actor, access);
  const [revisions, links, workshop] = await Promise.all([
    revisionRows(m, [d.id]),
    m.findBy(DrawingTask, { drawingId: d.id }),
    m.findOneByOrFail(Workshop, { id: job.workshopId }),
  ]);
  // The same engine run the programme page shows, so "clear to start" means the same thing here.
  const data = await loadProgramme(m, job, workshop);
  const result = schedule(data.input);
  const linked = new Set(links.map((l) => l.taskId));
  const tasks = data.tasks
    .filter((t) => linked.has(t.id))
    .map((t) => presentDrawingTask(t, data, result, viewer));
  const trades = viewer.staff
    ? await tradesById(m, d.shareTradeIds)
    : new Map<string, Trade>();
  return presentDetail(d, {
    jobTitle: job.title,
    viewer,
    revisions: revisions.get(d.id) ?? [],
    tasks,
    trades,
    can: {
      edit: can(actor, "drawing.update", resource),
      addRevision: can(actor, "drawing.addRevision", resource),
      delete: can(actor, "drawing.delete", resource),
    },
  });
}

/** GET /drawings/:drawingId */
export async function getDrawing(
  ds: DataSource,
  actor: Actor | null,
  drawingId: string,
): Promise<DrawingDetail> {
  requireActor(actor);
  const loaded = await loadDrawing(ds, drawingId);
  authorize(actor, "drawing.read", loaded.resource);
  return detail(ds, actor, loaded);
}

/** Tasks must be the job's; named trades the workshop's. Returns the trades named. */
async function checkTargets(
  m: EntityManager,
  job: Job,
  taskIds: string[] | undefined,
  shareTradeIds: string[] | undefined,
): Promise<void> {
  if (taskIds) {
    const unique = [...new Set(taskIds)];
    const found = await m.count(Task, {
      where: { id: In(unique), jobId: job.id },
    });
    if (found !== unique.length)
      throw invalid("taskIds", "Choose tasks of this job.");
  }
  if (shareTradeIds?.length) {
    const unique = [...new Set(shareTradeIds)];
    const found = await m.count(Trade, {
      where: { id: In(unique), workshopId: job.workshopId },
    });
    if (found !== unique.length)
      throw invalid(
        "shareTradeIds",
        "Share with trades this workshop works with.",
      );
  }
}

/** The trade record the actor speaks for that holds every one of the upload's tasks. */
function uploaderTradeId(
  actor: Actor,
  taskTradeIds: ReadonlyArray<ReadonlySet<string>>,
): string | null {
  for (const tradeId of actor.trades.keys())
    if (taskTradeIds.every((s) => s.has(tradeId))) return tradeId;
  return null;
}

/**
 * POST /jobs/:jobId/drawings. Who may upload at all (the workshop, a trade on the job) is decided
 * before a byte is stored; what they upload and to which tasks (a trade: template or site photo,
 * own tasks only) can only be decided once the form's fields are read, and a refusal then removes
 * the stored file again, like any other refused upload.
 */
export async function createDrawing(
  deps: DrawingDeps,
  actor: Actor | null,
  jobId: string,
  req: Request,
  res: Response,
): Promise<DrawingDetail> {
  const { ds } = deps;
  requireActor(actor);
  const job = await loadJob(ds, jobId);
  const access = await drawingJobAccess(ds, job);
  authorize(actor, "drawings.upload", access.job);
  const { files, fields } = await receiveUploads(deps.files, req, res, {
    workshopId: job.workshopId,
    userId: actor.userId,
    fields: createDrawingFieldsSchema,
  });
  let id: string;
  try {
    id = await saveNewDrawing(deps, actor, job, access, files[0], fields);
  } catch (err) {
    await deleteStoredFiles(deps.files, files);
    throw err;
  }
  return detail(ds, actor, await loadDrawing(ds, id));
}

async function saveNewDrawing(
  deps: DrawingDeps,
  actor: Actor,
  job: Job,
  access: DrawingJobAccess,
  file: StoredFile,
  fields: z.output<typeof createDrawingFieldsSchema>,
): Promise<string> {
  const { ds } = deps;
  const taskIds = [...new Set(fields.taskIds)];
  await checkTargets(ds.manager, job, taskIds, fields.shareTradeIds);
  const target = await uploadResource(ds, access, job.id, fields.kind, taskIds);
  const staff = actor.memberships.has(job.workshopId);
  if (!can(actor, "drawings.uploadTo", target)) {
    if (!(tradeUploadKinds as readonly string[]).includes(fields.kind))
      throw new HttpError(
        403,
        "forbidden",
        "A trade can upload templates and site photos; drawings come from the workshop.",
      );
    throw new HttpError(
      403,
      "forbidden",
      "You can upload only to your own tasks on this job.",
    );
  }
  const tradeId = staff ? null : uploaderTradeId(actor, target.taskTradeIds);
  const id = newId();
  await ds.transaction(async (m) => {
    const drawing = m.create(Drawing, {
      id,
      workshopId: job.workshopId,
      jobId: job.id,
      title: fields.title,
      kind: fields.kind,
      currentRevision: "A",
      // A trade's upload goes to the workshop (which sees everything) and to them (as its maker).
      shareTradeKinds: staff ? [...new Set(fields.shareTradeKinds)] : [],
      shareTradeIds: staff ? [...new Set(fields.shareTradeIds)] : [],
      shareWithCustomer: staff ? fields.shareWithCustomer : false,
      createdByUserId: actor.userId,
      createdByTradeId: tradeId,
    });
    await m.insert(Drawing, drawing);
    const revision = m.create(DrawingRevision, {
      id: newId(),
      drawingId: id,
      letter: "A",
      note: fields.note,
      fileId: file.id,
      uploadedByUserId: actor.userId,
      uploadedByTradeId: tradeId,
    });
    await m.insert(DrawingRevision, revision);
    await m.insert(
      DrawingTask,
      taskIds.map((taskId) => ({ drawingId: id, taskId })),
    );
    await audit(m, {
      workshopId: job.workshopId,
      actorUserId: actor.userId,
      action: "drawing.created",
      entityType: "drawing",
      entityId: id,
      detail: { jobId: job.id, title: fields.title, kind: fields.kind },
    });
    await notify(m, deps, job, drawing, revision, actor, tradeId);
  });
  return id;
}

async function notify(
  m: EntityManager,
  deps: DrawingDeps,
  job: Job,
  drawing: Drawing,
  revision: DrawingRevision,
  actor: Actor,
  tradeId: string | null,
): Promise<void> {
  const [workshop, uploader, uploaderTrade] = await Promise.all([
    m.findOneByOrFail(Workshop, { id: job.workshopId }),
    m.findOneByOrFail(User, { id: actor.userId }),
    tradeId ? m.findOneBy(Trade, { id: tradeId }) : Promise.resolve(null),
  ]);
  await queueRevisionNotices(m, {
    appUrl: deps.appUrl,
    workshop,
    job,
    drawing,
    revision,
    uploader,
    uploaderTrade,
  });
}

const lastRevision = () =>
  new HttpError(
    409,
    "conflict",
    "Rev Z is the last revision a drawing can have. Upload this as a new drawing instead.",
  );

/** POST /drawings/:drawingId/revisions: the next letter; every earlier revision stays. */
export async function addRevision(
  deps: DrawingDeps,
  actor: Actor | null,
  drawingId: string,
  req: Request,
  res: Response,
): Promise<DrawingDetail> {
  const { ds } = deps;
  requireActor(actor);
  const loaded = await loadDrawing(ds, drawingId);
  authorize(actor, "drawing.addRevision", loaded.resource);
  // Refused before anything is stored; checked again under the row lock below.
  if (!nextLetter(loaded.drawing.currentRevision)) throw lastRevision();
  const { files, fields } = await receiveUploads(deps.files, req, res, {
    workshopId: loaded.job.workshopId,
    userId: actor.userId,
    fields: addRevisionFieldsSchema,
  });
  try {
    const staff = actor.memberships.has(loaded.job.workshopId);
    const tradeId = staff ? null : loaded.drawing.createdByTradeId;
    await ds.transaction(async (m) => {
      const drawing = await m.findOne(Drawing, {
        where: { id: drawingId },
        lock: { mode: "pessimistic_write" },
      });
      if (!drawing) throw notFound("That drawing");
      const letter = nextLetter(drawing.currentRevision);
      if (!letter) throw lastRevision();
      const revision = m.create(DrawingRevision, {
        id: newId(),
        drawingId,
        letter,
        note: fields.note,
        fileId: files[0].id,
        uploadedByUserId: actor.userId,
        uploadedByTradeId: tradeId,
      });
      await m.insert(DrawingRevision, revision);
      await m.update(Drawing, { id: drawingId }, { currentRevision: letter });
      drawing.currentRevision = letter;
      await audit(m, {
        workshopId: drawing.workshopId,
        actorUserId: actor.userId,
        action: "drawing.revised",
        entityType: "drawing",
        entityId: drawingId,
        detail: { jobId: drawing.jobId, letter },
      });
      await notify(m, deps, loaded.job, drawing, revision, actor, tradeId);
    });
  } catch (err) {
    await deleteStoredFiles(deps.files, files);
    throw err;
  }
  return detail(ds, actor, await loadDrawing(ds, drawingId));
}

/** PATCH /drawings/:drawingId (workshop): title, sharing, tasks. */
export async function updateDrawing(
  deps: DrawingDeps,
  actor: Actor | null,
  drawingId: string,
  body: UpdateDrawingBody,
): Promise<DrawingDetail> {
  const { ds, appUrl } = deps;
  requireActor(actor);
  const loaded = await loadDrawing(ds, drawingId);
  authorize(actor, "drawing.update", loaded.resource);
  await checkTargets(ds.manager, loaded.job, body.taskIds, body.shareTradeIds);
  await ds.transaction(async (m) => {
    const before = await sharedAudience(
      m,
      loaded.drawing,
      loaded.job.customerId,
    );
    const changes: Partial<Drawing> = {};
    if (body.title !== undefined) changes.title = body.title;
    if (body.shareTradeKinds !== undefined)
      changes.shareTradeKinds = [...new Set(body.shareTradeKinds)];
    if (body.shareTradeIds !== undefined)
      changes.shareTradeIds = [...new Set(body.shareTradeIds)];
    if (body.shareWithCustomer !== undefined)
      changes.shareWithCustomer = body.shareWithCustomer;
    if (Object.keys(changes).length)
      await m.update(Drawing, { id: drawingId }, changes);
    if (body.taskIds !== undefined) {
      await m.delete(DrawingTask, { drawingId });
      await m.insert(
        DrawingTask,
        [...new Set(body.taskIds)].map((taskId) => ({ drawingId, taskId })),
      );
      // Only the tasks changed: touch the drawing so lists sort it as changed.
      if (!Object.keys(changes).length)
        await m.update(
          Drawing,
          { id: drawingId },
          { title: loaded.drawing.title },
        );
    }
    await audit(m, {
      workshopId: loaded.drawing.workshopId,
      actorUserId: actor.userId,
      action: "drawing.updated",
      entityType: "drawing",
      entityId: drawingId,
      detail: { jobId: loaded.drawing.jobId, fields: Object.keys(body) },
    });
    // Whoever can see it now and could not before is told once, like a new revision would.
    const drawing = await m.findOneByOrFail(Drawing, { id: drawingId });
    const added = await sharedAudience(m, drawing, loaded.job.customerId);
    for (const address of before.keys()) added.delete(address);
    if (added.size)
      await queueSharedNotices(m, {
        appUrl,
        workshop: await m.findOneByOrFail(Workshop, {
          id: loaded.job.workshopId,
        }),
        job: loaded.job,
        drawing,
        to: added,
      });
  });
  return detail(ds, actor, await loadDrawing(ds, drawingId));
}

/** DELETE /drawings/:drawingId (owner): the drawing, every revision and their stored files. */
export async function deleteDrawing(
  deps: DrawingDeps,
  actor: Actor | null,
  drawingId: string,
): Promise<void> {
  const { ds } = deps;
  requireActor(actor);
  const loaded = await loadDrawing(ds, drawingId);
  authorize(actor, "drawing.delete", loaded.resource);
  const revisions = await ds.manager.find(DrawingRevision, {
    where: { drawingId },
    relations: { file: true },
  });
  await ds.transaction(async (m) => {
    await m.delete(Drawing, { id: drawingId }); // revisions and task links go with it
    await audit(m, {
      workshopId: loaded.drawing.workshopId,
      actorUserId: actor.userId,
      action: "drawing.deleted",
      entityType: "drawing",
      entityId: drawingId,
      detail: { jobId: loaded.drawing.jobId, title: loaded.drawing.title },
    });
  });
  await deleteStoredFiles(
    deps.files,
    revisions.map((r) => r.file!).filter(Boolean),
  );
}

/** GET …/revisions/:letter/file and …/thumbnail, after the same visibility check as the drawing. */
export async function sendRevisionFile(
  deps: DrawingDeps,
  actor: Actor | null,
  drawingId: string,
  letter: string,
  res: Response,
  opts: { variant: "original" | "thumbnail"; inline: boolean },
): Promise<void> {
  requireActor(actor);
  const loaded = await loadDrawing(deps.ds, drawingId);
  authorize(actor, "drawing.read", loaded.resource);
  const revision = await deps.ds.manager.findOne(DrawingRevision, {
    where: { drawingId, letter },
    relations: { file: true },
  });
  if (!revision?.file) throw notFound(`Rev ${letter} of that drawing`);
  if (opts.variant === "thumbnail" && !revision.file.thumbnailKey)
    throw notFound(`A thumbnail of Rev ${letter}`);
  await sendStoredFile(deps.files, res, revision.file, opts);
}
