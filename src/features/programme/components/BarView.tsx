import { partyColours } from "../../../components/ui/party-colours";
import {
  useEffect,
  useMemo,
  useRef,
  type KeyboardEvent,
  type PointerEvent,
} from "react";
import type { ProgrammeResponse } from "../../../../shared/schemas";
import type { ProgrammeResult } from "../../../../shared/programme";
import { cx } from "../../../components/ui";
import { partyLabels } from "../../../lib/labels";
import {
  addDays,
  dateOf,
  dateOfDay,
  dayNumber,
  dayText,
  engineInput,
  finishText,
  hoursOf,
  isoWeekday,
  partyText,
  positionOf,
  rowsOf,
  segmentsOf,
  startText,
  stepWorkingDay,
  taskCalendars,
  workingDayTest,
  type Preview,
} from "../model";

/** One day column; a half-day slot is half of it. */
export const COL = 44;
const ROW = 40;
const WEEKDAY = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];
const MONTH = [
  "Jan",
  "Feb",
  "Mar",
  "Apr",
  "May",
  "Jun",
  "Jul",
  "Aug",
  "Sep",
  "Oct",
  "Nov",
  "Dec",
];

// Days off are hatched, not only tinted, so they read without colour.
const offDayStyle = {
  backgroundImage:
    "repeating-linear-gradient(135deg, rgba(91,97,104,0.16) 0 2px, transparent 2px 7px)",
  backgroundColor: "rgba(226,220,207,0.45)",
};
// A rule between days and a fainter one at midday: the two slots of every day.
const gridStyle = {
  backgroundImage: `linear-gradient(to right, #E2DCCF 1px, transparent 1px), linear-gradient(to right, transparent ${COL / 2}px, rgba(226,220,207,0.7) ${COL / 2}px, rgba(226,220,207,0.7) ${COL / 2 + 1}px, transparent ${COL / 2 + 1}px)`,
  backgroundSize: `${COL}px 100%, ${COL}px 100%`,
};
/** Room after the last day for the last bars' labels. */
const LABEL_ROOM = 260;

interface BarViewProps {
  programme: ProgrammeResponse;
  /** The result on show: the server's, or the instant preview while a move is proposed. */
  result: ProgrammeResult;
  preview: Preview | null;
  onPreview: (taskId: string, date: string) => void;
  onReview: () => void;
  onCancel: () => void;
}

interface DragState {
  taskId: string;
  pointerId: number;
  startX: number;
  baseDate: string;
  lastDate: string;
  moved: boolean;
}

/** The bar view: a row per task across the days, drag (or arrow keys) to propose a move. */
export function BarView({
  programme,
  result,
  preview,
  onPreview,
  onReview,
  onCancel,
}: BarViewProps) {
  const input = engineInput(programme);
  const drag = useRef<DragState | null>(null);
  const scroller = useRef<HTMLDivElement>(null);
  // Rows keep the server's order while a move is previewed, so nothing jumps under the pointer.
  const rows = useMemo(
    () => rowsOf(programme.tasks, programme.result),
    [programme],
  );
  const shown = useMemo(
    () => new Map(result.tasks.map((r) => [r.id, r])),
    [result],
  );

  const range = useMemo(() => {
    const dates = [programme.dataDate];
    for (const r of [...programme.result.tasks, ...result.tasks]) {
      dates.push(dateOf(r.plannedStart), dateOf(r.plannedFinish));
    }
    if (programme.handover) dates.push(programme.handover);
    dates.sort();
    // Start on the Monday before the earliest date so weeks line up; end a few days after.
    let first = addDays(dates[0], -1);
    first = addDays(first, -(isoWeekday(first) - 1));
    const last = addDays(dates[dates.length - 1], 4);
    const firstDay = dayNumber(first);
    const count = Math.min(200, dayNumber(last) - firstDay + 1);
    return { firstDay, count };
  }, [programme, result]);

  const workshopWorks = useMemo(
    () => workingDayTest(input, "__workshop__"),
    [input],
  );
  const rowData = useMemo(
    () =>
      rows.map((row) => {
        const works = workingDayTest(input, row.task.id);
        return {
          ...row,
          works,
          hours: hoursOf(taskCalendars(input, row.task.id)),
        };
      }),
    [rows, input],
  );

  const days = Array.from({ length: range.count }, (_, i) =>
    dateOfDay(range.firstDay + i),
  );
  const width = range.count * COL;
  const todayX = (dayNumber(programme.dataDate) - range.firstDay) * COL;
  const handoverX = programme.handover
    ? (dayNumber(programme.handover) - range.firstDay + 1) * COL
    : null;

  // Open on the work to come: a phone shows a week, so start at today or the first bar.
  const firstBarX = useMemo(() => {
    const starts = programme.result.tasks
      .filter((r) => r.readiness.state !== "done")
      .map((r) => dayNumber(dateOf(r.plannedStart)));
    return starts.length ? (Math.min(...starts) - range.firstDay) * COL : 0;
  }, [programme, range.firstDay]);
  const opened = useRef(false);
  useEffect(() => {
    if (opened.current || !scroller.current) return;
    opened.current = true;
    // Today stays in sight when work is near; otherwise open a day before the first bar.
    const to = firstBarX - todayX > 3 * COL ? firstBarX - COL : todayX - COL;
    scroller.current.scrollLeft = Math.max(0, to);
  }, [todayX, firstBarX]);

  const baseDateOf = (taskId: string) => {
    if (preview?.taskId === taskId) return preview.notEarlierThan;
    const r = programme.result.tasks.find((t) => t.id === taskId);
    return r ? dateOf(r.plannedStart) : programme.dataDate;
  };

  const onPointerDown = (
    e: PointerEvent<HTMLButtonElement>,
    taskId: string,
  ) => {
    if (e.button !== 0) return;
    e.currentTarget.setPointerCapture(e.pointerId);
    const base = baseDateOf(taskId);
    drag.current = {
      taskId,
      pointerId: e.pointerId,
      startX: e.clientX,
      baseDate: base,
      lastDate: base,
      moved: false,
    };
  };
  const onPointerMove = (e: PointerEvent<HTMLButtonElement>) => {
    const d = drag.current;
    if (!d || d.pointerId !== e.pointerId) return;
    // Snap to whole days: the API keeps "not earlier than" as a date.
    const delta = Math.round((e.clientX - d.startX) / COL);
    if (delta !== 0) d.moved = true;
    const date = addDays(d.baseDate, delta);
    if (date !== d.lastDate) {
      d.lastDate = date;
      onPreview(d.taskId, date);
    }
  };
  const onPointerUp = (e: PointerEvent<HTMLButtonElement>) => {
    const d = drag.current;
    if (!d || d.pointerId !== e.pointerId) return;
    drag.current = null;
    if (e.currentTarget.hasPointerCapture(e.pointerId))
      e.currentTarget.releasePointerCapture(e.pointerId);
  };

  const onKeyDown = (
    e: KeyboardEvent<HTMLButtonElement>,
    taskId: string,
    works: (date: string) => boolean,
  ) => {
    if (e.key === "ArrowRight" || e.key === "ArrowLeft") {
      e.preventDefault();
      const base = baseDateOf(taskId);
      onPreview(
        taskId,
        stepWorkingDay(base, e.key === "ArrowRight" ? 1 : -1, works),
      );
    } else if (e.key === "Enter") {
      e.preventDefault();
      if (preview) onReview();
    } else if (e.key === "Escape") {
      if (preview) {
        e.preventDefault();
        onCancel();
      }
    }
  };

  return (
    <div
      ref={scroller}
      className="overflow-x-auto rounded border border-rule bg-card"
    >
      <p id="bar-help" className="sr-only">
        Drag a bar sideways, or use the left and right arrow keys, to move the
        task a working day at a time. Enter reviews the knock-on; Escape
        cancels.
      </p>
      <div
        className="relative"
        style={{ width: width + LABEL_ROOM, minWidth: "100%" }}
        role="group"
        aria-label="Bar view"
      >
        {/* Header: a column per day, days off hatched on the workshop's calendar. */}
        <div
          className="relative h-12 border-b border-rule-strong"
          style={{ width }}
        >
          {days.map((d, i) => {
            const off = !workshopWorks(d);
            const dayNum = Number(d.slice(8, 10));
            const showMonth = i === 0 || dayNum === 1;
            return (
              <div
                key={d}
                data-date={d}
                className={cx(
                  "absolute top-0 flex h-full flex-col items-center justify-end border-l border-rule pb-1 font-mono text-[11px] leading-tight",
                  off ? "text-ink-soft" : "text-ink",
                )}
                style={{
                  left: i * COL,
                  width: COL,
                  ...(off ? offDayStyle : {}),
                }}
                title={dayText(d)}
              >
                {showMonth ? (
                  <span className="absolute top-0.5 left-1 font-sans font-semibold">
                    {MONTH[Number(d.slice(5, 7)) - 1]}
                  </span>
                ) : null}
                <span>{WEEKDAY[isoWeekday(d) - 1]}</span>
                <span>{dayNum}</span>
              </div>
            );
          })}
        </div>

        {/* Rows */}
        <div className="relative" style={{ width }}>
          {rowData.map((row) => {
            const r = shown.get(row.task.id) ?? row.result;
            const before = row.result;
            const start = positionOf(r.plannedStart, range.firstDay, row.hours);
            const finish = positionOf(
              r.plannedFinish,
              range.firstDay,
              row.hours,
            );
            const milestone = r.plannedStart === r.plannedFinish;
            const segs = segmentsOf(start, finish, range.firstDay, row.works);
            const moved =
              !!preview &&
              (before.plannedStart !== r.plannedStart ||
                before.plannedFinish !== r.plannedFinish);
            const ghost = moved
              ? segmentsOf(
                  positionOf(before.plannedStart, range.firstDay, row.hours),
                  positionOf(before.plannedFinish, range.firstDay, row.hours),
                  range.firstDay,
                  row.works,
                )
              : [];
            const left = start * COL;
            const right = Math.max(finish * COL, left + (milestone ? 14 : 4));
            const label = partyText(row.task);
            const done = r.readiness.state === "done";
            return (
              <div
                key={row.task.id}
                className="relative border-b border-rule"
                style={{ height: ROW, ...gridStyle }}
              >
                {days.map((d, i) =>
                  row.works(d) ? null : (
                    <div
                      key={d}
                      aria-hidden="true"
                      className="absolute top-0 h-full"
                      style={{ left: i * COL, width: COL, ...offDayStyle }}
                    />
                  ),
                )}
                {ghost.map(([a, b]) => (
                  <div
                    key={`g${a}`}
                    aria-hidden="true"
                    className="absolute top-2.5 h-5 rounded-sm border border-dashed border-ink-soft"
                    style={{ left: a * COL, width: Math.max(4, (b - a) * COL) }}
                  />
                ))}
                <button
                  type="button"
                  className={cx(
                    "group absolute top-1.5 h-7 cursor-grab touch-none rounded-sm outline-offset-2 select-none active:cursor-grabbing",
                    preview?.taskId === row.task.id &&
                      "outline-2 outline-accent",
                  )}
                  style={{ left, width: right - left }}
                  aria-label={`${row.task.name}: ${startText(r.plannedStart)} to ${finishText(r.plannedFinish)}`}
                  aria-describedby="bar-help"
                  onPointerDown={(e) => onPointerDown(e, row.task.id)}
                  onPointerMove={onPointerMove}
                  onPointerUp={onPointerUp}
                  onPointerCancel={onPointerUp}
                  onKeyDown={(e) => onKeyDown(e, row.task.id, row.works)}
                >
                  {milestone ? (
                    <span
                      aria-hidden="true"
                      className={cx(
                        "absolute top-1.5 left-[-7px] size-3.5 rotate-45 rounded-[2px]",
                        partyColours[row.task.party].fill,
                      )}
                    />
                  ) : (
                    segs.map(([a, b]) => (
                      <span
                        key={a}
                        aria-hidden="true"
                        className={cx(
                          "absolute top-1 h-5 rounded-sm",
                          partyColours[row.task.party].fill,
                          done && "opacity-55",
                          r.critical &&
                            !done &&
                            "ring-2 ring-risk ring-offset-1 ring-offset-card",
                        )}
                        style={{
                          left: a * COL - left,
                          width: Math.max(4, (b - a) * COL - 1),
                        }}
                      />
                    ))
                  )}
                </button>
                {/* The bar's label, always in ink beside it: colour never carries meaning alone. */}
                <span
                  aria-hidden="true"
                  className="pointer-events-none absolute top-0 flex h-full items-center text-xs whitespace-nowrap text-ink"
                  style={{ left: right + (milestone ? 10 : 6) }}
                >
                  <span className="font-medium">{row.task.name}</span>
                  <span className="text-ink-soft">
                    &nbsp;·{" "}
                    {label === partyLabels[row.task.party]
                      ? label
                      : `${partyLabels[row.task.party]}, ${label}`}
                    {r.critical ? " · critical" : ""}
                    {done ? " · done" : ""}
                  </span>
                </span>
              </div>
            );
          })}
          {/* Today and handover run through every row. */}
          <div
            aria-hidden="true"
            className="pointer-events-none absolute top-0 h-full w-0.5 bg-accent"
            style={{ left: todayX }}
          />
          {handoverX !== null ? (
            <div
              aria-hidden="true"
              className="pointer-events-none absolute top-0 h-full border-l-2 border-dashed border-ink"
              style={{ left: handoverX - 1 }}
            />
          ) : null}
        </div>
        {/* Labels for the two lines, under the rows, where they never cover a bar. */}
        <div className="relative h-7 text-xs" style={{ width }}>
          <span
            className="absolute top-1 rounded-sm bg-accent px-1.5 py-0.5 font-medium text-card"
            style={{ left: Math.max(0, todayX - 2) }}
          >
            Today
          </span>
          {handoverX !== null && programme.handover ? (
            <span
              className="absolute top-1 rounded-sm border border-ink bg-card px-1.5 py-0.5 font-medium whitespace-nowrap"
              style={{
                left: handoverX + 4,
              }}
            >
              Agreed handover {dayText(programme.handover)}
            </span>
          ) : null}
        </div>
      </div>
    </div>
  );
}
