import type { DataSource, EntityManager } from "typeorm";
import type { z } from "zod";
import {
  impactOf,
  ProgrammeInputError,
  scheduleProgramme,
  type Impact,
  type ProgrammeInput,
  type ProgrammeResult,
} from "../../../shared/programme";
import {
  lagProblem,
  engineInputOf,
  programmeEditOf,
  type ProgrammeChange,
  type ProgrammeEdit,
  type ProgrammeResponse,
  type createLinkBodySchema,
  type createTaskBodySchema,
  type progressBodySchema,
  type reorderBodySchema,
  type updateLinkBodySchema,
  type updateTaskBodySchema,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { lockingTransaction, lockJob, lockJobTrades } from "../../db/locks";
import { HttpError, notFound } from "../../http/errors";
import { authorize, requireActor, type Actor } from "../../policies";
import { AuditEntry } from "../audit/audit.entity";
import { audit } from "../audit/audit.service";
import { Job } from "../jobs/jobs.entity";
import { jobResource } from "../jobs/job-access";
import { User } from "../users/users.entity";
import { Workshop } from "../workshops/workshops.entity";
import { loadProgramme, type ProgrammeData } from "./programme-input";
import { Task, TaskLink } from "./programme.entity";
import { noteDay, postSystemNote } from "../thread/thread-notes";

/** Runs the engine; input it cannot schedule (a loop…) becomes a 422 naming the problem. */
export function schedule(input: ProgrammeInput): ProgrammeResult {
  try {
    return scheduleProgramme(input);
  } catch (err) {
    if (err instanceof ProgrammeInputError) {
      throw new HttpError(422, "unprocessable", err.problems.join(" "), {
        programme: err.problems,
      });
    }
    throw err;
  }
}

function present(
  job: Job,
  data: ProgrammeData,
  result: ProgrammeResult,
): ProgrammeResponse {
  return {
    jobId: job.id,
    version: job.version,
    dataDate: data.input.dataDate,
    handover: job.handoverDate,
    timeZone: job.timeZone,
    tasks: data.tasks.map((t) => {
      const b = data.bookingByTask.get(t.id);
      return {
        id: t.id,
        name: t.name,
        party: t.party,
        durationDays: Number(t.durationDays),
        sortOrder: t.sortOrder,
        notEarlierThan: t.notEarlierThan,
        actualStart: t.actualStart,
        actualFinish: t.actualFinish,
        customerNote: t.customerNote,
        internalNote: t.internalNote,
        hazards: t.hazards,
        booking: b
          ? {
              id: b.id,
              tradeId: b.tradeId,
              tradeName: data.trades.get(b.tradeId)?.businessName ?? "",
              state: b.state,
              start: b.start,
              finish: b.finish,
            }
          : null,
      };
    }),
    links: data.links.map((l) => ({
      id: l.id,
      fromTaskId: l.fromTaskId,
      toTaskId: l.toTaskId,
      kind: l.kind,
      lag: Number(l.lag),
      lagUnit: l.lagUnit,
    })),
    engine: data.engine,
    result,
  };
}

async function loadJob(m: EntityManager, jobId: string): Promise<Job> {
  const job = await m.findOneBy(Job, { id: jobId });
  if (!job) throw notFound("That job");
  return job;
}

/** The job's computed programme (workshop members). */
export async function getProgramme(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
): Promise<ProgrammeResponse> {
  requireActor(actor);
  const job = await loadJob(ds.manager, jobId);
  authorize(actor, "job.readFull", await jobResource(ds.manager, job));
  const workshop = await ds.manager.findOneByOrFail(Workshop, {
    id: job.workshopId,
  });
  const data = await loadProgramme(ds.manager, job, workshop);
  return present(job, data, schedule(data.input));
}

/** Says who changed the programme since the version the editor saw, for the 409 message. */
async function changesSince(
  m: EntityManager,
  job: Job,
  version: number,
): Promise<string> {
  const entries = await m
    .createQueryBuilder(AuditEntry, "a")
    .where("a.workshopId = :w", { w: job.workshopId })
    .andWhere("JSON_UNQUOTE(JSON_EXTRACT(a.detail, '$.jobId')) = :j", {
      j: job.id,
    })
    .andWhere("JSON_EXTRACT(a.detail, '$.toVersion') > :v", { v: version })
    .orderBy("a.createdAt", "ASC")
    .limit(5)
    .getMany();
  const names = new Map<string, string>();
  for (const e of entries) {
    if (e.actorUserId && !names.has(e.actorUserId))
      names.set(
        e.actorUserId,
        (await m.findOneBy(User, { id: e.actorUserId }))?.name ?? "Someone",
      );
  }
  const what = entries.map(
    (e) =>
      `${names.get(e.actorUserId ?? "") ?? "Someone"} ${String(e.detail.summary ?? e.action)}`,
  );
  return what.length ? ` Since you loaded it: ${what.join("; ")}.` : "";
}

/** The 409 for an edit made on an older version, saying who changed what since. */
async function staleVersion(
  m: EntityManager,
  job: Job,
  version: number,
): Promise<HttpError> {
  return new HttpError(
    409,
    "version-conflict",
    `Someone else changed this programme (now version ${job.version}, you had ${version}).${await changesSince(m, job, version)} Reload to see it, then make your change again.`,
  );
}

/**
 * One programme edit, all or nothing: refuse a stale version at once from an unlocked read (so
 * it never queues for the lock), then lock the job row and the trades booked on it (the locking
 * rule in server/db/locks.ts), check the version again, apply, re-check the whole programme with
 * the engine (a loop → 422), bump the version and leave an audit entry. Everything inside reads
 * and writes through `m`, the transaction's one connection. The answer is what changed between
 * the programme at the locked version and after the edit (issue 15), not the whole programme.
 */
async function editProgramme<T>(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  version: number,
  summary: string,
  apply: (m: EntityManager, job: Job, before: ProgrammeData) => Promise<T>,
): Promise<{ value: T; edit: ProgrammeEdit }> {
  requireActor(actor);
  const seen = await loadJob(ds.manager, jobId);
  authorize(actor, "job.update", await jobResource(ds.manager, seen));
  if (seen.version !== version)
    throw await staleVersion(ds.manager, seen, version);
  return lockingTransaction(ds, async (m) => {
    const job = await lockJob(m, jobId);
    if (job.version !== version) throw await staleVersion(m, job, version);
    await lockJobTrades(m, job.id);
    const workshop = await m.findOneByOrFail(Workshop, { id: job.workshopId });
    const beforeData = await loadProgramme(m, job, workshop);
    const before = present(job, beforeData, schedule(beforeData.input));
    const value = await apply(m, job, beforeData);
    const afterData = await loadProgramme(m, job, workshop);
    const result = schedule(afterData.input);
    await m.update(Job, { id: job.id }, { version: job.version + 1 });
    job.version += 1;
    await audit(m, {
      workshopId: job.workshopId,
      actorUserId: actor.userId,
      action: "programme.changed",
      entityType: "job",
      entityId: job.id,
      detail: { jobId: job.id, toVersion: job.version, summary },
    });
    return {
      value,
      edit: programmeEditOf(before, present(job, afterData, result)),
    };
  });
}

async function taskOf(
  m: EntityManager,
  job: Job,
  taskId: string,
): Promise<Task> {
  const task = await m.findOneBy(Task, { id: taskId, jobId: job.id });
  if (!task) throw notFound("That task");
  return task;
}

export async function createTask(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  body: z.output<typeof createTaskBodySchema>,
) {
  const { version, ...fields } = body;
  const { value, edit } = await editProgramme(
    ds,
    actor,
    jobId,
    version,
    `added "${fields.name}"`,
    async (m, job) => {
      const max = await m
        .createQueryBuilder(Task, "t")
        .select("MAX(t.sortOrder)", "max")
        .where("t.jobId = :j", { j: job.id })
        .getRawOne<{ max: number | null }>();
      const id = newId();
      await m.insert(Task, {
        id,
        workshopId: job.workshopId,
        jobId: job.id,
        ...fields,
        durationDays: String(fields.durationDays),
        actualStart: null,
        actualFinish: null,
        sortOrder: (max?.max ?? 0) + 1,
      });
      return id;
    },
  );
  return { ...edit, taskId: value };
}

export async function updateTask(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  taskId: string,
  body: z.output<typeof updateTaskBodySchema>,
) {
  const { version, ...fields } = body;
  const { edit } = await editProgramme(
    ds,
    actor,
    jobId,
    version,
    "edited a task",
    async (m, job) => {
      const task = await taskOf(m, job, taskId);
      const { durationDays, ...rest } = fields;
      await m.update(
        Task,
        { id: task.id },
        {
          ...rest,
          ...(durationDays !== undefined
            ? { durationDays: String(durationDays) }
            : {}),
        },
      );
    },
  );
  return edit;
}

export async function deleteTask(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  taskId: string,
  version: number,
) {
  const { edit } = await editProgramme(
    ds,
    actor,
    jobId,
    version,
    "removed a task",
    async (m, job) => {
      const task = await taskOf(m, job, taskId);
      await m.delete(Task, { id: task.id });
    },
  );
  return edit;
}

export async function reorderTasks(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  body: z.output<typeof reorderBodySchema>,
) {
  const { edit } = await editProgramme(
    ds,
    actor,
    jobId,
    body.version,
    "reordered the tasks",
    async (m, job) => {
      const tasks = await m.findBy(Task, { jobId: job.id });
      const ids = new Set(tasks.map((t) => t.id));
      if (
        body.taskIds.length !== ids.size ||
        !body.taskIds.every((id) => ids.has(id)) ||
        new Set(body.taskIds).size !== ids.size
      ) {
        throw new HttpError(
          422,
          "unprocessable",
          "List every task of the job exactly once.",
          { taskIds: ["List every task of the job exactly once"] },
        );
      }
      for (const [i, id] of body.taskIds.entries())
        await m.update(Task, { id }, { sortOrder: i + 1 });
    },
  );
  return edit;
}

export async function createLink(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  body: z.output<typeof createLinkBodySchema>,
) {
  const { version, ...fields } = body;
  const { edit } = await editProgramme(
    ds,
    actor,
    jobId,
    version,
    "added a link",
    async (m, job) => {
      await taskOf(m, job, fields.fromTaskId);
      await taskOf(m, job, fields.toTaskId);
      if (
        await m.findOneBy(TaskLink, {
          fromTaskId: fields.fromTaskId,
          toTaskId: fields.toTaskId,
        })
      ) {
        throw new HttpError(
          409,
          "conflict",
          "That task already waits for this one; edit the existing link instead.",
          { fromTaskId: ["Already linked"] },
        );
      }
      await m.insert(TaskLink, {
        id: newId(),
        workshopId: job.workshopId,
        jobId: job.id,
        ...fields,
        lag: String(fields.lag),
      });
    },
  );
  return edit;
}

export async function updateLink(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  linkId: string,
  body: z.output<typeof updateLinkBodySchema>,
) {
  const { version, ...fields } = body;
  const { edit } = await editProgramme(
    ds,
    actor,
    jobId,
    version,
    "edited a link",
    async (m, job) => {
      const link = await m.findOneBy(TaskLink, { id: linkId, jobId: job.id });
      if (!link) throw notFound("That link");
      const lagUnit = fields.lagUnit ?? link.lagUnit;
      const lag = fields.lag ?? Number(link.lag);
      // The same rule as the schema's, against the stored unit when only the lag is sent.
      const problem = lagProblem(lag, lagUnit);
      if (problem)
        throw new HttpError(400, "validation", `${problem}.`, {
          lag: [problem],
        });
      await m.update(
        TaskLink,
        { id: link.id },
        { kind: fields.kind ?? link.kind, lagUnit, lag: String(lag) },
      );
    },
  );
  return edit;
}

export async function deleteLink(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  linkId: string,
  version: number,
) {
  const { edit } = await editProgramme(
    ds,
    actor,
    jobId,
    version,
    "removed a link",
    async (m, job) => {
      const link = await m.findOneBy(TaskLink, { id: linkId, jobId: job.id });
      if (!link) throw notFound("That link");
      await m.delete(TaskLink, { id: link.id });
    },
  );
  return edit;
}

/** Marks a task started or done (or undoes it) with its actual dates. */
export async function recordProgress(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  taskId: string,
  body: z.output<typeof progressBodySchema>,
) {
  const state = body.actualFinish
    ? "done"
    : body.actualStart
      ? "started"
      : "not started";
  const { edit } = await editProgramme(
    ds,
    actor,
    jobId,
    body.version,
    `marked a task ${state}`,
    async (m, job) => {
      const task = await taskOf(m, job, taskId);
      await m.update(
        Task,
        { id: task.id },
        { actualStart: body.actualStart, actualFinish: body.actualFinish },
      );
      // Progress is news for the whole job (customer too); only the task's name and day are said.
      if (body.actualFinish && !task.actualFinish)
        await postSystemNote(
          m,
          job,
          "job",
          `Done: ${task.name} (${noteDay(body.actualFinish)}).`,
        );
      else if (body.actualStart && !body.actualFinish && !task.actualStart)
        await postSystemNote(
          m,
          job,
          "job",
          `Started: ${task.name} (${noteDay(body.actualStart)}).`,
        );
    },
  );
  return edit;
}

function withChanges(
  input: ProgrammeInput,
  changes: ProgrammeChange[],
): ProgrammeInput {
  const byId = new Map(changes.map((c) => [c.taskId, c]));
  for (const c of changes) {
    if (!input.tasks.some((t) => t.id === c.taskId))
      throw new HttpError(
        404,
        "not-found",
        "A task in the change is not in this programme.",
      );
  }
  return {
    ...input,
    tasks: input.tasks.map((t) => {
      const c = byId.get(t.id);
      if (!c) return t;
      return {
        ...t,
        ...(c.notEarlierThan !== undefined
          ? { notEarlierThan: c.notEarlierThan }
          : {}),
        ...(c.durationDays !== undefined
          ? { durationDays: c.durationDays }
          : {}),
      };
    }),
  };
}

/** What a proposed change would do, computed by the server without saving anything. */
export async function previewChange(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  version: number,
  changes: ProgrammeChange[],
): Promise<{ impact: Impact; result: ProgrammeResult }> {
  const current = await getProgramme(ds, actor, jobId);
  if (current.version !== version) {
    throw new HttpError(
      409,
      "version-conflict",
      `Someone else changed this programme (now version ${current.version}, you had ${version}). Reload to see it.`,
    );
  }
  const before = engineInputOf(current);
  const after = withChanges(before, changes);
  return { impact: impactOf(before, after), result: schedule(after) };
}

/** Runs inside the apply transaction with the server's own impact: re-confirming moved bookings. */
export type AfterApply = (
  m: EntityManager,
  job: Job,
  impact: Impact,
  actorUserId: string,
) => Promise<void>;

/** Applies a previewed change; the server recomputes its impact itself (a client preview is never trusted). */
export async function applyChange(
  ds: DataSource,
  actor: Actor | null,
  jobId: string,
  version: number,
  changes: ProgrammeChange[],
  afterApply?: AfterApply,
) {
  const { value: impact, edit } = await editProgramme(
    ds,
    actor,
    jobId,
    version,
    `moved ${changes.length === 1 ? "a task" : `${changes.length} tasks`}`,
    async (m, job, beforeData) => {
      const workshop = await m.findOneByOrFail(Workshop, {
        id: job.workshopId,
      });
      const before = beforeData.input;
      for (const c of changes) {
        const task = await taskOf(m, job, c.taskId);
        await m.update(
          Task,
          { id: task.id },
          {
            ...(c.notEarlierThan !== undefined
              ? { notEarlierThan: c.notEarlierThan }
              : {}),
            ...(c.durationDays !== undefined
              ? { durationDays: String(c.durationDays) }
              : {}),
          },
        );
      }
      const after = (await loadProgramme(m, job, workshop)).input;
      schedule(after);
      const impact = impactOf(before, after);
      if (afterApply) await afterApply(m, job, impact, actor!.userId);
      return impact;
    },
  );
  return { ...edit, impact };
}
