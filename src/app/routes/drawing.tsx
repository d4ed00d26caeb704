import { Link, useNavigate, useParams } from "react-router-dom";
import type { JobDetail, TradeKind } from "../../../shared/schemas";
import { useJob } from "../../features/jobs/api/get-job";
import { DrawingPage } from "../../features/drawings/components/DrawingPage";
import type { ShareOptions } from "../../features/drawings/share";

/** Who on a job a drawing can be shared with: the trade kinds with tasks, its trades, its customer. */
export function shareOptionsOf(job: JobDetail | undefined): ShareOptions {
  if (!job) return { tradeKinds: [], trades: [], customerName: null };
  const tradeKinds = [
    ...new Set(
      job.tasks
        .map((t) => t.party)
        .filter((p): p is TradeKind => p !== "workshop"),
    ),
  ];
  const trades = job.parties
    .filter((p) => p.kind === "trade" && p.tradeKind)
    .map((p) => ({ id: p.id, name: p.name, kind: p.tradeKind as TradeKind }));
  const customer = job.parties.find((p) => p.kind === "customer");
  return { tradeKinds, trades, customerName: customer?.name ?? null };
}

/** A drawing on a job: the drawings feature, with the job's people and task cautions. */
export function DrawingRoute() {
  const { jobId = "", drawingId = "" } = useParams();
  const navigate = useNavigate();
  const job = useJob(jobId);
  const caution = (taskId: string) =>
    job.data?.tasks.find((t) => t.id === taskId)?.detail?.caution ?? null;
  return (
    <>
      <p className="mb-3 text-sm">
        <Link
          to={`/jobs/${encodeURIComponent(jobId)}`}
          className="text-accent underline underline-offset-2"
        >
          ← {job.data?.title ?? "Back to the job"}
        </Link>
      </p>
      <DrawingPage
        drawingId={drawingId}
        shareOptions={shareOptionsOf(job.data)}
        cautionFor={caution}
        asCustomer={job.data?.viewerRole === "customer"}
        onDeleted={() =>
          navigate(`/jobs/${encodeURIComponent(jobId)}`, { replace: true })
        }
      />
    </>
  );
}
