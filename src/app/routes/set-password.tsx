import { Link, useNavigate, useParams } from "react-router-dom";
import { useSession } from "../../features/auth/api/get-session";
import { useTokenInfo } from "../../features/auth/api/get-token-info";
import { SetPasswordForm } from "../../features/auth/components/SetPasswordForm";
import {
  Card,
  ErrorState,
  LoadingState,
  PageHeader,
} from "../../components/ui";
import { isApiError } from "../../lib/api-client";
import { roleLabels } from "../../lib/labels";

type Purpose = "invitation" | "password-reset";

const roleSentence: Record<keyof typeof roleLabels, string> = {
  owner: "as an owner, with access to everything in the workshop",
  fitter: "as a fitter, to run the workshop's jobs and programmes",
  trade: "as a trade, to see and answer the bookings for your work",
  customer: "as the customer, to see who comes to your home and when",
};

function InvalidLink({
  purpose,
  reason,
}: {
  purpose: Purpose;
  /** The server's reason (expired, used, replaced by a newer link), when it gave one. */
  reason?: string;
}) {
  return (
    <div role="alert" className="flex flex-col gap-3">
      <p className="font-semibold">This link no longer works</p>
      <p className="text-sm">
        {reason ??
          (purpose === "invitation"
            ? "It has expired, has already been used, or was copied incompletely. Ask the workshop to send you a new invitation."
            : "It has expired, has already been used, or was copied incompletely. Ask for a new reset link.")}
      </p>
      <p className="text-sm">
        {purpose === "invitation" ? (
          <Link
            to="/sign-in"
            className="text-accent underline underline-offset-2"
          >
            Already set a password? Sign in
          </Link>
        ) : (
          <Link
            to="/forgot-password"
            className="text-accent underline underline-offset-2"
          >
            Send a new reset link
          </Link>
        )}
      </p>
    </div>
  );
}

function SetPasswordPage({ purpose }: { purpose: Purpose }) {
  const { token = "" } = useParams();
  const navigate = useNavigate();
  // The session supplies the CSRF token that setting the password needs.
  const session = useSession();
  const info = useTokenInfo(token);
  const title =
    purpose === "invitation" ? "Accept your invitation" : "Set a new password";

  let body: React.ReactNode;
  if (info.isPending || session.isPending) {
    body = <LoadingState label="Checking your link…" />;
  } else if (info.isError) {
    body =
      isApiError(info.error) &&
      (info.error.code === "token-invalid" ||
        info.error.status === 404 ||
        info.error.status === 400) ? (
        <InvalidLink
          purpose={purpose}
          reason={
            info.error.code === "token-invalid" ? info.error.message : undefined
          }
        />
      ) : (
        <ErrorState error={info.error} onRetry={() => info.refetch()} />
      );
  } else if (session.isError) {
    body = (
      <ErrorState
        error={session.error}
        title="Sitecue can't reach the server"
        onRetry={() => session.refetch()}
      />
    );
  } else if (info.data.kind !== purpose) {
    body = <InvalidLink purpose={purpose} />;
  } else {
    const t = info.data;
    body = (
      <div className="flex flex-col gap-5">
        {purpose === "invitation" ? (
          <p>
            {t.workshopName ? <strong>{t.workshopName}</strong> : "A workshop"}{" "}
            has invited you to Sitecue
            {t.role ? ` ${roleSentence[t.role]}` : ""}.
          </p>
        ) : null}
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded border border-rule bg-paper px-3 py-2 text-sm">
          <dt className="text-ink-soft">Name</dt>
          <dd className="font-medium">{t.name}</dd>
          <dt className="text-ink-soft">E-mail</dt>
          <dd className="font-medium break-all">{t.email}</dd>
          {t.role ? (
            <>
              <dt className="text-ink-soft">Role</dt>
              <dd className="font-medium">{roleLabels[t.role]}</dd>
            </>
          ) : null}
        </dl>
        <SetPasswordForm
          token={token}
          email={t.email}
          submitLabel={
            purpose === "invitation"
              ? "Set password and open Sitecue"
              : "Save new password"
          }
          onDone={() => navigate("/", { replace: true })}
        />
      </div>
    );
  }

  return (
    <>
      <PageHeader title={title} />
      <Card className="p-5">{body}</Card>
    </>
  );
}

export function InviteRoute() {
  return <SetPasswordPage purpose="invitation" />;
}

export function ResetRoute() {
  return <SetPasswordPage purpose="password-reset" />;
}
