import { partyColours } from "../../../components/ui/party-colours";
import { useMemo, useState, useSyncExternalStore, type ReactNode } from "react";
import FullCalendar from "@fullcalendar/react";
import type {
  DatesSetArg,
  EventContentArg,
  EventDropArg,
  EventInput,
} from "@fullcalendar/core";
import enGbLocale from "@fullcalendar/core/locales/en-gb";
import dayGridPlugin from "@fullcalendar/daygrid";
import interactionPlugin, {
  type EventDragStartArg,
} from "@fullcalendar/interaction";
import { Button, cx } from "../../../components/ui";
import { formatDateShort } from "../../../lib/format";
import {
  addDays,
  entryDetail,
  entryLabel,
  initialRange,
  todayDate,
  type DayMark,
  type DayRange,
  type Entry,
} from "../model";

// Options live outside the component: FullCalendar re-initialises on a new object (a re-render
// would otherwise throw the week view back to the month).
const plugins = [dayGridPlugin, interactionPlugin];
const headerToolbar = {
  left: "prev,next today",
  center: "title",
  right: "dayGridMonth,dayGridWeek",
};
// Words, not FullCalendar's icon glyphs: its icon spans carry role="img" without a name (axe:
// role-img-alt), and a word says more than a chevron anyway.
const buttonText = {
  today: "Today",
  month: "Month",
  week: "Week",
  prev: "Previous",
  next: "Next",
};
/**
 * FullCalendar names each day cell after its day number only, so a cell holding bookings has
 * content its name leaves out (axe: label-content-name-mismatch); named from its content instead.
 */
const unlabelDayCell = (arg: { el: HTMLElement }) =>
  arg.el.removeAttribute("aria-labelledby");
const monthDayHeader = { weekday: "short" } as const;
const views = {
  dayGridWeek: {
    dayHeaderFormat: { weekday: "short", day: "numeric", month: "short" },
  },
} as const;

const wide = "(min-width: 768px)";
const localDate = (d: Date) =>
  `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;
function subscribe(onChange: () => void) {
  const m = window.matchMedia(wide);
  m.addEventListener("change", onChange);
  return () => m.removeEventListener("change", onChange);
}
/** FullCalendar at a desk; on a phone a plain list (listWeek is not installed). */
function useWide(): boolean {
  return useSyncExternalStore(
    subscribe,
    () => window.matchMedia(wide).matches,
    () => true,
  );
}

/**
 * The days in view, held by the screen that asks the server for them: at first FullCalendar's
 * month around `initialDate` at a desk (what its first `datesSet` reports, so the first request
 * is the right one), or two weeks on a phone; then whatever the person moves to.
 */
export function useDayRange(initialDate?: string) {
  return useState<DayRange>(() =>
    initialRange(initialDate ?? todayDate(), window.matchMedia(wide).matches),
  );
}

function EventBox({ entry }: { entry: Entry }) {
  return (
    <div
      className={cx(
        "w-full overflow-hidden rounded-sm border border-rule border-l-4 bg-card px-1.5 py-0.5 text-xs leading-snug text-ink",
        partyColours[entry.party].rule,
        entry.previewed && "outline-2 outline-dashed outline-accent",
      )}
      title={`${entryLabel(entry)} — ${entryDetail(entry)}`}
      data-testid="calendar-event"
    >
      <span className="block truncate font-medium">{entryLabel(entry)}</span>
      <span className="block truncate text-ink-soft">
        {entry.who ?? entryDetail(entry)}
      </span>
    </div>
  );
}

interface CalendarViewProps {
  entries: Entry[];
  marks: DayMark[];
  /** The days in view (from `useDayRange`), changed by the calendar's and the list's buttons. */
  range: DayRange;
  onRangeChange: (range: DayRange) => void;
  /** The next range is loading (the last one stays on screen meanwhile). */
  loading?: boolean;
  /** A drag began: the screen may start loading what the move's knock-on needs. */
  onMoveStart?: (entry: Entry) => void;
  /**
   * Dragging (and the per-entry Move control) only when given. Resolves false when the move
   * could not be previewed, and the dragged event goes back.
   */
  onMove?: (entry: Entry, date: string) => Promise<boolean> | void;
  /** The Move control's form, rendered under the entry it belongs to. */
  renderMove?: (entry: Entry) => ReactNode;
  initialDate?: string;
  emptyText: string;
}

/**
 * Month and week views (FullCalendar day grids) above a day-by-day list of what is in view. The
 * list is the keyboard and phone way in: every entry's text and, when allowed, its Move control.
 */
export function CalendarView({
  entries,
  marks,
  range,
  onRangeChange,
  loading = false,
  onMoveStart,
  onMove,
  renderMove,
  initialDate,
  emptyText,
}: CalendarViewProps) {
  const isWide = useWide();

  // Where the person is (view and date), fed back as the initial ones: when FullCalendar
  // re-initialises (seen on a window resize) it stays there instead of jumping to the month.
  const [nav, setNav] = useState<{ view: string; date: string | undefined }>({
    view: "dayGridMonth",
    date: initialDate,
  });

  // One array per change of data: a new array for the same data would snap a drop back (so
  // it depends on whether moving is allowed, not on the handler, new at each render).
  const canMove = !!onMove;
  const events = useMemo<EventInput[]>(
    () => [
      ...entries.map((e) => ({
        id: e.id,
        title: entryLabel(e),
        start: e.start,
        end: addDays(e.last, 1),
        allDay: true,
        startEditable: canMove && e.movable,
        durationEditable: false,
        extendedProps: { entry: e },
      })),
      ...marks.map((m) => ({
        id: `mark:${m.date}:${m.label}`,
        title: m.label,
        start: m.date,
        allDay: true,
        display: "background",
        classNames: [`sitecue-mark-${m.kind}`],
        extendedProps: { mark: m },
      })),
    ],
    [entries, marks, canMove],
  );

  const shown = entries
    .filter((e) => e.last >= range.from && e.start <= range.to)
    .sort((a, b) => a.start.localeCompare(b.start) || a.id.localeCompare(b.id));
  const shownMarks = marks.filter(
    (m) => m.date >= range.from && m.date <= range.to,
  );
  const days = [
    ...new Set([
      ...shown.map((e) => (e.start < range.from ? range.from : e.start)),
      ...shownMarks.map((m) => m.date),
    ]),
  ].sort();

  const onDrop = (info: EventDropArg) => {
    const entry = info.event.extendedProps.entry as Entry | undefined;
    if (!entry || !onMove) return info.revert();
    void Promise.resolve(onMove(entry, info.event.startStr.slice(0, 10))).then(
      (ok) => ok === false && info.revert(),
    );
  };
  const onDragStart = (info: EventDragStartArg) => {
    const entry = info.event.extendedProps.entry as Entry | undefined;
    if (entry) onMoveStart?.(entry);
  };

  return (
    <div className="flex flex-col gap-4">
      {isWide ? (
        <div className="sitecue-calendar rounded border border-rule bg-card p-3">
          <FullCalendar
            plugins={plugins}
            locale={enGbLocale}
            initialView={nav.view}
            initialDate={nav.date}
            firstDay={1}
            height="auto"
            headerToolbar={headerToolbar}
            buttonText={buttonText}
            buttonIcons={false}
            dayCellDidMount={unlabelDayCell}
            dayHeaderFormat={monthDayHeader}
            views={views}
            dayMaxEvents={false}
            events={events}
            eventContent={(arg: EventContentArg) => {
              const mark = arg.event.extendedProps.mark as DayMark | undefined;
              if (mark)
                return (
                  <span className="block px-1 pt-5 text-[0.7rem] font-medium text-ink-soft">
                    {mark.label}
                  </span>
                );
              return (
                <EventBox entry={arg.event.extendedProps.entry as Entry} />
              );
            }}
            eventDragStart={onDragStart}
            eventDrop={onDrop}
            datesSet={(arg: DatesSetArg) => {
              const from = arg.startStr.slice(0, 10);
              const to = addDays(arg.endStr.slice(0, 10), -1);
              const view = arg.view.type;
              const date = localDate(arg.view.calendar.getDate());
              setNav((n) =>
                n.view === view && n.date === date ? n : { view, date },
              );
              if (range.from !== from || range.to !== to)
                onRangeChange({ from, to });
            }}
          />
        </div>
      ) : (
        <div className="flex items-center justify-between gap-2">
          <Button
            size="sm"
            variant="secondary"
            onClick={() =>
              onRangeChange({
                from: addDays(range.from, -14),
                to: addDays(range.from, -1),
              })
            }
          >
            ← Earlier
          </Button>
          <span className="font-mono text-sm">
            {formatDateShort(range.from)} – {formatDateShort(range.to)}
          </span>
          <Button
            size="sm"
            variant="secondary"
            onClick={() =>
              onRangeChange({
                from: addDays(range.to, 1),
                to: addDays(range.to, 14),
              })
            }
          >
            Later →
          </Button>
        </div>
      )}

      {/* Kept in the layout (one line) so the calendar does not jump when it shows. */}
      <p role="status" className="-my-2 min-h-5 text-xs text-ink-soft">
        {loading ? "Loading these days…" : ""}
      </p>

      <section aria-label="In view, day by day" className="flex flex-col gap-3">
        {isWide ? (
          <h3 className="text-sm font-semibold">
            In view, day by day{" "}
            <span className="font-normal text-ink-soft">
              {onMove ? "— move a task from here with the keyboard" : ""}
            </span>
          </h3>
        ) : null}
        {days.length === 0 ? (
          <p className="rounded border border-rule bg-card px-4 py-3 text-sm text-ink-soft">
            {emptyText}
          </p>
        ) : (
          <ol className="flex flex-col gap-3">
            {days.map((d) => (
              <li key={d} className="rounded border border-rule bg-card">
                <h4 className="border-b border-rule px-3 py-1.5 font-mono text-sm font-medium">
                  {formatDateShort(d)}
                  {shownMarks
                    .filter((m) => m.date === d)
                    .map((m) => (
                      <span
                        key={m.label}
                        className="ml-2 font-sans text-xs font-normal text-ink-soft"
                      >
                        {m.label}
                      </span>
                    ))}
                </h4>
                <ul className="flex flex-col divide-y divide-rule">
                  {shown
                    .filter(
                      (e) =>
                        (e.start < range.from ? range.from : e.start) === d,
                    )
                    .map((e) => (
                      <li
                        key={e.id}
                        className={cx(
                          "flex flex-col gap-1 border-l-4 px-3 py-2 text-sm",
                          partyColours[e.party].rule,
                        )}
                        data-testid="calendar-list-entry"
                      >
                        <div className="flex flex-wrap items-baseline justify-between gap-x-3">
                          <span className="font-medium">{entryLabel(e)}</span>
                          <span className="font-mono text-xs text-ink-soft">
                            {e.last !== e.start
                              ? `${formatDateShort(e.start)} – ${formatDateShort(e.last)}`
                              : formatDateShort(e.start)}
                          </span>
                        </div>
                        <span className="text-ink-soft">{entryDetail(e)}</span>
                        {renderMove && e.movable ? renderMove(e) : null}
                      </li>
                    ))}
                </ul>
              </li>
            ))}
          </ol>
        )}
      </section>
    </div>
  );
}
