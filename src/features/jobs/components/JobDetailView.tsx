import type { JobDetail, TaskView } from "../../../../shared/schemas";
import {
  BookingStateBadge,
  LinkButton,
  CautionNote,
  EmptyState,
  PartyChip,
  Section,
  TaskStatusBadge,
} from "../../../components/ui";
import {
  formatDate,
  formatDateRange,
  formatDays,
  formatWeekdays,
} from "../../../lib/format";
import {
  arrivalWindowLabel,
  holidayRegionLabels,
  jobStatusLabels,
  linkKindLabels,
} from "../../../lib/labels";

function DetailRow({
  label,
  children,
}: {
  label: string;
  children: React.ReactNode;
}) {
  return (
    <div className="grid gap-0.5 sm:grid-cols-[7.5rem_1fr] sm:gap-4">
      <dt className="text-sm text-ink-soft">{label}</dt>
      <dd className="min-w-0">{children}</dd>
    </div>
  );
}

export function JobDetailsSection({ job }: { job: JobDetail }) {
  const isWorkshop = job.viewerRole === "owner" || job.viewerRole === "fitter";
  return (
    <Section title="Details" id="job-details">
      <dl className="flex flex-col gap-2.5">
        <DetailRow label="Status">{jobStatusLabels[job.status]}</DetailRow>
        <DetailRow label="Area">{job.area}</DetailRow>
        {job.siteAddress ? (
          <DetailRow label="Address">
            <span className="whitespace-pre-line">{job.siteAddress}</span>
            {job.postcode ? (
              <span className="block font-mono text-sm">{job.postcode}</span>
            ) : null}
          </DetailRow>
        ) : job.viewerRole === "trade" ? (
          <DetailRow label="Address">
            <span className="text-ink-soft">
              Shown once your booking is confirmed.
            </span>
          </DetailRow>
        ) : null}
        {job.accessNotes ? (
          <DetailRow label="Access notes">
            <span className="whitespace-pre-line">{job.accessNotes}</span>
          </DetailRow>
        ) : null}
        {/* The customer's timeline shows the handover, with how it changed since her last look. */}
        {job.viewerRole !== "customer" ? (
          <DetailRow label="Agreed handover">
            {job.handoverDate ? (
              <span className="font-mono">{formatDate(job.handoverDate)}</span>
            ) : (
              <span className="text-ink-soft">Not set yet</span>
            )}
          </DetailRow>
        ) : null}
        <DetailRow label="Site days">
          <span className="font-mono">{formatWeekdays(job.siteWeekdays)}</span>
        </DetailRow>
        {isWorkshop ? (
          <DetailRow label="Bank holidays">
            {holidayRegionLabels[job.holidayRegion]}
          </DetailRow>
        ) : null}
      </dl>
    </Section>
  );
}

export function JobPartiesSection({ job }: { job: JobDetail }) {
  return (
    <Section title="Who's involved" id="job-parties">
      {job.parties.length === 0 ? (
        <EmptyState title="No customer or trades on this job yet" />
      ) : (
        <ul className="flex flex-col divide-y divide-rule">
          {job.parties.map((p) => (
            <li
              key={`${p.kind}-${p.id}`}
              className="flex flex-col gap-1 py-2.5 first:pt-0 last:pb-0"
            >
              <div className="flex flex-wrap items-center gap-2">
                <span className="font-medium">{p.name}</span>
                {p.kind === "trade" && p.tradeKind ? (
                  <PartyChip party={p.tradeKind} />
                ) : (
                  <span className="rounded border border-rule bg-paper px-2 py-0.5 text-xs font-medium">
                    Customer
                  </span>
                )}
              </div>
              {p.email || p.phone ? (
                <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
                  {p.email ? (
                    <a
                      href={`mailto:${p.email}`}
                      className="break-all text-accent underline underline-offset-2"
                    >
                      {p.email}
                    </a>
                  ) : null}
                  {p.phone ? (
                    <a
                      href={`tel:${p.phone.replace(/[^+0-9]/g, "")}`}
                      className="font-mono text-accent underline underline-offset-2"
                    >
                      {p.phone}
                    </a>
                  ) : null}
                </div>
              ) : null}
            </li>
          ))}
        </ul>
      )}
    </Section>
  );
}

function lagText(lag: number, unit: "workingDays" | "elapsedHours"): string {
  if (lag === 0) return "";
  const sign = lag > 0 ? "+" : "−";
  const n = Math.abs(lag);
  return unit === "workingDays"
    ? `, ${sign}${n} working ${n === 1 ? "day" : "days"}`
    : `, ${sign}${n} ${n === 1 ? "hour" : "hours"}`;
}

function TaskItem({ task, job }: { task: TaskView; job: JobDetail }) {
  const waitsFor = job.links
    .filter((l) => l.toTaskId === task.id)
    .map((l) => ({
      link: l,
      from: job.tasks.find((t) => t.id === l.fromTaskId),
    }))
    .filter((w) => w.from);
  const d = task.detail;
  return (
    <li className="flex flex-col gap-2 py-3 first:pt-0 last:pb-0">
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1.5">
        <span className="font-medium">{task.name}</span>
        <PartyChip party={task.party} />
        <span className="font-mono text-sm text-ink-soft">
          {formatDays(task.durationDays)}
        </span>
        <TaskStatusBadge status={task.status} />
      </div>
      {waitsFor.length > 0 ? (
        <p className="text-sm text-ink-soft">
          Waits for{" "}
          {waitsFor.map((w, i) => (
            <span key={w.link.id}>
              {i > 0 ? "; " : ""}
              <span className="text-ink">{w.from!.name}</span> (
              {linkKindLabels[w.link.kind]}
              {lagText(w.link.lag, w.link.lagUnit)})
            </span>
          ))}
        </p>
      ) : null}
      {d ? (
        <>
          {d.notEarlierThan || d.actualStart || d.actualFinish ? (
            <p className="flex flex-wrap gap-x-4 text-sm text-ink-soft">
              {d.notEarlierThan ? (
                <span>
                  Not before{" "}
                  <span className="font-mono text-ink">
                    {formatDate(d.notEarlierThan)}
                  </span>
                </span>
              ) : null}
              {d.actualStart ? (
                <span>
                  Started{" "}
                  <span className="font-mono text-ink">
                    {formatDate(d.actualStart)}
                  </span>
                </span>
              ) : null}
              {d.actualFinish ? (
                <span>
                  Finished{" "}
                  <span className="font-mono text-ink">
                    {formatDate(d.actualFinish)}
                  </span>
                </span>
              ) : null}
            </p>
          ) : null}
          {d.caution ? <CautionNote>{d.caution}</CautionNote> : null}
          {d.customerNote ? (
            <div className="text-sm">
              <span className="font-semibold">What to prepare: </span>
              <span className="whitespace-pre-line">{d.customerNote}</span>
            </div>
          ) : null}
          {d.internalNote ? (
            <div className="text-sm">
              <span className="font-semibold">Workshop note: </span>
              <span className="whitespace-pre-line">{d.internalNote}</span>
            </div>
          ) : null}
        </>
      ) : null}
    </li>
  );
}

/** The programme's tasks, for the workshop and a trade (a customer sees her timeline instead). */
export function JobTasksSection({ job }: { job: JobDetail }) {
  const plans = job.viewerRole === "owner" || job.viewerRole === "fitter";
  return (
    <Section
      title="Programme"
      id="job-tasks"
      actions={
        plans ? (
          <LinkButton
            to={`/jobs/${encodeURIComponent(job.id)}/programme`}
            size="sm"
          >
            Plan the programme
          </LinkButton>
        ) : null
      }
      description={
        job.viewerRole === "trade"
          ? "Your tasks in full; the tasks you wait on by name and status."
          : "Tasks in the order they are planned."
      }
    >
      {job.tasks.length === 0 ? (
        <EmptyState title="No tasks yet">
          {job.viewerRole === "owner" || job.viewerRole === "fitter"
            ? "The programme for this job has not been planned."
            : "The workshop has not planned this job's tasks yet."}
        </EmptyState>
      ) : (
        // The server returns tasks in their stored sortOrder; the list keeps that order.
        <ol className="flex flex-col divide-y divide-rule">
          {job.tasks.map((task) => (
            <TaskItem key={task.id} task={task} job={job} />
          ))}
        </ol>
      )}
    </Section>
  );
}

/** A trade's read-only list of their bookings on the job (a customer sees her timeline instead). */
export function JobBookingsSection({ job }: { job: JobDetail }) {
  const taskName = (id: string) => job.tasks.find((t) => t.id === id)?.name;
  return (
    <Section title="Bookings" id="job-bookings">
      {job.bookings.length === 0 ? (
        <EmptyState title="No bookings yet">
          Trades booked for this job&rsquo;s tasks appear here with their
          answers.
        </EmptyState>
      ) : (
        <ul className="flex flex-col divide-y divide-rule">
          {job.bookings.map((b) => (
            <li
              key={b.id}
              className="grid gap-1.5 py-3 first:pt-0 last:pb-0 sm:grid-cols-[1fr_auto] sm:gap-4"
            >
              <div className="flex min-w-0 flex-col gap-1">
                <div className="flex flex-wrap items-center gap-2">
                  <span className="font-medium">{b.tradeBusinessName}</span>
                  <PartyChip party={b.tradeKind} />
                  <BookingStateBadge state={b.state} />
                </div>
                {taskName(b.taskId) ? (
                  <p className="text-sm text-ink-soft">
                    For: {taskName(b.taskId)}
                  </p>
                ) : null}
              </div>
              <div className="flex flex-col text-sm sm:items-end">
                <span className="font-mono">
                  {formatDateRange(b.start, b.finish)}
                </span>
                <span className="text-ink-soft">
                  Arrival:{" "}
                  <span className="font-mono text-ink">
                    {arrivalWindowLabel(b)}
                  </span>
                </span>
              </div>
            </li>
          ))}
        </ul>
      )}
    </Section>
  );
}
