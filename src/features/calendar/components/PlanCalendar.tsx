import { useMemo, useState } from "react";
import type { JobSummary, ProgrammeResponse } from "../../../../shared/schemas";
import { ProgrammeInputError } from "../../../../shared/programme";
import { ImpactSummary, KnockOnPanel } from "../../../components/KnockOnPanel";
import {
  Button,
  EmptyState,
  ErrorState,
  FormError,
  LoadingState,
  Select,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { previewMove, type Preview } from "../../../lib/knock-on";
import { partyLabels } from "../../../lib/labels";
import { useApplyMove, type MoveAnswer } from "../api/apply-move";
import { useProgrammes } from "../api/get-programmes";
import { useTradeBusy } from "../api/trade-busy";
import {
  addDays,
  dayMarks,
  entriesOfProgramme,
  entryStateLabels,
  lastDayOf,
  todayDate,
  type Entry,
  type EntryState,
} from "../model";
import { CalendarView } from "./CalendarView";

interface Pending {
  jobId: string;
  preview: Preview;
}

function MoveControl({
  entry,
  onPreview,
}: {
  entry: Entry;
  onPreview: (entry: Entry, date: string) => void;
}) {
  const [open, setOpen] = useState(false);
  const [date, setDate] = useState(entry.start);
  if (!open)
    return (
      <Button
        size="sm"
        variant="quiet"
        className="self-start"
        onClick={() => setOpen(true)}
        aria-label={`Move ${entry.taskName} (${entry.jobTitle})`}
      >
        Move
      </Button>
    );
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (date) onPreview(entry, date);
      }}
    >
      <label className="flex flex-col text-xs text-ink-soft">
        Not earlier than
        <input
          type="date"
          className="rounded border border-rule-strong bg-card px-2 py-1 font-mono text-sm text-ink"
          value={date}
          onChange={(e) => setDate(e.target.value)}
          required
        />
      </label>
      <Button size="sm" type="submit">
        Show the knock-on
      </Button>
      <Button size="sm" variant="secondary" onClick={() => setOpen(false)}>
        Close
      </Button>
    </form>
  );
}

interface PlanCalendarProps {
  /** The member's jobs to show (one on the job page). */
  jobs: Pick<JobSummary, "id" | "title">[];
  /** Job filter (hidden on the job page). */
  showJobFilter?: boolean;
}

/**
 * The workshop's calendar of bookings and tasks across its jobs (or one job's): drag a task or
 * use Move, read the knock-on the shared engine works out at once, then Save or Cancel.
 */
export function PlanCalendar({
  jobs,
  showJobFilter = true,
}: PlanCalendarProps) {
  const queries = useProgrammes(jobs.map((j) => j.id));
  const apply = useApplyMove();
  const [party, setParty] = useState("");
  const [business, setBusiness] = useState("");
  const [jobFilter, setJobFilter] = useState("");
  const [state, setState] = useState("");
  const [pending, setPending] = useState<Pending | null>(null);
  const [previewError, setPreviewError] = useState<string | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [saved, setSaved] = useState<{
    text: string;
    programme: ProgrammeResponse;
    impact: MoveAnswer["impact"];
  } | null>(null);

  const programmes = queries
    .map((q) => q.data)
    .filter((p): p is ProgrammeResponse => !!p);
  const businesses = [
    ...new Map(
      programmes.flatMap((p) =>
        p.tasks.flatMap((t) =>
          t.booking ? [[t.booking.tradeId, t.booking.tradeName] as const] : [],
        ),
      ),
    ),
  ].sort((a, b) => a[1].localeCompare(b[1]));
  function businessName(tradeId: string) {
    return businesses.find(([id]) => id === tradeId)?.[1] ?? null;
  }

  // Rebuilt only when a programme, the preview or a filter changes (see CalendarView).
  const dataKey = queries.map((q) => q.dataUpdatedAt).join(",");
  const entries = useMemo(() => {
    const title = new Map(jobs.map((j) => [j.id, j.title]));
    return programmes
      .flatMap((p) =>
        entriesOfProgramme(
          p,
          title.get(p.jobId) ?? "Job",
          pending?.jobId === p.jobId ? pending.preview : null,
        ),
      )
      .filter(
        (e) =>
          (!party || e.party === party) &&
          (!business || e.who === businessName(business)) &&
          (!jobFilter || e.jobId === jobFilter) &&
          (!state || e.state === state),
      );
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [dataKey, pending, party, business, jobFilter, state, jobs]);
  // A chosen business's time booked by other workshops shows only as "busy" days.
  const busyFrom = addDays(todayDate(), -60);
  const busyTo = addDays(todayDate(), 400);
  const busy = useTradeBusy(business || null, busyFrom, busyTo);
  const marks = useMemo(() => {
    const days = dayMarks(programmes, busyFrom, busyTo);
    for (const b of busy.data ?? []) {
      if (b.ownWorkshop) continue;
      for (
        let d = b.start.slice(0, 10);
        d <= lastDayOf(b.finish);
        d = addDays(d, 1)
      )
        days.push({ date: d, kind: "busy", label: b.label });
    }
    return days;
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [dataKey, busy.data]);

  if (queries.some((q) => q.isPending))
    return <LoadingState label="Loading the calendar…" />;
  const failed = queries.find((q) => q.isError);
  if (failed)
    return (
      <ErrorState error={failed.error} onRetry={() => void failed.refetch()} />
    );

  const programmeOf = (jobId: string) =>
    programmes.find((p) => p.jobId === jobId);

  const onMove = (entry: Entry, date: string) => {
    const p = programmeOf(entry.jobId);
    if (!p) return;
    setSaved(null);
    setSaveError(null);
    try {
      setPending({
        jobId: entry.jobId,
        preview: previewMove(p, entry.taskId, date),
      });
      setPreviewError(null);
    } catch (error) {
      setPending(null);
      setPreviewError(
        error instanceof ProgrammeInputError
          ? error.problems.join(" ")
          : errorMessage(error),
      );
    }
  };
  const cancel = () => {
    setPending(null);
    setSaveError(null);
  };
  const save = async () => {
    if (!pending) return;
    const p = programmeOf(pending.jobId);
    if (!p) return;
    const task = p.tasks.find((t) => t.id === pending.preview.taskId);
    setSaveError(null);
    try {
      const answer = await apply.mutateAsync({
        jobId: pending.jobId,
        body: {
          version: p.version,
          changes: [
            {
              taskId: pending.preview.taskId,
              notEarlierThan: pending.preview.notEarlierThan,
            },
          ],
        },
      });
      setPending(null);
      setSaved({
        text: `${task?.name ?? "The task"} moved. The server's knock-on:`,
        programme: answer.programme,
        impact: answer.impact,
      });
    } catch (error) {
      setSaveError(errorMessage(error));
    }
  };

  const pendingProgramme = pending ? programmeOf(pending.jobId) : undefined;
  const nothing = programmes.every((p) => p.tasks.length === 0);

  return (
    <div className="flex flex-col gap-4">
      <div
        className="flex flex-wrap items-end gap-3"
        role="group"
        aria-label="Filters"
      >
        <Select
          label="Trade"
          value={party}
          onChange={(e) => setParty(e.target.value)}
        >
          <option value="">All trades and the workshop</option>
          {Object.entries(partyLabels).map(([k, v]) => (
            <option key={k} value={k}>
              {v}
            </option>
          ))}
        </Select>
        <Select
          label="Business"
          value={business}
          onChange={(e) => setBusiness(e.target.value)}
        >
          <option value="">Every business</option>
          {businesses.map(([id, name]) => (
            <option key={id} value={id}>
              {name}
            </option>
          ))}
        </Select>
        {showJobFilter ? (
          <Select
            label="Job"
            value={jobFilter}
            onChange={(e) => setJobFilter(e.target.value)}
          >
            <option value="">All jobs</option>
            {jobs.map((j) => (
              <option key={j.id} value={j.id}>
                {j.title}
              </option>
            ))}
          </Select>
        ) : null}
        <Select
          label="Booking state"
          value={state}
          onChange={(e) => setState(e.target.value)}
        >
          <option value="">Any state</option>
          {(Object.keys(entryStateLabels) as EntryState[]).map((k) => (
            <option key={k} value={k}>
              {entryStateLabels[k]}
            </option>
          ))}
        </Select>
      </div>

      {saved ? (
        <div
          role="status"
          className="flex flex-col gap-2 rounded border border-ok/40 bg-ok-wash px-4 py-3 text-sm"
        >
          <span>{saved.text}</span>
          <ImpactSummary programme={saved.programme} impact={saved.impact} />
        </div>
      ) : null}
      <FormError message={previewError} />
      {pending && pendingProgramme ? (
        <KnockOnPanel
          programme={pendingProgramme}
          preview={pending.preview}
          saving={apply.isPending}
          error={saveError}
          onSave={() => void save()}
          onCancel={cancel}
        />
      ) : null}

      {nothing ? (
        <EmptyState title="Nothing planned yet">
          Tasks and bookings appear here once a job has a programme.
        </EmptyState>
      ) : (
        <CalendarView
          entries={entries}
          marks={marks}
          onMove={onMove}
          renderMove={(e) => (
            <MoveControl
              key={`${e.id}:${e.start}`}
              entry={e}
              onPreview={onMove}
            />
          )}
          emptyText="Nothing in these days for the filters chosen."
        />
      )}
    </div>
  );
}
