import { useMemo, useState } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { lastDayOf, type ProgrammeResponse } from "../../../../shared/schemas";
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
import { useCalendarRange } from "../api/get-calendar";
import { calendarProgrammeQueryOptions } from "../api/get-programme";
import { useTradeBusy } from "../api/trade-busy";
import {
  addDays,
  asEntries,
  entryStateLabels,
  withPreview,
  type DayMark,
  type Entry,
  type EntryState,
} from "../model";
import { CalendarView, useDayRange } from "./CalendarView";

interface Pending {
  jobId: string;
  /** The job's programme, loaded when the move began: the preview's input and its version. */
  programme: ProgrammeResponse;
  preview: Preview;
}

function MoveControl({
  entry,
  onOpen,
  onPreview,
}: {
  entry: Entry;
  onOpen: (entry: Entry) => void;
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
        onClick={() => {
          setOpen(true);
          onOpen(entry);
        }}
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
  /** The workshop's calendar (its live jobs) or one job's, by id. */
  scope: "workshop" | "job";
  id: string;
  /** Job filter (hidden on the job page). */
  showJobFilter?: boolean;
}

/**
 * The workshop's calendar of bookings and tasks across its jobs (or one job's): drag a task or
 * use Move, read the knock-on the shared engine works out at once, then Save or Cancel. The
 * days in view come from one request (GET /api/calendar); a job's programme is loaded only when
 * one of its tasks starts to move.
 */
export function PlanCalendar({
  scope,
  id,
  showJobFilter = true,
}: PlanCalendarProps) {
  const [range, setRange] = useDayRange();
  const calendar = useCalendarRange({ scope, id, ...range });
  const queryClient = useQueryClient();
  const apply = useApplyMove();
  const [party, setParty] = useState("");
  const [business, setBusiness] = useState("");
  const [jobFilter, setJobFilter] = useState("");
  const [state, setState] = useState("");
  const [pending, setPending] = useState<Pending | null>(null);
  const [previewError, setPreviewError] = useState<string | null>(null);
  // The moving job's programme is on its way (asked for when the drag or Move began).
  const [working, setWorking] = useState(false);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [saved, setSaved] = useState<{
    text: string;
    programme: ProgrammeResponse;
    impact: MoveAnswer["impact"];
  } | null>(null);

  const data = calendar.data;
  const jobs = useMemo(() => data?.jobs ?? [], [data]);
  const businesses = data?.trades ?? [];

  // Rebuilt only when the range's data, the preview or a filter changes (see CalendarView).
  const entries = useMemo(() => {
    let list = asEntries(data?.entries ?? []);
    if (pending)
      list = withPreview(
        list,
        pending.programme,
        jobs.find((j) => j.id === pending.jobId)?.title ?? "Job",
        pending.preview,
      );
    return list.filter(
      (e) =>
        (!party || e.party === party) &&
        (!business || e.tradeId === business) &&
        (!jobFilter || e.jobId === jobFilter) &&
        (!state || e.state === state),
    );
  }, [data, jobs, pending, party, business, jobFilter, state]);
  // A chosen business's time booked by other workshops shows only as "busy" days.
  const busy = useTradeBusy(business || null, range.from, range.to);
  const marks = useMemo(() => {
    const days: DayMark[] = [...(data?.marks ?? [])];
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
  }, [data, busy.data]);

  if (calendar.isPending) return <LoadingState label="Loading the calendar…" />;
  if (!data)
    return (
      <ErrorState
        error={calendar.error}
        onRetry={() => void calendar.refetch()}
      />
    );

  const programmeOf = (jobId: string) =>
    queryClient.fetchQuery(calendarProgrammeQueryOptions(jobId));
  const onMoveStart = (entry: Entry) =>
    void queryClient.prefetchQuery(calendarProgrammeQueryOptions(entry.jobId));

  const onMove = async (entry: Entry, date: string): Promise<boolean> => {
    setSaved(null);
    setSaveError(null);
    let programme: ProgrammeResponse;
    setWorking(true);
    try {
      programme = await programmeOf(entry.jobId);
    } catch (error) {
      setPending(null);
      setPreviewError(errorMessage(error));
      return false;
    } finally {
      setWorking(false);
    }
    try {
      setPending({
        jobId: entry.jobId,
        programme,
        preview: previewMove(programme, entry.taskId, date),
      });
      setPreviewError(null);
      return true;
    } catch (error) {
      setPending(null);
      setPreviewError(
        error instanceof ProgrammeInputError
          ? error.problems.join(" ")
          : errorMessage(error),
      );
      return false;
    }
  };
  const cancel = () => {
    setPending(null);
    setSaveError(null);
  };
  const save = async () => {
    if (!pending) return;
    const p = pending.programme;
    const task = p.tasks.find((t) => t.id === pending.preview.taskId);
    setSaveError(null);
    try {
      // Resolves once the calendar's range has been read again, so the preview gives way to
      // the saved dates without the moved tasks jumping back in between.
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

  if (scope === "workshop" && jobs.length === 0)
    return (
      <EmptyState title="No live jobs yet">
        Once a job has a programme, its tasks and bookings show here.
      </EmptyState>
    );
  const nothing = jobs.every((j) => j.taskCount === 0);

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
          {businesses.map((b) => (
            <option key={b.id} value={b.id}>
              {b.name}
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
      {working ? (
        <p role="status" className="text-sm text-ink-soft">
          Working out the knock-on…
        </p>
      ) : null}
      <FormError message={previewError} />
      {pending ? (
        <KnockOnPanel
          programme={pending.programme}
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
          range={range}
          onRangeChange={setRange}
          loading={calendar.isPlaceholderData}
          onMoveStart={onMoveStart}
          onMove={onMove}
          renderMove={(e) => (
            <MoveControl
              key={`${e.id}:${e.start}`}
              entry={e}
              onOpen={onMoveStart}
              onPreview={(entry, date) => void onMove(entry, date)}
            />
          )}
          emptyText="Nothing in these days for the filters chosen."
        />
      )}
    </div>
  );
}
