import { Link } from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { PageHeader } from "../../components/ui";
import { PublicLayout } from "../layout/PublicLayout";

/** Unknown addresses: a plain 404 page with a way back. */
export function NotFoundRoute() {
  const session = useSession();
  const signedIn = !!session.data?.user;
  return (
    <PublicLayout>
      <PageHeader
        title="Page not found"
        description="There's no page at this address. The link may be mistyped, or the page may have moved."
      />
      <p>
        <Link
          to={signedIn ? "/" : "/sign-in"}
          className="text-accent underline underline-offset-2"
        >
          {signedIn ? "Go to your jobs" : "Go to sign in"}
        </Link>
      </p>
    </PublicLayout>
  );
}
