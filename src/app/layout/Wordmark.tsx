import { Link } from "react-router-dom";

/** The Sitecue wordmark: a small mark (a site line with a cue flag) and the name. */
export function Wordmark() {
  return (
    <Link
      to="/"
      className="inline-flex items-center gap-2 rounded text-ink no-underline"
      aria-label="Sitecue home"
    >
      <svg aria-hidden="true" viewBox="0 0 24 24" className="size-6">
        <rect width="24" height="24" rx="4" className="fill-accent" />
        <path
          d="M5 18h14M8 18V6l7 3-7 3"
          fill="none"
          stroke="#FFFDF8"
          strokeWidth="1.8"
          strokeLinejoin="round"
        />
      </svg>
      <span className="text-lg font-semibold tracking-tight">Sitecue</span>
    </Link>
  );
}
