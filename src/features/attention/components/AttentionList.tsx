import { useState } from "react";
import type { AttentionItem, AttentionKind } from "../../../../shared/schemas";
import {
  Button,
  EmptyState,
  ErrorState,
  FormError,
  LinkButton,
  LoadingState,
  Notice,
  PartyChip,
  Section,
  StatusBadge,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { useAttention } from "../api/get-attention";
import { useRetryMail } from "../api/retry-mail";

/** Each kind's label beside its sentence (words always; the colour only repeats them). */
const kindLabels: Record<AttentionKind, string> = {
  "handover-at-risk": "Agreed handover at risk",
  clash: "Clash",
  "customer-away": "Customer away",
  "mail-failed": "E-mail not sent",
  declined: "Declined",
  "date-proposed": "Date proposed",
  "needs-reconfirming": "Needs re-confirming",
  "awaiting-answer": "No answer yet",
  "not-booked": "Not booked",
  unread: "Unread",
};

const toneOf = { risk: "risk", wait: "wait", info: "neutral" } as const;

/** Enough to act on at a glance; the rest one click away. */
const FIRST = 8;

interface SendAgain {
  /** The message being sent again, while its request is out. */
  busyId: string | null;
  /** The message whose request was refused, and why. */
  error: { id: string; message: string } | null;
  send: (messageId: string) => void;
}

function Item({
  item,
  index,
  sendAgain,
}: {
  item: AttentionItem;
  index: number;
  sendAgain: SendAgain;
}) {
  const headingId = `attention-${index}`;
  const action = item.action;
  const variant = item.tone === "info" ? "secondary" : "primary";
  const className = "justify-self-start sm:justify-self-end";
  return (
    <li
      aria-labelledby={headingId}
      className="grid gap-2 py-3 first:pt-0 last:pb-0 sm:grid-cols-[1fr_auto] sm:items-center sm:gap-4"
      data-kind={item.kind}
    >
      <div className="flex min-w-0 flex-col gap-1">
        <p
          id={headingId}
          className="flex flex-wrap items-center gap-x-2 gap-y-1 text-sm"
        >
          <StatusBadge tone={toneOf[item.tone]}>
            {kindLabels[item.kind]}
          </StatusBadge>
          {item.job ? (
            <span className="font-semibold">{item.job.title}</span>
          ) : null}
          {item.task ? (
            <>
              <span aria-hidden="true" className="text-ink-soft">
                ·
              </span>
              <span>{item.task.name}</span>
              <PartyChip party={item.task.party} />
            </>
          ) : null}
        </p>
        <p className="break-words text-sm text-ink-soft">{item.sentence}</p>
        {"retryMessageId" in action &&
        sendAgain.error?.id === action.retryMessageId ? (
          <FormError message={sendAgain.error.message} />
        ) : null}
      </div>
      {"retryMessageId" in action ? (
        // Fixed here and now (no screen to go to): a button, not a link.
        <Button
          size="sm"
          variant={variant}
          className={className}
          aria-describedby={headingId}
          busy={sendAgain.busyId === action.retryMessageId}
          onClick={() => sendAgain.send(action.retryMessageId)}
        >
          {action.label}
        </Button>
      ) : (
        <LinkButton
          to={action.to}
          size="sm"
          variant={variant}
          className={className}
          aria-describedby={headingId}
        >
          {action.label}
        </LinkButton>
      )}
    </li>
  );
}

/**
 * The maker's attention list: what needs the workshop now across its open jobs, most urgent
 * first, each item one click from the screen where it is fixed.
 */
export function AttentionList({ workshopId }: { workshopId: string }) {
  const attention = useAttention(workshopId);
  const [all, setAll] = useState(false);
  const retry = useRetryMail(workshopId);
  const [resent, setResent] = useState<string | null>(null);
  const [retryError, setRetryError] = useState<SendAgain["error"]>(null);
  const sendAgain: SendAgain = {
    busyId: retry.isPending ? (retry.variables ?? null) : null,
    error: retryError,
    send: (messageId) => {
      setResent(null);
      setRetryError(null);
      retry.mutate(messageId, {
        onSuccess: (queued) => setResent(queued.to),
        onError: (err) =>
          setRetryError({ id: messageId, message: errorMessage(err) }),
      });
    },
  };

  let body: React.ReactNode;
  if (attention.isPending)
    body = <LoadingState label="Looking across the jobs…" />;
  else if (attention.isError)
    body = (
      <ErrorState error={attention.error} onRetry={() => attention.refetch()} />
    );
  else {
    const { items, jobsChecked } = attention.data;
    const shown = all ? items : items.slice(0, FIRST);
    body =
      items.length === 0 ? (
        <EmptyState title="Nothing is waiting on you">
          {jobsChecked === 0
            ? "No open jobs yet. When a job has bookings to answer or work to book, it shows here."
            : `No answers to give, no clashes, no work to book and every handover on time, across ${jobsChecked === 1 ? "the open job" : `all ${jobsChecked} open jobs`}.`}
        </EmptyState>
      ) : (
        <div className="flex flex-col gap-3">
          <ol
            className="flex flex-col divide-y divide-rule"
            aria-label="Needs you now"
          >
            {shown.map((item, i) => (
              <Item key={item.id} item={item} index={i} sendAgain={sendAgain} />
            ))}
          </ol>
          {items.length > FIRST ? (
            <Button
              variant="quiet"
              size="sm"
              className="self-start"
              aria-expanded={all}
              onClick={() => setAll(!all)}
            >
              {all ? "Show the first few" : `Show all ${items.length}`}
            </Button>
          ) : null}
        </div>
      );
  }

  const count = attention.data?.items.length ?? 0;
  return (
    <Section
      title="Needs you now"
      id="attention"
      description={
        attention.data
          ? count
            ? `${count} ${count === 1 ? "thing" : "things"} across the open jobs, most urgent first.`
            : undefined
          : "Across the open jobs, most urgent first."
      }
    >
      <div className="flex flex-col gap-3">
        {resent ? (
          <Notice>
            The e-mail to {resent} is back in the queue and will be sent again
            in a moment.
          </Notice>
        ) : null}
        {body}
      </div>
    </Section>
  );
}
