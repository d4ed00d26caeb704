import { useEffect, useRef, useState } from "react";
import { Button, ErrorState, LoadingState } from "../../../components/ui";
import type { PDFDocumentProxy } from "./pdf-document";

interface PdfPreviewProps {
  /** The revision's file, asked for inline. */
  url: string;
  /** What the pages are of, for the canvas's accessible name ("Elevation, alcoves, Rev B"). */
  title: string;
}

type Loaded =
  | { state: "loading" }
  | { state: "error"; error: unknown }
  | { state: "ready"; doc: PDFDocumentProxy };

/** A PDF drawn page by page into a canvas by pdf.js, with previous / next page. */
export function PdfPreview({ url, title }: PdfPreviewProps) {
  const [loaded, setLoaded] = useState<Loaded>({ state: "loading" });
  const [page, setPage] = useState(1);
  const [attempt, setAttempt] = useState(0);
  const canvas = useRef<HTMLCanvasElement>(null);
  const frame = useRef<HTMLDivElement>(null);

  useEffect(() => {
    let cancelled = false;
    let destroy: (() => Promise<void>) | null = null;
    // The parent keys this component by URL, so a new file starts from a fresh state.
    (async () => {
      const response = await fetch(url, { credentials: "same-origin" });
      if (!response.ok)
        throw new Error(
          response.status === 404
            ? "This file is no longer there."
            : `The file could not be fetched (${response.status}).`,
        );
      const data = await response.arrayBuffer();
      const { openPdf } = await import("./pdf-document");
      if (cancelled) return;
      const opened = openPdf(data);
      destroy = opened.destroy;
      const doc = await opened.promise;
      if (!cancelled) setLoaded({ state: "ready", doc });
    })().catch((error: unknown) => {
      if (!cancelled) setLoaded({ state: "error", error });
    });
    return () => {
      cancelled = true;
      void destroy?.();
    };
  }, [url, attempt]);

  const doc = loaded.state === "ready" ? loaded.doc : null;
  useEffect(() => {
    if (!doc || !canvas.current || !frame.current) return;
    let cancelled = false;
    let task: { cancel: () => void; promise: Promise<void> } | null = null;
    (async () => {
      const p = await doc.getPage(page);
      if (cancelled) return;
      // Fit the frame's width, sharp on high-density screens.
      const width = frame.current?.clientWidth || 800;
      const base = p.getViewport({ scale: 1 });
      const scale = width / base.width;
      const ratio = window.devicePixelRatio || 1;
      const viewport = p.getViewport({ scale: scale * ratio });
      const c = canvas.current!;
      c.width = Math.floor(viewport.width);
      c.height = Math.floor(viewport.height);
      c.style.width = `${Math.floor(viewport.width / ratio)}px`;
      c.style.height = `${Math.floor(viewport.height / ratio)}px`;
      task = p.render({ canvas: c, viewport });
      await task.promise;
    })().catch(() => undefined);
    return () => {
      cancelled = true;
      task?.cancel();
    };
  }, [doc, page]);

  if (loaded.state === "loading")
    return <LoadingState label="Opening the PDF…" />;
  if (loaded.state === "error")
    return (
      <ErrorState
        error={loaded.error}
        title="The PDF could not be shown here"
        onRetry={() => {
          setLoaded({ state: "loading" });
          setAttempt((n) => n + 1);
        }}
      />
    );

  const pages = loaded.doc.numPages;
  return (
    <div className="flex flex-col gap-3">
      <div
        ref={frame}
        className="overflow-hidden rounded border border-rule bg-paper"
      >
        <canvas
          ref={canvas}
          role="img"
          aria-label={`${title}, page ${page} of ${pages}`}
          className="block max-w-full bg-card"
        />
      </div>
      {pages > 1 ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button
            variant="secondary"
            size="sm"
            disabled={page <= 1}
            onClick={() => setPage((n) => Math.max(1, n - 1))}
          >
            ← Previous page
          </Button>
          <p className="font-mono text-sm" aria-live="polite">
            Page {page} of {pages}
          </p>
          <Button
            variant="secondary"
            size="sm"
            disabled={page >= pages}
            onClick={() => setPage((n) => Math.min(pages, n + 1))}
          >
            Next page →
          </Button>
        </div>
      ) : (
        <p className="font-mono text-sm text-ink-soft">Page 1 of 1</p>
      )}
    </div>
  );
}
