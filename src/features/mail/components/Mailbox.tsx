import { Link } from "react-router-dom";
import type { CaughtMail } from "../../../../shared/schemas";
import { cx, EmptyState } from "../../../components/ui";
import { formatDateTime } from "../../../lib/format";

interface MailboxProps {
  messages: CaughtMail[];
  selectedId: string | undefined;
}

/** Same-origin links open inside the app; others (none expected) open as plain links. */
function MailLink({ href }: { href: string }) {
  let internal: string | null = null;
  try {
    const url = new URL(href, window.location.origin);
    if (url.origin === window.location.origin)
      internal = `${url.pathname}${url.search}${url.hash}`;
  } catch {
    internal = null;
  }
  const className = "break-all text-accent underline underline-offset-2";
  return internal ? (
    <Link to={internal} className={className}>
      {href}
    </Link>
  ) : (
    <a href={href} className={className} rel="noreferrer">
      {href}
    </a>
  );
}

export function Mailbox({ messages, selectedId }: MailboxProps) {
  if (messages.length === 0) {
    return (
      <EmptyState title="No mail caught yet">
        Invitations, password resets and booking e-mails sent while Sitecue runs
        locally appear here.
      </EmptyState>
    );
  }
  const selected = messages.find((m) => m.id === selectedId);
  return (
    <div className="grid gap-4 lg:grid-cols-[22rem_minmax(0,1fr)]">
      {/* On a phone an open message replaces the list; a link leads back to it. */}
      <nav
        aria-label="Caught messages"
        className={cx(
          "rounded border border-rule bg-card",
          selected && "max-lg:hidden",
        )}
      >
        <ul className="flex flex-col divide-y divide-rule">
          {messages.map((m) => (
            <li key={m.id}>
              <Link
                to={`/dev/mail/${encodeURIComponent(m.id)}`}
                aria-current={m.id === selectedId ? "true" : undefined}
                className={cx(
                  "block px-3 py-2.5 hover:bg-paper",
                  m.id === selectedId && "bg-accent-wash",
                )}
              >
                <span className="block font-medium">
                  {m.subject || "(no subject)"}
                </span>
                <span className="block truncate text-sm text-ink-soft">
                  To {m.to.join(", ")}
                </span>
                <span className="block font-mono text-xs text-ink-soft">
                  {formatDateTime(m.receivedAt)}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      </nav>
      {selected ? (
        <article
          aria-labelledby="mail-subject"
          className="min-w-0 rounded border border-rule bg-card"
        >
          <header className="border-b border-rule px-4 py-3">
            <Link
              to="/dev/mail"
              className="mb-2 inline-block text-sm text-accent underline underline-offset-2 lg:hidden"
            >
              ← All messages
            </Link>
            <h2 id="mail-subject" className="text-lg font-semibold">
              {selected.subject || "(no subject)"}
            </h2>
            <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm">
              <dt className="text-ink-soft">From</dt>
              <dd className="break-all">{selected.from}</dd>
              <dt className="text-ink-soft">To</dt>
              <dd className="break-all">{selected.to.join(", ")}</dd>
              <dt className="text-ink-soft">Received</dt>
              <dd className="font-mono">
                {formatDateTime(selected.receivedAt)}
              </dd>
            </dl>
          </header>
          {selected.links.length > 0 ? (
            <section
              aria-labelledby="mail-links"
              className="border-b border-rule px-4 py-3"
            >
              <h3 id="mail-links" className="text-sm font-semibold">
                Links in this message
              </h3>
              <ul className="mt-1 flex flex-col gap-1 text-sm">
                {selected.links.map((href) => (
                  <li key={href}>
                    <MailLink href={href} />
                  </li>
                ))}
              </ul>
            </section>
          ) : null}
          {/* Plain text only: the HTML part is not rendered, so mail content cannot run script here. */}
          <pre className="overflow-x-auto px-4 py-3 font-sans text-sm break-words whitespace-pre-wrap">
            {selected.text}
          </pre>
        </article>
      ) : (
        <p className="rounded border border-dashed border-rule-strong px-4 py-8 text-center text-sm text-ink-soft max-lg:hidden">
          {selectedId
            ? "That message is no longer in the mailbox."
            : "Choose a message to read it."}
        </p>
      )}
    </div>
  );
}
