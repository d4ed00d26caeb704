// pdf.js is loaded only when a PDF is previewed (this module is imported dynamically), so the
// main bundle stays small. The worker is a same-origin asset: the production CSP has no
// worker-src, so it falls back to script-src 'self', which allows it (CSP Level 3 §6.1.11).
import {
  getDocument,
  GlobalWorkerOptions,
  type PDFDocumentProxy,
} from "pdfjs-dist";
import workerUrl from "pdfjs-dist/build/pdf.worker.min.mjs?url";

GlobalWorkerOptions.workerSrc = workerUrl;

/** Opens a PDF from its bytes. Eval stays off: the CSP forbids it ('unsafe-eval' is not given). */
export function openPdf(data: ArrayBuffer): {
  promise: Promise<PDFDocumentProxy>;
  destroy: () => Promise<void>;
} {
  const task = getDocument({
    data: new Uint8Array(data),
    isEvalSupported: false,
    // No scripts run inside a drawing.
    enableXfa: false,
  });
  return { promise: task.promise, destroy: () => task.destroy() };
}

export type { PDFDocumentProxy };
