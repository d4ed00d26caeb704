import { Navigate, useLocation, useNavigate } from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { SignInForm } from "../../features/auth/components/SignInForm";
import {
  Card,
  ErrorState,
  LoadingState,
  PageHeader,
} from "../../components/ui";
import type { FromState } from "../layout/guards";

/** Only same-site paths, so a crafted link cannot send someone elsewhere after sign-in. */
function safeFrom(state: unknown): string {
  const from = (state as FromState | null)?.from;
  return typeof from === "string" &&
    from.startsWith("/") &&
    !from.startsWith("//")
    ? from
    : "/";
}

export function SignInRoute() {
  const session = useSession();
  const location = useLocation();
  const navigate = useNavigate();
  const from = safeFrom(location.state);

  if (session.data?.user) return <Navigate to={from} replace />;

  return (
    <>
      <PageHeader
        title="Sign in"
        description="Your jobs, visits and bookings in one place."
      />
      <Card className="p-5">
        {session.isPending ? (
          <LoadingState />
        ) : session.isError ? (
          // Sign-in needs the session's CSRF token, so without it the form cannot work.
          <ErrorState
            error={session.error}
            title="Sitecue can't reach the server"
            onRetry={() => session.refetch()}
          />
        ) : (
          <SignInForm onSignedIn={() => navigate(from, { replace: true })} />
        )}
      </Card>
    </>
  );
}
