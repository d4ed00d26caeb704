import { Link } from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { ForgotPasswordForm } from "../../features/auth/components/ForgotPasswordForm";
import {
  Card,
  ErrorState,
  LoadingState,
  PageHeader,
} from "../../components/ui";

export function ForgotPasswordRoute() {
  const session = useSession();
  return (
    <>
      <PageHeader
        title="Reset your password"
        description="Enter the e-mail you sign in with and we'll send a link to set a new password."
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
          <ForgotPasswordForm />
        )}
      </Card>
      <p className="mt-4 text-sm">
        <Link
          to="/sign-in"
          className="text-accent underline underline-offset-2"
        >
          Back to sign in
        </Link>
      </p>
    </>
  );
}
