import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { SkipLink } from "./SkipLink";
import { Wordmark } from "./Wordmark";

/** The frame for pages used before signing in: wordmark, one narrow column, footer. */
export function PublicLayout({
  children,
  wide = false,
}: {
  children: ReactNode;
  wide?: boolean;
}) {
  return (
    <div className="flex min-h-screen flex-col">
      <SkipLink />
      <header className="border-b border-rule bg-card">
        <div className="mx-auto flex max-w-page items-center px-4 py-3">
          <Wordmark />
        </div>
      </header>
      <main
        id="main"
        tabIndex={-1}
        className={`mx-auto w-full flex-1 px-4 py-8 sm:py-12 ${wide ? "max-w-page" : "max-w-md"}`}
      >
        {children}
      </main>
      <footer className="border-t border-rule">
        <div className="mx-auto flex max-w-page flex-wrap items-center justify-between gap-2 px-4 py-4 text-sm text-ink-soft">
          <p>Sitecue plans work on site; it does not certify it.</p>
          {/* The dev mailbox only exists where the local mail catcher runs. */}
          {import.meta.env.DEV ? (
            <Link
              to="/dev/mail"
              className="text-accent underline underline-offset-2"
            >
              Dev mailbox
            </Link>
          ) : null}
        </div>
      </footer>
    </div>
  );
}
