import { In, Not, type DataSource, type EntityManager } from "typeorm";
import type { z } from "zod";
import { firstFreeStart, type BusyInput } from "../../../shared/programme";
import type {
  StarterLink,
  StarterResponse,
  StarterTask,
  starterBodySchema,
} from "../../../shared/schemas";
import { newId } from "../../db/columns";
import { HttpError, notFound } from "../../http/errors";
import { authorize, type Actor } from "../../policies";
import { audit } from "../audit/audit.service";
import { Job } from "../jobs/jobs.entity";
import { loadProgramme } from "../programme/programme-input";
import { Task, TaskLink } from "../programme/programme.entity";
import { schedule } from "../programme/programme.service";
import { Workshop } from "../workshops/workshops.entity";
import { defaultStarters } from "./default-starters";
import { ProgrammeStarter } from "./starters.entity";
import { starterBodySchema as bodySchema } from "../../../shared/schemas";

const present = (s: ProgrammeStarter): StarterResponse => ({
  id: s.id,
  name: s.name,
  description: s.description,
  tasks: s.tasks,
  links: s.links,
});

/** Gives a workshop the default starting programmes (alcove cabinets, fitted wardrobe, bookcase wall). */
export async function addDefaultStarters(
  m: EntityManager,
  workshopId: string,
): Promise<void> {
  for (const body of defaultStarters) {
    const s = bodySchema.parse(body);
    await m.insert(ProgrammeStarter, { id: newId(), workshopId, ...s });
  }
}

export async function listStarters(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
): Promise<StarterResponse[]> {
  authorize(actor, "starters.read", { kind: "workshop", workshopId });
  return (
    await ds
      .getRepository(ProgrammeStarter)
      .find({ where: { workshopId }, order: { name: "ASC" } })
  ).map(present);
}

/**
 * Checks a starter with the programme engine, as every live programme edit is checked: its tasks
 * (by key, with their names), its links as written, on the default calendar from today. What the
 * engine refuses — a loop, a task waiting for itself — is the programme's 422, naming the tasks,
 * so no job made from the starter can be born unschedulable (issue 13).
 */
export function checkStarter(s: {
  tasks: StarterTask[];
  links: StarterLink[];
}): void {
  schedule({
    dataDate: new Date().toISOString().slice(0, 10),
    tasks: s.tasks.map((t) => ({
      id: t.key,
      name: t.name,
      durationDays: t.durationDays,
    })),
    links: s.links.map((l) => ({
      from: l.from,
      to: l.to,
      kind: l.kind,
      lag: l.lag,
      lagUnit: l.lagUnit,
    })),
  });
}

/** Replaces a starter's content after the engine's check; nothing is saved when it refuses. */
export async function replaceStarter(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  starterId: string,
  body: z.output<typeof starterBodySchema>,
): Promise<StarterResponse> {
  authorize(actor, "starters.update", { kind: "workshop", workshopId });
  const starter = await ds
    .getRepository(ProgrammeStarter)
    .findOneBy({ id: starterId, workshopId });
  if (!starter) throw notFound("That starting programme");
  checkStarter(body);
  await ds.transaction(async (m) => {
    await m.update(ProgrammeStarter, { id: starterId }, body);
    await audit(m, {
      workshopId,
      actorUserId: actor!.userId,
      action: "starter.updated",
      entityType: "starter",
      entityId: starterId,
      detail: { name: body.name },
    });
  });
  return present(
    await ds.getRepository(ProgrammeStarter).findOneByOrFail({ id: starterId }),
  );
}

/** Deletes a starter (owner); jobs made from it keep their own tasks and links. */
export async function deleteStarter(
  ds: DataSource,
  actor: Actor | null,
  workshopId: string,
  starterId: string,
): Promise<void> {
  authorize(actor, "starters.delete", { kind: "workshop", workshopId });
  const starter = await ds
    .getRepository(ProgrammeStarter)
    .findOneBy({ id: starterId, workshopId });
  if (!starter) throw notFound("That starting programme");
  await ds.transaction(async (m) => {
    await m.delete(ProgrammeStarter, { id: starterId });
    await audit(m, {
      workshopId,
      actorUserId: actor!.userId,
      action: "starter.deleted",
      entityType: "starter",
      entityId: starterId,
      detail: { name: starter.name },
    });
  });
}

const CREW = "The workshop's fitting crew";

/**
 * Puts a starter's tasks and links into a new job, dated from the workshop's first free start:
 * the workshop's own tasks on its other open jobs count as busy for its one fitting crew, and the
 * engine's first-free-start search places the first workshop task.
 */
export async function applyStarter(
  m: EntityManager,
  job: Job,
  starterId: string,
): Promise<void> {
  const starter = await m.findOneBy(ProgrammeStarter, {
    id: starterId,
    workshopId: job.workshopId,
  });
  if (!starter)
    throw new HttpError(
      422,
      "unprocessable",
      "That starting programme is not one of this workshop's.",
      { starterId: ["Choose one of the workshop's starting programmes"] },
    );
  // A starter saved before the engine checked starters may hold a loop: refuse it here (422,
  // the transaction rolls the job back) rather than make a job whose programme never loads.
  checkStarter(starter);
  const ids = new Map(starter.tasks.map((t) => [t.key, newId()]));
  for (const [i, t] of starter.tasks.entries()) {
    await m.insert(Task, {
      id: ids.get(t.key)!,
      workshopId: job.workshopId,
      jobId: job.id,
      name: t.name,
      party: t.party,
      durationDays: String(t.durationDays),
      notEarlierThan: null,
      actualStart: null,
      actualFinish: null,
      customerNote: t.customerNote,
      internalNote: "",
      hazards: t.hazards,
      sortOrder: i + 1,
    });
  }
  for (const l of starter.links) {
    await m.insert(TaskLink, {
      id: newId(),
      workshopId: job.workshopId,
      jobId: job.id,
      fromTaskId: ids.get(l.from)!,
      toTaskId: ids.get(l.to)!,
      kind: l.kind,
      lag: String(l.lag),
      lagUnit: l.lagUnit,
    });
  }

  const workshop = await m.findOneByOrFail(Workshop, { id: job.workshopId });
  const busy: BusyInput[] = [];
  const open = await m.findBy(Job, {
    workshopId: job.workshopId,
    id: Not(job.id),
    status: In(["planned", "on-site"]),
  });
  for (const other of open) {
    const data = await loadProgramme(m, other, workshop);
    const result = schedule(data.input);
    for (const t of data.tasks) {
      const r = result.tasks.find((x) => x.id === t.id);
      if (
        t.party === "workshop" &&
        Number(t.durationDays) > 0 &&
        r &&
        !t.actualFinish
      )
        busy.push({
          resource: CREW,
          start: r.plannedStart,
          finish: r.plannedFinish,
          ref: other.title,
        });
    }
  }
  const data = await loadProgramme(m, job, workshop);
  const hasPredecessor = new Set(starter.links.map((l) => l.to));
  const root = starter.tasks.find(
    (t) =>
      !hasPredecessor.has(t.key) &&
      t.party === "workshop" &&
      t.durationDays > 0,
  );
  if (!root) return;
  const input = {
    ...data.input,
    tasks: data.input.tasks.map((t) =>
      data.tasks.find((x) => x.id === t.id)?.party === "workshop" &&
      t.durationDays > 0
        ? { ...t, resource: CREW }
        : t,
    ),
    busy: [...(data.input.busy ?? []), ...busy],
  };
  const free = firstFreeStart(input, ids.get(root.key)!);
  if (free)
    await m.update(
      Task,
      { id: ids.get(root.key)! },
      { notEarlierThan: free.start.slice(0, 10) },
    );
}
