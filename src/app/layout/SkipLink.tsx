/** Keyboard users can jump past the top bar straight to the page. */
export function SkipLink() {
  return (
    <a
      href="#main"
      className="sr-only rounded bg-card px-3 py-2 text-sm font-medium text-accent focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:border focus:border-accent"
    >
      Skip to content
    </a>
  );
}
