import { In, type DataSource } from "typeorm";
import type {
  DrawingResource,
  DrawingUploadResource,
  JobResource,
} from "../../policies";
import type { DrawingKind, TradeKind } from "../../../shared/schemas";
import { Booking } from "../bookings/bookings.entity";
import { ACTIVE_STATES, jobResource } from "../jobs/job-access";
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
  const resource = await jobResource(ds.manager, job);
  const ids = [...resource.activeTradeIds];
  const trades = ids.length
    ? await ds.manager.findBy(Trade, { id: In(ids) })
    : [];
  return {
    job: resource,
    tradeKinds: new Map(trades.map((t) => [t.id, t.kind])),
  };
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
