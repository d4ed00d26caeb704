import { Navigate, useNavigate } from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { SignUpForm } from "../../features/auth/components/SignUpForm";
import {
  Card,
  ErrorState,
  LoadingState,
  PageHeader,
} from "../../components/ui";

/** "Create your workshop", reached from the sign-in page. */
export function SignUpRoute() {
  const session = useSession();
  const navigate = useNavigate();
  if (session.data?.user) return <Navigate to="/" replace />;
  return (
    <>
      <PageHeader
        title="Create your workshop"
        description="Plan your jobs, book your trades and keep your customers in the picture."
      />
      <Card className="p-5">
        {session.isPending ? (
          <LoadingState />
        ) : session.isError ? (
          <ErrorState
            error={session.error}
            title="Sitecue can't reach the server"
            onRetry={() => session.refetch()}
          />
        ) : (
          // The set-up step comes next (it can be skipped and returned to).
          <SignUpForm
            onSignedUp={() => navigate("/setup", { replace: true })}
          />
        )}
      </Card>
    </>
  );
}
