import { isRouteErrorResponse, Link, useRouteError } from "react-router-dom";
import { PageHeader } from "../../components/ui";
import { PublicLayout } from "../layout/PublicLayout";

/** Shown when a screen itself fails (a bug), instead of a blank page. */
export function RouteErrorPage() {
  const error = useRouteError();
  const detail = isRouteErrorResponse(error)
    ? `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : null;
  return (
    <PublicLayout>
      <PageHeader
        title="Something went wrong"
        description="This screen hit a problem. Reloading often helps."
      />
      {detail ? (
        <p className="mb-4 rounded border border-rule bg-card px-3 py-2 font-mono text-sm">
          {detail}
        </p>
      ) : null}
      <p>
        <Link
          to="/"
          reloadDocument
          className="text-accent underline underline-offset-2"
        >
          Reload Sitecue
        </Link>
      </p>
    </PublicLayout>
  );
}
