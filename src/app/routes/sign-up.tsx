import { useState } from "react";
import { Navigate } from "react-router-dom";
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
  // One redirect for both cases, so the signed-in guard cannot race the form's own navigation
  // (it did: the new owner landed on the home instead of the set-up).
  const [signedUp, setSignedUp] = useState(false);
  if (session.data?.user)
    return <Navigate to={signedUp ? "/setup" : "/"} replace />;
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
          <SignUpForm onSignedUp={() => setSignedUp(true)} />
        )}
      </Card>
    </>
  );
}
