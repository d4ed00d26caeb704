import { useState } from "react";
import {
  AWAY_MAX_DAYS_AHEAD,
  MAX_AWAY_RANGES,
  type AwayRange,
} from "../../../../shared/schemas";
import {
  Button,
  ErrorState,
  FormError,
  LoadingState,
  Section,
  TextField,
} from "../../../components/ui";
import { errorMessage, isApiError } from "../../../lib/api-client";
import { useTimeline } from "../api/get-timeline";
import { useSetAwayDates } from "../api/set-away-dates";
import { daysWords, plusDays } from "../words";

/** The first message the server gave for a field of the list, if any. */
function fieldError(e: unknown): string | null {
  if (!isApiError(e) || !e.fields) return null;
  const first = Object.values(e.fields)[0];
  return first?.[0] ?? null;
}

/**
 * The dates the customer will be away: the site is closed for booking then, and the workshop is
 * told about any visit already booked on them.
 */
export function AwayDatesEditor({ jobId }: { jobId: string }) {
  const timeline = useTimeline(jobId);
  const save = useSetAwayDates(jobId);
  const [from, setFrom] = useState("");
  const [to, setTo] = useState("");
  const [error, setError] = useState<string | null>(null);

  const body = () => {
    if (timeline.isPending)
      return <LoadingState label="Loading your away dates…" />;
    if (timeline.isError)
      return (
        <ErrorState
          error={timeline.error}
          onRetry={() => void timeline.refetch()}
        />
      );
    const t = timeline.data;
    const last = plusDays(t.today, AWAY_MAX_DAYS_AHEAD);
    const put = (ranges: AwayRange[], onDone?: () => void) => {
      setError(null);
      save.mutate(
        { ranges },
        {
          onSuccess: () => onDone?.(),
          onError: (e) => setError(fieldError(e) ?? errorMessage(e)),
        },
      );
    };
    const add = (e: React.FormEvent) => {
      e.preventDefault();
      const end = to || from;
      if (!from) return setError("Choose the first day you are away.");
      if (end < from)
        return setError("The last day comes on or after the first.");
      put([...t.away, { from, to: end }], () => {
        setFrom("");
        setTo("");
      });
    };
    const full = t.away.length >= MAX_AWAY_RANGES;
    return (
      <div className="flex flex-col gap-4">
        {t.away.length === 0 ? (
          <p className="text-sm text-ink-soft">No away dates.</p>
        ) : (
          <ul className="flex flex-col divide-y divide-rule">
            {t.away.map((r, i) => (
              <li
                key={`${r.from}-${r.to}`}
                className="flex items-center justify-between gap-3 py-2 first:pt-0"
                data-testid="away-range"
              >
                <span className="font-mono text-sm">
                  {daysWords(r.from, r.to)}
                </span>
                <Button
                  size="sm"
                  variant="quiet-danger"
                  disabled={save.isPending}
                  aria-label={`Remove ${daysWords(r.from, r.to)}`}
                  onClick={() => put(t.away.filter((_, k) => k !== i))}
                >
                  Remove
                </Button>
              </li>
            ))}
          </ul>
        )}
        {full ? (
          <p className="text-sm text-ink-soft">
            That is the most ({MAX_AWAY_RANGES}); remove one to add another.
          </p>
        ) : (
          <form
            onSubmit={add}
            className="flex flex-col gap-3"
            aria-label="Add away dates"
          >
            <div className="grid grid-cols-2 gap-3">
              <TextField
                label="First day away"
                type="date"
                value={from}
                min={t.today}
                max={last}
                onChange={(e) => {
                  setFrom(e.target.value);
                  if (!to || to < e.target.value) setTo(e.target.value);
                }}
              />
              <TextField
                label="Last day away"
                type="date"
                value={to}
                min={from || t.today}
                max={last}
                onChange={(e) => setTo(e.target.value)}
              />
            </div>
            <div>
              <Button type="submit" size="sm" busy={save.isPending}>
                Add away dates
              </Button>
            </div>
          </form>
        )}
        <FormError message={error} />
      </div>
    );
  };

  return (
    <Section
      title="Dates you'll be away"
      id={`away-${jobId}`}
      description="These days are closed for booking. If a visit is already booked then, the workshop is told."
    >
      {body()}
    </Section>
  );
}
