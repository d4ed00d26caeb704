import { useEffect } from "react";

/** How long the page may keep settling (lists loading above the target) once the target is there. */
const SETTLE_MS = 1500;
/** How long to wait for the target to appear at all (its data still loading). */
const WAIT_MS = 10_000;

/**
 * Brings the element with this id into view once it exists, and keeps it there while the page
 * settles (sections above it load and grow), unless the person scrolls, touches or types first.
 * Focuses it when it can take focus (tabIndex -1), so keyboard and screen-reader users land there
 * too. Used by links that lead to one booking, task or section (the attention list's fixes).
 */
export function useScrollTarget(targetId: string | null): void {
  useEffect(() => {
    if (!targetId) return;
    let stopped = false;
    let lastTop: number | null = null;
    let focused = false;
    const started = performance.now();
    let found: number | null = null;
    const stop = () => {
      stopped = true;
    };
    const events = ["wheel", "touchstart", "keydown", "pointerdown"] as const;
    for (const e of events)
      window.addEventListener(e, stop, { once: true, passive: true });
    const tick = () => {
      if (stopped) return;
      const el = document.getElementById(targetId);
      if (el) {
        found ??= performance.now();
        const top = el.getBoundingClientRect().top + window.scrollY;
        if (top !== lastTop) {
          el.scrollIntoView({ block: "start" });
          lastTop = el.getBoundingClientRect().top + window.scrollY;
        }
        if (!focused && el.tabIndex === -1) {
          el.focus({ preventScroll: true });
          focused = true;
        }
      }
      const t = performance.now();
      if (found === null ? t - started < WAIT_MS : t - found < SETTLE_MS)
        requestAnimationFrame(tick);
    };
    requestAnimationFrame(tick);
    return () => {
      stopped = true;
      for (const e of events) window.removeEventListener(e, stop);
    };
  }, [targetId]);
}
