// The programme response and edit answers, in pure functions both sides use (issue 15): the one
// rule that turns a stored task into the engine's task input (the server builds its input with it,
// the client rebuilds the same input from the response), the diff of two programmes the server
// answers an edit with, and the merge the client lays that answer over its cached copy with.
import type { LinkInput, ProgrammeInput, TaskInput } from "../programme/types";
import type { Party } from "./common";
import type {
  ProgrammeEdit,
  ProgrammeResponse,
  ProgrammeTask,
} from "./programme";

/** The engine calendar id of a booked trade's own working days. */
export const tradeCalendarId = (tradeId: string) => `trade:${tradeId}`;

/** What the engine needs to know of a task: its stored fields and the booking that pins it. */
export interface EngineTaskFacts {
  id: string;
  name: string;
  party: Party;
  durationDays: number;
  notEarlierThan: string | null;
  actualStart: string | null;
  actualFinish: string | null;
  booking: { tradeId: string; start: string } | null;
}

/**
 * A task as the engine reads it. A workshop task works when the workshop and the site both do;
 * a booked trade task when that trade and the site do; an unbooked trade task on the site's days.
 * A booking pins the start until the task has actually started. `resources` names each booked
 * trade for clash checks (`programmeEngineSchema.resources`).
 */
export function taskEngineInput(
  t: EngineTaskFacts,
  resources: Readonly<Record<string, string>>,
): TaskInput {
  const b = t.booking;
  return {
    id: t.id,
    name: t.name,
    calendar:
      t.party === "workshop"
        ? ["workshop", "site"]
        : b
          ? [tradeCalendarId(b.tradeId), "site"]
          : ["site"],
    durationDays: t.durationDays,
    resource: b ? resources[b.tradeId] : null,
    notEarlierThan: t.notEarlierThan,
    bookedStart: b && !t.actualStart ? b.start : null,
    actualStart: t.actualStart,
    actualFinish: t.actualFinish,
  };
}

export interface EngineLinkFacts {
  fromTaskId: string;
  toTaskId: string;
  kind: NonNullable<LinkInput["kind"]>;
  lag: number;
  lagUnit: NonNullable<LinkInput["lagUnit"]>;
}

/** A "waits for" link as the engine reads it. */
export function linkEngineInput(l: EngineLinkFacts): LinkInput {
  return {
    from: l.fromTaskId,
    to: l.toTaskId,
    kind: l.kind,
    lag: l.lag,
    lagUnit: l.lagUnit,
  };
}

/** The exact engine input the server scheduled, rebuilt from its response. */
export function engineInputOf(p: ProgrammeResponse): ProgrammeInput {
  return {
    timeZone: p.timeZone,
    dataDate: p.dataDate,
    handover: p.handover,
    calendars: p.engine.calendars,
    tasks: p.tasks.map((t) => taskEngineInput(t, p.engine.resources)),
    links: p.links.map(linkEngineInput),
    busy: p.engine.busy,
  };
}

const same = (a: unknown, b: unknown) =>
  JSON.stringify(a) === JSON.stringify(b);

/**
 * Rows after an edit, in the order merging gives by itself: changed rows in their old place,
 * removed ones dropped, new ones at the end, then (tasks) a stable sort by `sortOrder`, the
 * server's order. The diff sends an explicit order only when this is not the server's.
 */
function merged<T extends { id: string }>(
  rows: readonly T[],
  changed: readonly T[],
  removed: readonly string[],
  sortOrder?: (row: T) => number,
): T[] {
  const byId = new Map(changed.map((r) => [r.id, r]));
  const gone = new Set(removed);
  const out = rows
    .filter((r) => !gone.has(r.id))
    .map((r) => byId.get(r.id) ?? r);
  const known = new Set(rows.map((r) => r.id));
  for (const r of changed) if (!known.has(r.id)) out.push(r);
  if (sortOrder) out.sort((a, b) => sortOrder(a) - sortOrder(b));
  return out;
}

function inOrder<T extends { id: string }>(
  rows: T[],
  order: readonly string[] | undefined,
): T[] {
  if (!order) return rows;
  const byId = new Map(rows.map((r) => [r.id, r]));
  return order.map((id) => {
    const row = byId.get(id);
    if (!row) throw new Error(`The edit orders a row it does not have: ${id}`);
    return row;
  });
}

const ids = (rows: readonly { id: string }[]) => rows.map((r) => r.id);
const bySortOrder = (t: ProgrammeTask) => t.sortOrder;

/** What changed from `before` to `after` (the same job), as an edit answer. */
export function programmeEditOf(
  before: ProgrammeResponse,
  after: ProgrammeResponse,
): ProgrammeEdit {
  const changedRows = <T extends { id: string }>(
    was: readonly T[],
    now: readonly T[],
  ) => {
    const old = new Map(was.map((r) => [r.id, r]));
    const kept = new Set(ids(now));
    return {
      changed: now.filter((r) => {
        const o = old.get(r.id);
        return !o || !same(o, r);
      }),
      removed: ids(was).filter((id) => !kept.has(id)),
    };
  };
  const tasks = changedRows(before.tasks, after.tasks);
  const links = changedRows(before.links, after.links);
  const results = changedRows(before.result.tasks, after.result.tasks);
  const taskMerge = merged(
    before.tasks,
    tasks.changed,
    tasks.removed,
    bySortOrder,
  );
  const linkMerge = merged(before.links, links.changed, links.removed);
  return {
    jobId: after.jobId,
    version: after.version,
    dataDate: after.dataDate,
    handover: after.handover,
    timeZone: after.timeZone,
    tasks: tasks.changed,
    removedTaskIds: tasks.removed,
    ...(same(ids(taskMerge), ids(after.tasks))
      ? {}
      : { taskOrder: ids(after.tasks) }),
    links: links.changed,
    removedLinkIds: links.removed,
    ...(same(ids(linkMerge), ids(after.links))
      ? {}
      : { linkOrder: ids(after.links) }),
    ...(same(before.engine, after.engine) ? {} : { engine: after.engine }),
    result: {
      finish: after.result.finish,
      handoverSlipDays: after.result.handoverSlipDays,
      ...(same(before.result.criticalPath, after.result.criticalPath)
        ? {}
        : { criticalPath: after.result.criticalPath }),
      tasks: results.changed,
    },
  };
}

/**
 * The cached programme with an edit's answer laid over it: what the server's programme is now,
 * without asking for it. The caller checks `edit.version === programme.version + 1` first (any
 * other version means someone else changed it too: reload instead).
 */
export function applyProgrammeEdit(
  p: ProgrammeResponse,
  edit: ProgrammeEdit,
): ProgrammeResponse {
  if (edit.jobId !== p.jobId)
    throw new Error("The edit is for another job's programme");
  const tasks = inOrder(
    merged(p.tasks, edit.tasks, edit.removedTaskIds, bySortOrder),
    edit.taskOrder,
  );
  const links = inOrder(
    merged(p.links, edit.links, edit.removedLinkIds),
    edit.linkOrder,
  );
  // The engine answers in its input's order, which is the tasks' order.
  const results = new Map(
    merged(p.result.tasks, edit.result.tasks, edit.removedTaskIds).map((r) => [
      r.id,
      r,
    ]),
  );
  return {
    jobId: p.jobId,
    version: edit.version,
    dataDate: edit.dataDate,
    handover: edit.handover,
    timeZone: edit.timeZone,
    tasks,
    links,
    engine: edit.engine ?? p.engine,
    result: {
      finish: edit.result.finish,
      handoverSlipDays: edit.result.handoverSlipDays,
      criticalPath: edit.result.criticalPath ?? p.result.criticalPath,
      tasks: tasks.flatMap((t) => {
        const r = results.get(t.id);
        return r ? [r] : [];
      }),
    },
  };
}

/**
 * The programme after an edit's answer, from the cached copy: laid over it when the answer is
 * the very next version, else null — someone else changed the programme in between (or nothing
 * is cached), so the caller reads it afresh instead.
 */
export function programmeAfterEdit(
  cached: ProgrammeResponse | undefined,
  edit: ProgrammeEdit,
): ProgrammeResponse | null {
  if (!cached || cached.jobId !== edit.jobId) return null;
  if (edit.version !== cached.version + 1) return null;
  return applyProgrammeEdit(cached, edit);
}
