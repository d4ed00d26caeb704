import { useState } from "react";
import type { InvitationResponse } from "../../../shared/schemas";
import { useCustomers } from "../../features/customers/api/list-customers";
import { useInvitations } from "../../features/members/api/list-invitations";
import { useMembers } from "../../features/members/api/list-members";
import { InviteForm } from "../../features/members/components/InviteForm";
import {
  InvitationsList,
  MembersList,
} from "../../features/members/components/MembersList";
import { useTrades } from "../../features/trades/api/list-trades";
import {
  ErrorState,
  LoadingState,
  Notice,
  PageHeader,
  Section,
} from "../../components/ui";
import { errorMessage } from "../../lib/api-client";
import { useActiveWorkshop } from "../active-workshop";
import { MembersOnly } from "./members-only";

export function MembersRoute() {
  const { active } = useActiveWorkshop();
  if (!active || active.role !== "owner")
    return <MembersOnly title="Members" ownerOnly />;
  return (
    <MembersPage
      workshopId={active.workshopId}
      workshopName={active.workshopName}
    />
  );
}

function MembersPage({
  workshopId,
  workshopName,
}: {
  workshopId: string;
  workshopName: string;
}) {
  const members = useMembers(workshopId);
  const invitations = useInvitations(workshopId);
  const trades = useTrades(workshopId);
  const customers = useCustomers(workshopId);
  const [sent, setSent] = useState<InvitationResponse | null>(null);

  const listsError = trades.isError
    ? `Trades could not be loaded: ${errorMessage(trades.error)}`
    : customers.isError
      ? `Customers could not be loaded: ${errorMessage(customers.error)}`
      : null;

  return (
    <>
      <PageHeader
        title="Members"
        eyebrow={workshopName}
        description="Who can sign in to this workshop, and who you have invited."
      />
      <div className="grid gap-6 lg:grid-cols-2">
        <Section title="Workshop members" id="members">
          {members.isPending ? (
            <LoadingState label="Loading members…" />
          ) : members.isError ? (
            <ErrorState
              error={members.error}
              onRetry={() => members.refetch()}
            />
          ) : (
            <MembersList members={members.data} />
          )}
        </Section>
        <Section title="Invitations" id="invitations">
          {invitations.isPending ? (
            <LoadingState label="Loading invitations…" />
          ) : invitations.isError ? (
            <ErrorState
              error={invitations.error}
              onRetry={() => invitations.refetch()}
            />
          ) : (
            <InvitationsList invitations={invitations.data} />
          )}
        </Section>
        <Section title="Invite someone" id="invite" className="lg:col-span-2">
          <div className="flex flex-col gap-4">
            {sent ? (
              <Notice>
                Invitation sent to {sent.email}.
                {sent.existingAccount
                  ? " They have a Sitecue account: they will be asked to sign in and link it."
                  : null}
              </Notice>
            ) : null}
            <InviteForm
              workshopId={workshopId}
              trades={trades.data}
              customers={customers.data}
              listsError={listsError}
              onInvited={setSent}
            />
          </div>
        </Section>
      </div>
    </>
  );
}
