import { Link, useLocation, useParams } from "react-router-dom";
import {
  BookingAnswerBanner,
  BookingAnswerForm,
  BookingFacts,
} from "../../features/bookings/components/BookingLinkPage";
import { JobThread } from "../../features/thread/components/JobThread";
import { useAnswerVisit } from "../../features/visits/api/answer-visit";
import { useVisit } from "../../features/visits/api/get-visit";
import { VisitActions } from "../../features/visits/components/VisitActions";
import {
  VisitDrawings,
  VisitFacts,
} from "../../features/visits/components/VisitCard";
import {
  Card,
  ErrorState,
  LoadingState,
  PageHeader,
} from "../../components/ui";
import { isApiError } from "../../lib/api-client";
import { useScrollTarget } from "../../lib/use-scroll-target";

function BackLink() {
  return (
    <p className="mb-3 text-sm">
      <Link to="/" className="text-accent underline underline-offset-2">
        ← All your visits
      </Link>
    </p>
  );
}

/**
 * `/visits/:bookingId`: a trade's own visit, signed in. Everything the confirmation-link page
 * shows (its components, fed by the visit), what they can do on it, and the job's thread.
 */
export function VisitRoute() {
  const { bookingId = "" } = useParams();
  const detail = useVisit(bookingId);
  const answer = useAnswerVisit(bookingId);
  // "Propose another start" on the home list lands on the answer form.
  const { hash } = useLocation();
  useScrollTarget(
    detail.isSuccess && hash ? decodeURIComponent(hash.slice(1)) : null,
  );
  if (detail.isPending)
    return (
      <>
        <BackLink />
        <h1 className="sr-only">Your visit</h1>
        <LoadingState label="Loading your visit…" />
      </>
    );
  if (detail.isError) {
    const missing =
      isApiError(detail.error) && [400, 403, 404].includes(detail.error.status);
    return (
      <>
        <BackLink />
        <PageHeader title={missing ? "Visit not found" : "Your visit"} />
        <ErrorState
          error={detail.error}
          title={missing ? "There's no visit of yours here" : undefined}
          onRetry={() => detail.refetch()}
        />
      </>
    );
  }
  const { visit, page } = detail.data;
  return (
    <>
      <BackLink />
      <PageHeader
        title={visit.taskName}
        eyebrow={`${visit.workshopName} · ${visit.jobTitle}`}
        description={`For ${visit.tradeBusinessName}`}
      />
      <div className="flex flex-col gap-5">
        <BookingAnswerBanner page={page} />
        <Card className="p-4">
          <VisitFacts visit={visit} statusOnly />
        </Card>
        <BookingFacts page={page} />
        {page.status === "current" && page.canAnswer && visit.can.answer ? (
          <BookingAnswerForm page={page} ready answer={answer} />
        ) : null}
        <VisitActions visit={visit} />
        <VisitDrawings visit={visit} />
        {visit.can.upload ? (
          <div id="visit-thread">
            <JobThread jobId={visit.jobId} audience="trades" />
          </div>
        ) : null}
      </div>
    </>
  );
}
