import { useId } from "react";
import { cx } from "../../../components/ui";
import { addDays, dayWords, isoWeekday } from "../words";

const WEEKDAYS = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];

interface MarkedDatePickerProps {
  /** Label for the group, read before the dates. */
  label: string;
  /** Dates that keep handover (inside the start window). */
  windowDates: string[];
  /** What the window keeps: "handover", or "the planned finish" when none is agreed. */
  kept: string;
  /** The trade's own free start dates. */
  freeDates: string[];
  /** The first day that may be chosen (today). */
  from: string;
  value: string | null;
  onChange: (date: string) => void;
}

/**
 * A month-free grid of the coming weeks, Monday first, marking the dates that keep handover and
 * the trade's free days in words as well as colour. Each day is a toggle button.
 */
export function MarkedDatePicker({
  label,
  windowDates,
  kept,
  freeDates,
  from,
  value,
  onChange,
}: MarkedDatePickerProps) {
  const labelId = useId();
  const inWindow = new Set(windowDates);
  const free = new Set(freeDates);
  const marked = [...windowDates, ...freeDates].sort();
  const firstMarked = marked[0] && marked[0] > from ? marked[0] : from;
  const lastMarked = marked.at(-1) ?? addDays(from, 20);
  // From the Monday of the first week with a marked date, whole weeks, at most six.
  const start = addDays(firstMarked, 1 - isoWeekday(firstMarked));
  let weeks = 1;
  while (weeks < 6 && addDays(start, weeks * 7) <= lastMarked) weeks++;
  weeks = Math.max(weeks, 3);
  const days = Array.from({ length: weeks * 7 }, (_, i) => addDays(start, i));

  return (
    <div className="flex flex-col gap-2">
      <p className="text-sm font-medium" id={labelId}>
        {label}
      </p>
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft">
        <li className="flex items-center gap-1.5">
          <span
            aria-hidden="true"
            className="inline-block h-1 w-4 rounded-sm bg-accent"
          />
          Keeps {kept}
        </li>
        <li className="flex items-center gap-1.5">
          <span
            aria-hidden="true"
            className="inline-block size-2 rounded-full bg-ok"
          />
          You're free
        </li>
      </ul>
      <div
        role="group"
        aria-labelledby={labelId}
        className="grid grid-cols-7 gap-1"
      >
        {WEEKDAYS.map((w) => (
          <span
            key={w}
            aria-hidden="true"
            className="pb-1 text-center text-xs font-medium text-ink-soft"
          >
            {w}
          </span>
        ))}
        {days.map((d) => {
          const past = d < from;
          const keeps = inWindow.has(d);
          const isFree = free.has(d);
          const chosen = value === d;
          const marks = [
            keeps ? `keeps ${kept}` : null,
            isFree ? "you're free" : null,
          ].filter(Boolean);
          return (
            <button
              key={d}
              type="button"
              disabled={past}
              aria-pressed={chosen}
              aria-label={`${dayWords(d)}${marks.length ? `: ${marks.join(", ")}` : ""}`}
              onClick={() => onChange(d)}
              className={cx(
                "relative flex min-h-11 flex-col items-center justify-center rounded border font-mono text-sm",
                chosen
                  ? "border-accent bg-accent text-card"
                  : keeps
                    ? "border-accent/50 bg-accent-wash text-ink"
                    : "border-rule bg-card text-ink",
                past &&
                  "cursor-not-allowed border-transparent bg-transparent text-ink-soft/60",
              )}
            >
              <span>{Number(d.slice(8, 10))}</span>
              {d.slice(8, 10) === "01" || d === days[0] ? (
                <span
                  aria-hidden="true"
                  className={cx(
                    "text-[0.625rem] leading-none",
                    chosen ? "text-card" : "text-ink-soft",
                  )}
                >
                  {dayWords(d).split(" ")[2]}
                </span>
              ) : null}
              {keeps && !chosen ? (
                <span
                  aria-hidden="true"
                  className="absolute inset-x-1.5 bottom-0.5 h-0.5 rounded-sm bg-accent"
                />
              ) : null}
              {isFree ? (
                <span
                  aria-hidden="true"
                  className={cx(
                    "absolute top-1 right-1 size-1.5 rounded-full",
                    chosen ? "bg-card" : "bg-ok",
                  )}
                />
              ) : null}
            </button>
          );
        })}
      </div>
    </div>
  );
}
