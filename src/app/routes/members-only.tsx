import { Link } from "react-router-dom";
import { PageHeader } from "../../components/ui";

/** For pages only a workshop's owner or fitters use, reached by someone else. */
export function MembersOnly({
  title,
  ownerOnly = false,
}: {
  title: string;
  ownerOnly?: boolean;
}) {
  return (
    <>
      <PageHeader title={title} />
      <div
        role="alert"
        className="rounded border border-rule bg-card px-4 py-4"
      >
        <p className="font-semibold">
          This page is for the workshop{ownerOnly ? "'s owner" : ""}
        </p>
        <p className="mt-1 text-sm text-ink-soft">
          {ownerOnly
            ? "Only the workshop's owner manages its members and invitations."
            : "Only the workshop's owner and fitters see this."}{" "}
          <Link to="/" className="text-accent underline underline-offset-2">
            Go to your jobs
          </Link>
        </p>
      </div>
    </>
  );
}
