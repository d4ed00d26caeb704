import { useQueryClient } from "@tanstack/react-query";
import {
  useCallback,
  useEffect,
  useLayoutEffect,
  useRef,
  useState,
  useSyncExternalStore,
} from "react";
import {
  threadAudienceLabels,
  type ThreadAudience,
  type ThreadMessage,
} from "../../../../shared/schemas";
import {
  Button,
  EmptyState,
  ErrorState,
  LoadingState,
  cx,
} from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { loadEarlier, useThread } from "../api/get-thread";
import { useMarkThreadRead } from "../api/mark-read";
import { ThreadComposer } from "./ThreadComposer";
import { ThreadMessageItem } from "./ThreadMessageItem";

/** How long the messages must be on screen before they count as read. */
const READ_AFTER_MS = 1200;

function subscribeVisibility(onChange: () => void) {
  document.addEventListener("visibilitychange", onChange);
  return () => document.removeEventListener("visibilitychange", onChange);
}
const pageVisible = () => document.visibilityState === "visible";

/** True while at least a quarter of the element is inside the viewport. */
function useOnScreen(el: HTMLElement | null): boolean {
  const [onScreen, setOnScreen] = useState(false);
  useEffect(() => {
    if (!el) return;
    const io = new IntersectionObserver(
      ([entry]) => setOnScreen(entry.isIntersecting),
      { threshold: 0.25 },
    );
    io.observe(el);
    return () => io.disconnect();
  }, [el]);
  return el !== null && onScreen;
}

function UnreadBadge({ count }: { count: number }) {
  if (count <= 0) return null;
  return (
    <span
      data-testid="thread-unread"
      className="ml-2 inline-flex items-center rounded-full bg-risk px-2 py-0.5 align-middle text-xs font-semibold text-card"
    >
      {count} unread
    </span>
  );
}

type Filter = "all" | ThreadAudience;

/**
 * The job's thread: the messages this person may see, oldest first (newest at the bottom, as a
 * conversation reads), new ones arriving by polling, a "New" divider at the first unread one,
 * and the composer for the audiences the server allows them.
 */
export function JobThread({
  jobId,
  audience,
  sectionId = "job-thread",
}: {
  jobId: string;
  /** Open filtered to this audience, and write to it by default (a trade's visit page: "Trades & workshop"). */
  audience?: ThreadAudience;
  /** The section's id (the job page's `#job-thread`); a page with several jobs' threads gives each its own. */
  sectionId?: string;
}) {
  // Keyed by job: the divider, the scroll position and the composer start afresh on another job.
  return (
    <JobThreadView
      key={jobId}
      jobId={jobId}
      audience={audience}
      sectionId={sectionId}
    />
  );
}

function JobThreadView({
  jobId,
  audience,
  sectionId,
}: {
  jobId: string;
  audience?: ThreadAudience;
  sectionId: string;
}) {
  const client = useQueryClient();
  const thread = useThread(jobId);
  const markRead = useMarkThreadRead(jobId);
  const [filter, setFilter] = useState<Filter>(audience ?? "all");
  const [earlier, setEarlier] = useState<{
    busy: boolean;
    error: string | null;
  }>({ busy: false, error: null });
  // Where the "New" divider sits: the first unread message when the thread was opened (or the
  // first to arrive unread later). It stays put after reading, so the person keeps their place.
  const [dividerSeq, setDividerSeq] = useState<number | null>(null);
  const scroller = useRef<HTMLDivElement | null>(null);
  // The list's box appears with the first message, so it is observed through state, not a ref.
  const [scrollEl, setScrollEl] = useState<HTMLDivElement | null>(null);
  const scrollRef = useCallback((el: HTMLDivElement | null) => {
    scroller.current = el;
    setScrollEl(el);
  }, []);
  const atBottom = useRef(true);
  const scrolledOnce = useRef(false);
  const markedUpTo = useRef(-1);

  const data = thread.data;
  const onScreen = useOnScreen(scrollEl);
  const visible = useSyncExternalStore(
    subscribeVisibility,
    pageVisible,
    () => true,
  );

  const firstUnread = data?.messages.find((m) => m.unread)?.seq ?? null;
  // Set while rendering (React's "adjusting state when a prop changes"), once.
  if (dividerSeq === null && firstUnread !== null) setDividerSeq(firstUnread);

  // Read = on screen for a moment in a visible tab. Everything up to the cursor is marked,
  // whichever audience filter is on: the person has the thread in front of them.
  const unreadCount = data?.unreadCount ?? 0;
  const cursor = data?.cursor ?? 0;
  const { mutate: mark, isPending: marking } = markRead;
  useEffect(() => {
    if (!onScreen || !visible || marking) return;
    if (unreadCount <= 0 || cursor <= markedUpTo.current) return;
    const timer = window.setTimeout(() => {
      markedUpTo.current = cursor;
      mark(cursor, {
        onError: () => {
          markedUpTo.current = -1;
        },
      });
    }, READ_AFTER_MS);
    return () => window.clearTimeout(timer);
  }, [onScreen, visible, marking, unreadCount, cursor, mark]);

  const shown: ThreadMessage[] =
    data?.messages.filter((m) => filter === "all" || m.audience === filter) ??
    [];
  const lastSeq = shown.length ? shown[shown.length - 1].seq : null;

  // First view: the "New" divider (or the newest message) in sight. Later: follow new messages
  // when the person was at the bottom; leave them where they were reading otherwise. Only the
  // list's own box scrolls, never the page.
  useLayoutEffect(() => {
    const el = scroller.current;
    if (!el || lastSeq === null) return;
    if (!scrolledOnce.current) {
      scrolledOnce.current = true;
      const mark = el.querySelector<HTMLElement>("[data-thread-new]");
      el.scrollTop = mark ? mark.offsetTop - el.offsetTop - 8 : el.scrollHeight;
      return;
    }
    if (atBottom.current) el.scrollTop = el.scrollHeight;
  }, [lastSeq]);

  // A thumbnail that loads after the scroll grows the list: stay at the bottom if we were.
  // (load does not bubble, but it passes the list in the capture phase.)
  useEffect(() => {
    if (!scrollEl) return;
    const onLoad = () => {
      if (atBottom.current) scrollEl.scrollTop = scrollEl.scrollHeight;
    };
    scrollEl.addEventListener("load", onLoad, true);
    return () => scrollEl.removeEventListener("load", onLoad, true);
  }, [scrollEl]);

  const onScroll = () => {
    const el = scroller.current;
    if (el)
      atBottom.current = el.scrollHeight - el.scrollTop - el.clientHeight < 48;
  };

  const showEarlier = async () => {
    setEarlier({ busy: true, error: null });
    const el = scroller.current;
    const before = el ? el.scrollHeight - el.scrollTop : 0;
    try {
      await loadEarlier(client, jobId);
      setEarlier({ busy: false, error: null });
      // Keep the message the person was reading where it was.
      requestAnimationFrame(() => {
        if (el) el.scrollTop = el.scrollHeight - before;
      });
    } catch (e) {
      setEarlier({ busy: false, error: errorMessage(e) });
    }
  };

  let body: React.ReactNode;
  if (thread.isPending) {
    body = <LoadingState label="Loading the thread…" />;
  } else if (thread.isError && !data) {
    body = <ErrorState error={thread.error} onRetry={() => thread.refetch()} />;
  } else if (data) {
    const filters: Filter[] =
      data.visibleAudiences.length > 1 && data.messages.length > 0
        ? ["all", ...data.visibleAudiences]
        : [];
    body = (
      <div className="flex flex-col gap-4">
        {filters.length > 0 ? (
          <div
            role="group"
            aria-label="Show messages for"
            className="flex flex-wrap gap-1.5"
          >
            {filters.map((f) => (
              <button
                key={f}
                type="button"
                aria-pressed={filter === f}
                onClick={() => setFilter(f)}
                className={cx(
                  "min-h-9 rounded border px-3 text-sm font-medium",
                  filter === f
                    ? "border-accent bg-accent text-card"
                    : "border-rule-strong bg-card text-ink hover:border-ink-soft",
                )}
              >
                {f === "all" ? "All" : threadAudienceLabels[f]}
              </button>
            ))}
          </div>
        ) : null}
        {data.messages.length === 0 ? (
          <EmptyState title="No messages yet">
            {data.audiences.length > 0
              ? "Write the first one below."
              : "Messages about this job will show here."}
          </EmptyState>
        ) : (
          <div
            ref={scrollRef}
            onScroll={onScroll}
            // Scrollable, so it takes the keyboard focus (arrow keys scroll it). A log (WAI-ARIA
            // 1.2): screen readers announce messages that arrive, politely.
            tabIndex={0}
            role="log"
            aria-label="Messages"
            className="max-h-[65vh] overflow-y-auto overscroll-contain rounded border border-rule bg-paper p-2 sm:p-3"
          >
            {data.hasEarlier ? (
              <div className="mb-3 flex flex-col items-center gap-1">
                <Button
                  variant="secondary"
                  size="sm"
                  busy={earlier.busy}
                  onClick={() => void showEarlier()}
                >
                  Show earlier messages
                </Button>
                {earlier.error ? (
                  <p role="alert" className="text-sm text-risk">
                    {earlier.error}
                  </p>
                ) : null}
              </div>
            ) : null}
            {shown.length === 0 ? (
              <p className="px-2 py-6 text-center text-sm text-ink-soft">
                No messages for “
                {filter === "all" ? "" : threadAudienceLabels[filter]}” yet.
              </p>
            ) : (
              <ol className="flex flex-col gap-3">
                {shown.map((m) => (
                  <ThreadMessageItem
                    key={m.id}
                    message={m}
                    firstUnread={m.seq === dividerSeq}
                  />
                ))}
              </ol>
            )}
          </div>
        )}
        {thread.isError ? (
          // A poll failed; the messages above are still right as of the last answer.
          <p role="status" className="text-sm text-risk">
            Couldn't check for new messages: {errorMessage(thread.error)} Trying
            again shortly.
          </p>
        ) : null}
        {data.audiences.length > 0 ? (
          <ThreadComposer
            jobId={jobId}
            audiences={data.audiences}
            defaultAudience={audience}
          />
        ) : (
          <p className="text-sm text-ink-soft">
            You can read this thread; posting here is not open to you.
          </p>
        )}
      </div>
    );
  }

  return (
    <section
      id={sectionId}
      aria-labelledby={`${sectionId}-heading`}
      className="rounded border border-rule bg-card"
    >
      <div className="border-b border-rule px-4 py-3">
        <h2 id={`${sectionId}-heading`} className="text-base font-semibold">
          Thread
          <UnreadBadge count={unreadCount} />
        </h2>
        <p className="text-sm text-ink-soft">
          Messages about this job. Each one says who sees it.
        </p>
      </div>
      <div className="p-4">{body}</div>
    </section>
  );
}
