import { useParams } from "react-router-dom";
import { useMail } from "../../features/mail/api/list-mail";
import { Mailbox } from "../../features/mail/components/Mailbox";
import {
  Button,
  ErrorState,
  LoadingState,
  PageHeader,
} from "../../components/ui";
import { isApiError } from "../../lib/api-client";

/** The local mail catcher's inbox (development only; the API answers 404 in production). */
export function DevMailRoute() {
  const { messageId } = useParams();
  const mail = useMail();
  const notHere = isApiError(mail.error) && mail.error.status === 404;
  return (
    <>
      <PageHeader
        title="Dev mailbox"
        description="Mail Sitecue sends while running locally is caught here instead of being delivered."
        actions={
          !notHere ? (
            <Button
              variant="secondary"
              onClick={() => mail.refetch()}
              busy={mail.isFetching && !mail.isPending}
            >
              Refresh
            </Button>
          ) : null
        }
      />
      {mail.isPending ? (
        <LoadingState label="Loading mail…" />
      ) : notHere ? (
        <div
          role="status"
          className="rounded border border-rule bg-card px-4 py-4"
        >
          <p className="font-semibold">There is no mailbox on this server</p>
          <p className="mt-1 text-sm text-ink-soft">
            Here mail goes to a real mail server and arrives in people's own
            inboxes.
          </p>
        </div>
      ) : mail.isError ? (
        <ErrorState error={mail.error} onRetry={() => mail.refetch()} />
      ) : (
        <Mailbox messages={mail.data} selectedId={messageId} />
      )}
    </>
  );
}
