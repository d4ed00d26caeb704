import { useEffect, useRef } from "react";
import { Link, useParams } from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { useVerifyEmail } from "../../features/auth/api/verify-email";
import {
  Card,
  ErrorState,
  LoadingState,
  PageHeader,
} from "../../components/ui";
import { isApiError } from "../../lib/api-client";

/**
 * The e-mailed address-check link. Opening the page changes nothing by itself (a GET); the page
 * posts the token with the session's CSRF token once, so a mail scanner fetching the link
 * verifies nothing.
 */
export function VerifyEmailRoute() {
  const { token = "" } = useParams();
  const session = useSession();
  const verify = useVerifyEmail();
  const sent = useRef(false);
  const ready = session.isSuccess;

  useEffect(() => {
    if (!ready || sent.current) return;
    sent.current = true;
    verify.mutate(token);
  }, [ready, token, verify]);

  const signedIn = Boolean(session.data?.user);
  let body: React.ReactNode;
  if (session.isError) {
    body = (
      <ErrorState
        error={session.error}
        title="Sitecue can't reach the server"
        onRetry={() => session.refetch()}
      />
    );
  } else if (verify.isSuccess) {
    body = (
      <div role="status" className="flex flex-col gap-3">
        <p className="font-semibold">Your e-mail address is confirmed</p>
        <p className="text-sm">
          <span className="break-all">{verify.data.email}</span> is confirmed.
          Sitecue can now send your bookings, invitations and messages.
        </p>
        <p className="text-sm">
          <Link
            to={signedIn ? "/" : "/sign-in"}
            className="text-accent underline underline-offset-2"
          >
            {signedIn ? "Open Sitecue" : "Sign in"}
          </Link>
        </p>
      </div>
    );
  } else if (verify.isError) {
    body =
      isApiError(verify.error) &&
      (verify.error.code === "token-invalid" || verify.error.status === 400) ? (
        <div role="alert" className="flex flex-col gap-3">
          <p className="font-semibold">This link no longer works</p>
          <p className="text-sm">
            {verify.error.code === "token-invalid"
              ? // The server says why: used (so already confirmed) or expired.
                verify.error.message
              : "It was copied incompletely. Open the link in the e-mail again."}
          </p>
          <p className="text-sm">
            <Link
              to={signedIn ? "/" : "/sign-in"}
              className="text-accent underline underline-offset-2"
            >
              {signedIn ? "Open Sitecue" : "Sign in"}
            </Link>
          </p>
        </div>
      ) : (
        <ErrorState error={verify.error} onRetry={() => verify.mutate(token)} />
      );
  } else {
    body = <LoadingState label="Confirming your e-mail address…" />;
  }

  return (
    <>
      <PageHeader title="Confirm your e-mail address" />
      <Card className="p-5">{body}</Card>
    </>
  );
}
