import { useState } from "react";
import { useMembers } from "../../features/members/api/list-members";
import { MembersList } from "../../features/members/components/MembersList";
import { StartersEditor } from "../../features/jobs/components/StartersEditor";
import { useWorkshop } from "../../features/settings/api/get-workshop";
import { SettingsForm } from "../../features/settings/components/SettingsForm";
import type { SettingsPreview } from "../../../shared/schemas";
import {
  ErrorState,
  LinkButton,
  LoadingState,
  Notice,
  PageHeader,
  Section,
} from "../../components/ui";
import { useActiveWorkshop } from "../active-workshop";
import { MembersOnly } from "./members-only";

/** What was saved, in words: the jobs re-planned and the bookings sent back to confirm. */
function savedWords(replanned: SettingsPreview | null): string {
  if (!replanned?.jobs.length) return "Settings saved.";
  const bookings = replanned.jobs.reduce((n, j) => n + j.bookings.length, 0);
  const jobs = replanned.jobs.length;
  return `Settings saved. ${jobs === 1 ? "1 job" : `${jobs} jobs`} re-planned${
    bookings
      ? `; ${bookings === 1 ? "1 booking needs" : `${bookings} bookings need`} re-confirming`
      : ""
  }.`;
}

/** The owner's workshop settings: days, hours, nation, arrivals and reminders; starters; members. */
export function SettingsRoute() {
  const { active } = useActiveWorkshop();
  if (!active || active.role !== "owner")
    return <MembersOnly title="Workshop settings" ownerOnly />;
  return <SettingsPage workshopId={active.workshopId} />;
}

function SettingsPage({ workshopId }: { workshopId: string }) {
  const workshop = useWorkshop(workshopId);
  const members = useMembers(workshopId);
  const [saved, setSaved] = useState<string | null>(null);
  return (
    <>
      <PageHeader
        title="Workshop settings"
        eyebrow={workshop.data?.name}
        description="How the workshop works: the programme, bookings and reminders follow these."
      />
      <div className="flex flex-col gap-6">
        <Section title="Workshop" id="settings">
          {workshop.isPending ? (
            <LoadingState label="Loading settings…" />
          ) : workshop.isError ? (
            <ErrorState
              error={workshop.error}
              onRetry={() => workshop.refetch()}
            />
          ) : (
            <div className="flex flex-col gap-4">
              {saved ? <Notice>{saved}</Notice> : null}
              <SettingsForm
                workshop={workshop.data}
                groups={["workshop", "nation", "days", "arrivals"]}
                submitLabel="Save settings"
                onSaved={(_, replanned) => setSaved(savedWords(replanned))}
              />
            </div>
          )}
        </Section>
        <Section
          title="Starters"
          id="starters"
          description="Starting programmes a new job can begin from."
        >
          <StartersEditor workshopId={workshopId} />
        </Section>
        <Section
          title="Members"
          id="members"
          actions={
            <LinkButton to="/members" variant="secondary" size="sm">
              Invite someone
            </LinkButton>
          }
        >
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
      </div>
    </>
  );
}
