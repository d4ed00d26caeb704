import { In, type DataSource, type EntityManager } from "typeorm";
import type {
  DrawingResource,
  DrawingUploadResource,
  JobResource,
} from "../../policies";
import type { DrawingKind, TradeKind } from "../../../shared/schemas";
import { Booking } from "../bookings/bookings.entity";
import { ACTIVE_STATES, jobResources } from "../jobs/job-access";
import type { Job } from "../jobs/jobs.entity";
import { Trade } from "../trades/trades.entity";
import type { Drawing } from "./drawings.entity";

/** The job as the policy sees it, plus the kind of each trade on it (sharing by kind). */
export interface DrawingJobAccess {
  job: JobResource;
  tradeKinds: Map<string, TradeKind>;
}

export async function drawingJobAccess(
  ds: DataSource,
  job: Job,
): Promise<DrawingJobAccess> {
  return (await drawingJobAccesses(ds.manager, [job])).get(job.id)!;
}

/** `drawingJobAccess` for many jobs in two statements (the bookings, then their trades). */
export async function drawingJobAccesses(
  m: EntityManager,
  jobs: readonly Job[],
): Promise<Map<string, DrawingJobAccess>> {
  const resources = await jobResources(m, jobs);
  const ids = [
    ...new Set([...resources.values()].flatMap((r) => [...r.activeTradeIds])),
  ];
  const trades = ids.length ? await m.findBy(Trade, { id: In(ids) }) : [];
  const kinds = new Map(trades.map((t) => [t.id, t.kind]));
  const out = new Map<string, DrawingJobAccess>();
  for (const [jobId, job] of resources)
    out.set(jobId, {
      job,
      tradeKinds: new Map(
        [...job.activeTradeIds].map((id) => [id, kinds.get(id)!]),
      ),
    });
  return out;
}

/** The policy's view of one drawing. */
export function drawingResource(
  access: DrawingJobAccess,
  d: Drawing,
): DrawingResource {
  return {
    kind: "drawing",
    workshopId: d.workshopId,
    job: access.job,
    tradeKinds: access.tradeKinds,
    sharedTradeKinds: new Set(d.shareTradeKinds),
    sharedTradeIds: new Set(d.shareTradeIds),
    sharedWithCustomer: d.shareWithCustomer,
    createdByTradeId: d.createdByTradeId,
  };
}

/** The policy's view of an upload: its kind and, per task, the trades whose active booking holds it. */
export async function uploadResource(
  ds: DataSource,
  access: DrawingJobAccess,
  jobId: string,
  drawingKind: DrawingKind,
  taskIds: string[],
): Promise<DrawingUploadResource> {
  const bookings = taskIds.length
    ? await ds.manager.find(Booking, {
        where: { jobId, taskId: In(taskIds), state: In(ACTIVE_STATES) },
        select: { taskId: true, tradeId: true },
      })
    : [];
  return {
    kind: "drawingUpload",
    workshopId: access.job.workshopId,
    job: access.job,
    drawingKind,
    taskTradeIds: taskIds.map(
      (id) =>
        new Set(bookings.filter((b) => b.taskId === id).map((b) => b.tradeId)),
    ),
  };
}
