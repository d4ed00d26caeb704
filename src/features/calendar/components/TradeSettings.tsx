import { useState } from "react";
import {
  Button,
  ErrorState,
  FormError,
  LoadingState,
  Section,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { formatDate } from "../../../lib/format";
import { useMyDaysOff, useSetMyDaysOff } from "../api/my-days-off";
import { useMakeMyFeed, useMyFeed, useRevokeMyFeed } from "../api/my-feed";
import { todayDate } from "../model";

/** A trade's days off, entered once for every workshop they work for. */
export function DaysOffEditor() {
  const daysOff = useMyDaysOff();
  const save = useSetMyDaysOff();
  const [date, setDate] = useState("");
  const [error, setError] = useState<string | null>(null);
  if (daysOff.isPending) return <LoadingState label="Loading your days off…" />;
  if (daysOff.isError)
    return (
      <ErrorState
        error={daysOff.error}
        onRetry={() => void daysOff.refetch()}
      />
    );
  const today = todayDate();
  const list = daysOff.data.daysOff.filter((d) => d >= today).sort();
  const put = (next: string[]) => {
    setError(null);
    save.mutate(
      { daysOff: [...new Set(next)].sort() },
      { onError: (e) => setError(errorMessage(e)) },
    );
  };
  return (
    <Section
      title="Days off"
      id="days-off"
      description="Entered once: every workshop you work for sees these days as closed."
    >
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          if (date) put([...daysOff.data.daysOff, date]);
          setDate("");
        }}
      >
        <label className="flex flex-col text-sm text-ink-soft">
          Day off
          <input
            type="date"
            min={today}
            className="rounded border border-rule-strong bg-card px-2 py-1 font-mono text-sm text-ink"
            value={date}
            onChange={(e) => setDate(e.target.value)}
            required
          />
        </label>
        <Button size="sm" type="submit" busy={save.isPending}>
          Add day off
        </Button>
      </form>
      <FormError message={error} className="mt-2" />
      {list.length === 0 ? (
        <p className="mt-3 text-sm text-ink-soft">No days off ahead.</p>
      ) : (
        <ul
          className="mt-3 flex flex-col divide-y divide-rule"
          aria-label="Your days off"
        >
          {list.map((d) => (
            <li
              key={d}
              className="flex items-center justify-between gap-2 py-1.5"
            >
              <span className="font-mono text-sm">{formatDate(d)}</span>
              <Button
                size="sm"
                variant="quiet"
                aria-label={`Remove ${formatDate(d)}`}
                onClick={() => put(daysOff.data.daysOff.filter((x) => x !== d))}
              >
                Remove
              </Button>
            </li>
          ))}
        </ul>
      )}
    </Section>
  );
}

/** The person's secret calendar-feed URL: made, remade or turned off here. */
/** The person's private calendar feed: what it holds depends on who they are (their visits, or the workshop's bookings and tasks). */
export function FeedLink({
  description = "Subscribe to your visits in your own calendar app. Keep the link private.",
}: {
  description?: string;
} = {}) {
  const feed = useMyFeed();
  const make = useMakeMyFeed();
  const revoke = useRevokeMyFeed();
  const [url, setUrl] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  if (feed.isPending) return <LoadingState label="Loading your feed…" />;
  if (feed.isError)
    return (
      <ErrorState error={feed.error} onRetry={() => void feed.refetch()} />
    );
  const onMake = () => {
    setError(null);
    make.mutate(undefined, {
      onSuccess: (a) => setUrl(a.url),
      onError: (e) => setError(errorMessage(e)),
    });
  };
  return (
    <Section title="Calendar feed" id="feed" description={description}>
      {url ? (
        <label className="flex flex-col gap-1 text-sm">
          Your feed link (shown this once)
          <input
            readOnly
            value={url}
            onFocus={(e) => e.target.select()}
            className="rounded border border-rule-strong bg-paper px-2 py-1 font-mono text-xs"
          />
        </label>
      ) : (
        <p className="text-sm text-ink-soft">
          {feed.data.exists
            ? "You have a feed link. Make a new one if you lost it: the old one stops working."
            : "No feed link yet."}
        </p>
      )}
      <FormError message={error} className="mt-2" />
      <div className="mt-3 flex flex-wrap gap-2">
        <Button size="sm" onClick={onMake} busy={make.isPending}>
          {feed.data.exists ? "Make a new feed link" : "Make a feed link"}
        </Button>
        {feed.data.exists ? (
          <Button
            size="sm"
            variant="secondary"
            busy={revoke.isPending}
            onClick={() => {
              setUrl(null);
              revoke.mutate(undefined, {
                onError: (e) => setError(errorMessage(e)),
              });
            }}
          >
            Turn the feed off
          </Button>
        ) : null}
      </div>
    </Section>
  );
}
