import { useState } from "react";
import { useNavigate, useSearchParams } from "react-router-dom";
import { AttentionList } from "../../features/attention/components/AttentionList";
import { useCustomers } from "../../features/customers/api/list-customers";
import { AddCustomerForm } from "../../features/customers/components/AddCustomerForm";
import { useJobs } from "../../features/jobs/api/list-jobs";
import { JobsTable } from "../../features/jobs/components/JobsTable";
import { NewJobForm } from "../../features/jobs/components/NewJobForm";
import { useStarterNames } from "../../features/jobs/components/starter-names";
import { useWorkshop } from "../../features/settings/api/get-workshop";
import { useTrades } from "../../features/trades/api/list-trades";
import {
  Button,
  EmptyState,
  LinkButton,
  ErrorState,
  LoadingState,
  PageHeader,
  Section,
} from "../../components/ui";
import { errorMessage } from "../../lib/api-client";
import { homeTitle, type Membership } from "../../features/auth/viewer";
import { useActiveWorkshop } from "../active-workshop";
import { useViewer } from "../layout/guards";
import { TradeHome } from "./trade-home";
import { CustomerHome, CustomerJobs } from "./customer-home";

function NewJobPanel({
  workshop,
  onClose,
}: {
  workshop: Membership;
  onClose: () => void;
}) {
  const navigate = useNavigate();
  const customers = useCustomers(workshop.workshopId);
  const settings = useWorkshop(workshop.workshopId);
  return (
    <Section title="New job" id="new-job" className="mb-6">
      <NewJobForm
        workshopId={workshop.workshopId}
        customers={customers.data}
        customersLoading={customers.isPending}
        customersError={
          customers.isError
            ? `Customers could not be loaded: ${errorMessage(customers.error)}`
            : null
        }
        renderAddCustomer={(onAdded, onCancel) => (
          <AddCustomerForm
            workshopId={workshop.workshopId}
            onCreated={(c) => onAdded(c.id)}
            onCancel={onCancel}
          />
        )}
        onCreated={(job) => navigate(`/jobs/${job.id}`)}
        onCancel={onClose}
        defaults={settings.data}
      />
    </Section>
  );
}

/**
 * A trade who is also a customer (their own home being fitted): below their visits as a trade,
 * the visits to their home, job by job, as any customer sees them.
 */
function VisitsToYourHome() {
  const jobs = useJobs();
  const own = (jobs.data ?? []).filter((j) => j.viewerRole === "customer");
  return (
    <section
      aria-labelledby="visits-to-your-home"
      className="mt-10 flex flex-col gap-6 border-t border-rule pt-8"
    >
      <div>
        <h2 id="visits-to-your-home" className="text-xl font-semibold">
          Visits to your home
        </h2>
        <p className="text-sm text-ink-soft">
          Jobs where you are the customer: who comes to your home, and when.
        </p>
      </div>
      {jobs.isPending ? (
        <LoadingState label="Loading your jobs…" />
      ) : jobs.isError ? (
        <ErrorState error={jobs.error} onRetry={() => jobs.refetch()} />
      ) : own.length === 0 ? (
        <EmptyState title="No jobs at your home yet">
          When the workshop adds your install, it appears here.
        </EmptyState>
      ) : (
        <CustomerJobs jobs={own} />
      )}
    </section>
  );
}

/** The owner's reminder that the set-up after sign-up is not finished (issue 14). */
function FinishSettingUp({ workshopId }: { workshopId: string }) {
  const settings = useWorkshop(workshopId);
  if (!settings.data || settings.data.setupCompletedAt) return null;
  return (
    <div
      role="status"
      className="mb-6 flex flex-wrap items-center justify-between gap-3 rounded border border-accent/40 bg-accent-wash px-4 py-3"
    >
      <p className="text-sm">
        <span className="font-semibold">Your workshop is not set up yet.</span>{" "}
        Nation, working days and hours, arrival times and reminders.
      </p>
      <LinkButton to="/setup" size="sm">
        Finish setting up
      </LinkButton>
    </div>
  );
}

/**
 * A workshop with no jobs yet: what to do next, in the trade's words, with the buttons for it
 * (add the trades first when there are none), instead of an empty table.
 */
function FirstSteps({
  workshopId,
  onNewJob,
}: {
  workshopId: string;
  onNewJob: () => void;
}) {
  const trades = useTrades(workshopId);
  const starters = useStarterNames(workshopId);
  const noTrades = trades.data?.length === 0;
  return (
    <EmptyState
      title="No jobs yet"
      action={
        <div className="flex flex-wrap justify-center gap-2">
          {noTrades ? (
            <LinkButton to="/trades" variant="secondary">
              Add your trades
            </LinkButton>
          ) : null}
          <Button onClick={onNewJob}>Start a job from a starter</Button>
        </div>
      }
    >
      {noTrades ? "Add the trades you work with, then start" : "Start"} a job
      from a starter{starters ? ` — ${starters}` : ""}. Its tasks come ready,
      dated from your first free day; then book the trades it needs.
    </EmptyState>
  );
}

/** Home: the workshop's jobs for members; a trade's or customer's own jobs otherwise. */
export function HomeRoute() {
  const viewer = useViewer();
  const { active } = useActiveWorkshop();
  const jobs = useJobs();
  // "?new=job" (the set-up's "Start a job") opens the New job form at once.
  const [search] = useSearchParams();
  const [creating, setCreating] = useState(search.get("new") === "job");

  const isMember = !!active;
  const all = jobs.data ?? [];
  const workshopJobs = isMember
    ? all.filter((j) => j.workshopId === active.workshopId)
    : all;
  // A member may also be a trade or customer of another workshop; keep those jobs visible.
  const otherJobs = isMember
    ? all.filter((j) => j.workshopId !== active.workshopId)
    : [];
  const isCustomer =
    !isMember &&
    viewer.user.trades.length === 0 &&
    viewer.user.customers.length > 0;
  // A trade's home is their visits across every workshop, not a list of jobs; a trade who is
  // also a customer gets the visits to their own home below.
  if (!isMember && viewer.user.trades.length > 0)
    return (
      <>
        <TradeHome />
        {viewer.user.customers.length > 0 ? <VisitsToYourHome /> : null}
      </>
    );

  return (
    <>
      <PageHeader
        title={homeTitle(viewer)}
        eyebrow={active?.workshopName}
        description={
          isMember
            ? undefined
            : isCustomer
              ? "Who comes to your home, and when."
              : "Jobs where you have work, with what comes next."
        }
        actions={
          isMember && !creating ? (
            <Button
              onClick={() => setCreating(true)}
              aria-controls="new-job"
              aria-expanded={creating}
            >
              New job
            </Button>
          ) : null
        }
      />
      {isMember && active.role === "owner" ? (
        <FinishSettingUp workshopId={active.workshopId} />
      ) : null}
      {isMember && creating ? (
        <NewJobPanel workshop={active} onClose={() => setCreating(false)} />
      ) : null}

      {jobs.isPending ? (
        <LoadingState label="Loading jobs…" />
      ) : jobs.isError ? (
        <ErrorState error={jobs.error} onRetry={() => jobs.refetch()} />
      ) : isMember && workshopJobs.length === 0 && otherJobs.length === 0 ? (
        creating ? null : (
          <FirstSteps
            workshopId={active.workshopId}
            onNewJob={() => setCreating(true)}
          />
        )
      ) : workshopJobs.length === 0 && otherJobs.length === 0 ? (
        <EmptyState title="No jobs yet">
          {isCustomer
            ? "When the workshop adds your install, it appears here."
            : "When a workshop books you for a job, it appears here."}
        </EmptyState>
      ) : isCustomer ? (
        // The customer's home is their timeline of visits, not a list of jobs.
        <CustomerHome
          jobs={workshopJobs.filter((j) => j.viewerRole === "customer")}
        />
      ) : (
        <div className="flex flex-col gap-8">
          {/* Members: what needs the workshop now, above the jobs it comes from. */}
          {isMember ? <AttentionList workshopId={active.workshopId} /> : null}
          {workshopJobs.length > 0 ? (
            <JobsTable
              jobs={workshopJobs}
              variant={isMember ? "workshop" : "party"}
              caption={
                isMember ? `Jobs of ${active.workshopName}` : "Your jobs"
              }
            />
          ) : isMember ? (
            <EmptyState title={`No jobs in ${active.workshopName} yet`} />
          ) : null}
          {otherJobs.length > 0 ? (
            <section aria-labelledby="other-jobs">
              <h2 id="other-jobs" className="mb-3 text-lg font-semibold">
                Jobs with other workshops
              </h2>
              <JobsTable
                jobs={otherJobs}
                variant="party"
                caption="Jobs with other workshops"
              />
            </section>
          ) : null}
        </div>
      )}
    </>
  );
}
