import { Link, useNavigate, useParams } from "react-router-dom";
import type { TokenInfoResponse } from "../../../shared/schemas";
import { useAcceptInvitation } from "../../features/auth/api/accept-invitation";
import { useSession } from "../../features/auth/api/get-session";
import { useSignOut } from "../../features/auth/api/sign-out";
import { useTokenInfo } from "../../features/auth/api/get-token-info";
import { SetPasswordForm } from "../../features/auth/components/SetPasswordForm";
import {
  Button,
  Card,
  ErrorState,
  FormError,
  LinkButton,
  LoadingState,
  PageHeader,
} from "../../components/ui";
import { errorMessage, isApiError } from "../../lib/api-client";
import { roleLabels } from "../../lib/labels";

type Purpose = "invitation" | "password-reset";

const roleSentence: Record<keyof typeof roleLabels, string> = {
  owner: "as an owner, with access to everything in the workshop",
  fitter: "as a fitter, to run the workshop's jobs and programmes",
  trade: "as a trade, to see and answer the bookings for your work",
  customer: "as the customer, to see who comes to your home and when",
};

/** "Hollin & Vane Joinery asks you to join their jobs as Ashby Plaster & Coving." */
function WhoAsks({ t }: { t: TokenInfoResponse }) {
  const workshop = t.workshopName ? (
    <strong>{t.workshopName}</strong>
  ) : (
    "A workshop"
  );
  if (t.role === "trade" && t.tradeName)
    return (
      <p>
        {workshop} asks you to join their jobs on Sitecue as{" "}
        <strong>{t.tradeName}</strong>, to see and answer the bookings for your
        work.
      </p>
    );
  return (
    <p>
      {workshop} has invited you to Sitecue
      {t.role ? ` ${roleSentence[t.role]}` : ""}.
    </p>
  );
}

/**
 * An invitation for an address that already has an account: the person signs in (or is signed
 * in) as that account and accepts; no password is chosen, so nothing else of theirs changes.
 */
function SignInToAccept({ token, t }: { token: string; t: TokenInfoResponse }) {
  const navigate = useNavigate();
  const session = useSession();
  const accept = useAcceptInvitation();
  const signOut = useSignOut();
  const me = session.data?.user ?? null;
  let action: React.ReactNode;
  if (!me) {
    action = (
      <>
        <p className="text-sm">
          You already have a Sitecue account with this address. Sign in to
          accept: your password stays as it is, and your visits for every
          workshop stay in one list.
        </p>
        <LinkButton
          to="/sign-in"
          state={{ from: `/invite/${token}` }}
          className="w-full"
        >
          Sign in to accept
        </LinkButton>
      </>
    );
  } else if (me.email !== t.email) {
    action = (
      <>
        <p role="alert" className="text-sm">
          You are signed in as <strong className="break-all">{me.email}</strong>
          . This invitation is for{" "}
          <strong className="break-all">{t.email}</strong>: sign out, then sign
          in as that account to accept it.
        </p>
        <Button
          variant="secondary"
          busy={signOut.isPending}
          onClick={() => signOut.mutate()}
          className="w-full"
        >
          Sign out
        </Button>
      </>
    );
  } else {
    action = (
      <>
        <FormError
          message={accept.isError ? errorMessage(accept.error) : null}
        />
        <p className="text-sm">
          You are signed in as <strong className="break-all">{me.email}</strong>
          . Accepting adds this workshop to your account; your password stays as
          it is.
        </p>
        <Button
          busy={accept.isPending}
          onClick={() =>
            accept.mutate(
              { token },
              { onSuccess: () => navigate("/", { replace: true }) },
            )
          }
          className="w-full"
        >
          Accept and link
        </Button>
      </>
    );
  }
  return (
    <div className="flex flex-col gap-5">
      <WhoAsks t={t} />
      {action}
    </div>
  );
}

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
  } else if (info.data.existingAccount) {
    body = <SignInToAccept token={token} t={info.data} />;
  } else {
    const t = info.data;
    body = (
      <div className="flex flex-col gap-5">
        {purpose === "invitation" ? <WhoAsks t={t} /> : null}
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
