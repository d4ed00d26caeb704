import type { SessionUser } from "../../../../shared/schemas";
import { Button } from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { useResendVerification } from "../api/resend-verification";

/**
 * Shown on every workshop page until the owner has used their sign-up link: until then Sitecue
 * e-mails nobody for the workshop (issue 14), so they need to know why and how to fix it.
 */
export function VerifyEmailBanner({ user }: { user: SessionUser }) {
  const resend = useResendVerification();
  if (user.emailVerified || user.memberships.length === 0) return null;
  return (
    <div
      role="region"
      aria-label="Confirm your e-mail address"
      className="border-b border-wait/50 bg-wait-wash"
    >
      <div className="mx-auto flex max-w-page flex-wrap items-center gap-x-3 gap-y-1 px-4 py-2 text-sm">
        <p className="min-w-0 break-words">
          <strong>Confirm your e-mail address</strong> — we sent a link to{" "}
          <span className="font-medium break-all">{user.email}</span>. Until
          then Sitecue sends nothing to your trades, customers or fitters.
        </p>
        <Button
          variant="quiet"
          size="sm"
          busy={resend.isPending}
          onClick={() => resend.mutate()}
        >
          Send it again
        </Button>
        <p aria-live="polite" className="w-full empty:hidden">
          {resend.isSuccess
            ? `Sent a new link to ${resend.data.email}.`
            : resend.isError
              ? errorMessage(resend.error)
              : ""}
        </p>
      </div>
    </div>
  );
}
