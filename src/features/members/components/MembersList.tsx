import { useState } from "react";
import type {
  InvitationResponse,
  MemberResponse,
} from "../../../../shared/schemas";
import { EmptyState, StatusBadge } from "../../../components/ui";
import { formatDate, formatDateTime } from "../../../lib/format";
import { roleLabels } from "../../../lib/labels";

export function MembersList({ members }: { members: MemberResponse[] }) {
  if (members.length === 0) return <EmptyState title="No members yet" />;
  return (
    <ul className="flex flex-col divide-y divide-rule">
      {members.map((m) => (
        <li
          key={m.userId}
          className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-2.5 first:pt-0 last:pb-0"
        >
          <div className="min-w-0">
            <span className="font-medium">{m.name}</span>{" "}
            <span className="text-sm text-ink-soft">
              · {roleLabels[m.role]}
            </span>
            <a
              href={`mailto:${m.email}`}
              className="block break-all text-sm text-accent underline underline-offset-2"
            >
              {m.email}
            </a>
          </div>
          <span className="text-sm text-ink-soft">
            Joined <span className="font-mono">{formatDate(m.joinedAt)}</span>
          </span>
        </li>
      ))}
    </ul>
  );
}

function invitationState(inv: InvitationResponse, now: number) {
  if (inv.acceptedAt) return <StatusBadge tone="ok">Accepted</StatusBadge>;
  if (Date.parse(inv.expiresAt) < now)
    return <StatusBadge tone="risk">Expired</StatusBadge>;
  return <StatusBadge tone="wait">Waiting</StatusBadge>;
}

export function InvitationsList({
  invitations,
}: {
  invitations: InvitationResponse[];
}) {
  // Read once per mount: whether a link has expired need not tick while the page is open.
  const [now] = useState(() => Date.now());
  if (invitations.length === 0) {
    return (
      <EmptyState title="No invitations sent">
        Invite a fitter, a trade or a customer below.
      </EmptyState>
    );
  }
  // Waiting invitations first: they are the ones that may need a nudge.
  const sorted = [...invitations].sort(
    (a, b) =>
      Number(!!a.acceptedAt) - Number(!!b.acceptedAt) ||
      b.createdAt.localeCompare(a.createdAt),
  );
  return (
    <ul className="flex flex-col divide-y divide-rule">
      {sorted.map((inv) => (
        <li
          key={inv.id}
          className="flex flex-col gap-1 py-2.5 first:pt-0 last:pb-0"
        >
          <div className="flex flex-wrap items-center gap-2">
            <span className="font-medium">{inv.name}</span>
            <span className="text-sm text-ink-soft">
              · {roleLabels[inv.role]}
            </span>
            {invitationState(inv, now)}
          </div>
          <span className="break-all text-sm">{inv.email}</span>
          <span className="text-sm text-ink-soft">
            Sent{" "}
            <span className="font-mono">{formatDateTime(inv.createdAt)}</span>
            {inv.acceptedAt ? (
              <>
                {" "}
                · accepted{" "}
                <span className="font-mono">
                  {formatDateTime(inv.acceptedAt)}
                </span>
              </>
            ) : (
              <>
                {" "}
                · link expires{" "}
                <span className="font-mono">
                  {formatDateTime(inv.expiresAt)}
                </span>
              </>
            )}
          </span>
        </li>
      ))}
    </ul>
  );
}
