import type {
  DrawingDetail,
  DrawingRevisionView,
  DrawingSharing,
  DrawingSummary,
  DrawingTaskView,
} from "../../../shared/schemas";
import type { ProgrammeResult } from "../../../shared/programme";
import type { StoredFile } from "../files/files.entity";
import { presentFile } from "../files/files.presenter";
import type { ProgrammeData } from "../programme/programme-input";
import type { Task } from "../programme/programme.entity";
import type { Trade } from "../trades/trades.entity";
import type { Drawing, DrawingRevision } from "./drawings.entity";

/** Types a browser may show in place (the files module sends others as attachments regardless). */
const PREVIEWABLE = new Set([
  "application/pdf",
  "image/png",
  "image/jpeg",
  "image/webp",
]);

export interface RevisionRow {
  revision: DrawingRevision;
  file: StoredFile;
  uploaderName: string;
  uploaderTrade: Trade | null;
}

/** Who looks: the workshop sees sharing and every booking; a trade their own; the customer sent-or-later ones. */
export interface Viewer {
  staff: boolean;
  customer: boolean;
  tradeIds: ReadonlySet<string>;
}

export function presentRevision(
  d: Drawing,
  r: RevisionRow,
): DrawingRevisionView {
  const base = `/api/drawings/${d.id}/revisions/${r.revision.letter}`;
  return {
    letter: r.revision.letter,
    note: r.revision.note,
    uploadedBy: {
      name: r.uploaderName,
      role: r.uploaderTrade ? "trade" : "workshop",
      tradeName: r.uploaderTrade?.businessName ?? null,
    },
    uploadedAt: r.revision.createdAt.toISOString(),
    file: presentFile(r.file),
    downloadUrl: `${base}/file`,
    previewUrl: PREVIEWABLE.has(r.file.mimeType)
      ? `${base}/file?inline=1`
      : null,
    thumbnailUrl: r.file.thumbnailKey ? `${base}/thumbnail` : null,
  };
}

export function presentSharing(
  d: Drawing,
  trades: ReadonlyMap<string, Trade>,
): DrawingSharing {
  return {
    tradeKinds: [...d.shareTradeKinds],
    trades: d.shareTradeIds
      .map((id) => trades.get(id))
      .filter((t): t is Trade => t !== undefined)
      .map((t) => ({ id: t.id, name: t.businessName, kind: t.kind })),
    customer: d.shareWithCustomer,
  };
}

export function presentSummary(
  d: Drawing,
  ctx: {
    viewer: Viewer;
    /** Newest first. */
    revisions: RevisionRow[];
    tasks: Task[];
    trades: ReadonlyMap<string, Trade>;
  },
): DrawingSummary {
  return {
    id: d.id,
    jobId: d.jobId,
    title: d.title,
    kind: d.kind,
    currentRevision: d.currentRevision,
    revisionCount: ctx.revisions.length,
    updatedAt: d.updatedAt.toISOString(),
    current: presentRevision(d, ctx.revisions[0]),
    tasks: ctx.tasks.map((t) => ({ id: t.id, name: t.name })),
    sharing: ctx.viewer.staff ? presentSharing(d, ctx.trades) : null,
  };
}

/** A linked task with the engine's own planned dates and readiness (the programme page's numbers). */
export function presentDrawingTask(
  task: Task,
  data: ProgrammeData,
  result: ProgrammeResult,
  viewer: Viewer,
): DrawingTaskView {
  const byId = new Map(result.tasks.map((r) => [r.id, r]));
  const names = new Map(data.tasks.map((t) => [t.id, t.name]));
  const r = byId.get(task.id)!;
  const b = data.bookingByTask.get(task.id);
  const trade = b ? data.trades.get(b.tradeId) : undefined;
  const showBooking =
    b !== undefined &&
    trade !== undefined &&
    (viewer.staff || viewer.customer || viewer.tradeIds.has(b.tradeId));
  return {
    id: task.id,
    name: task.name,
    party: task.party,
    plannedStart: r.plannedStart,
    plannedFinish: r.plannedFinish,
    readiness: {
      state: r.readiness.state,
      clearFrom: r.readiness.state === "clear" ? r.plannedStart : null,
      waitingOn: r.readiness.waitingOn.map((w) => ({
        taskId: w.task,
        name: names.get(w.task) ?? "",
        plannedFinish: byId.get(w.task)?.plannedFinish ?? null,
        allowsFrom: w.allowsFrom,
      })),
    },
    booking: showBooking
      ? {
          tradeId: b.tradeId,
          tradeName: trade.businessName,
          tradeKind: trade.kind,
          state: b.state,
        }
      : null,
  };
}

export function presentDetail(
  d: Drawing,
  ctx: {
    jobTitle: string;
    viewer: Viewer;
    revisions: RevisionRow[];
    tasks: DrawingTaskView[];
    trades: ReadonlyMap<string, Trade>;
    can: DrawingDetail["can"];
  },
): DrawingDetail {
  return {
    id: d.id,
    jobId: d.jobId,
    jobTitle: ctx.jobTitle,
    title: d.title,
    kind: d.kind,
    currentRevision: d.currentRevision,
    createdAt: d.createdAt.toISOString(),
    updatedAt: d.updatedAt.toISOString(),
    sharing: ctx.viewer.staff ? presentSharing(d, ctx.trades) : null,
    revisions: ctx.revisions.map((r) => presentRevision(d, r)),
    tasks: ctx.tasks,
    can: ctx.can,
  };
}
