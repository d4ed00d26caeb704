const enc = encodeURIComponent;

export const jobDrawingsPath = (jobId: string) =>
  `/api/jobs/${enc(jobId)}/drawings`;
export const drawingPath = (drawingId: string) =>
  `/api/drawings/${enc(drawingId)}`;
export const drawingRevisionsPath = (drawingId: string) =>
  `${drawingPath(drawingId)}/revisions`;

/** The drawing page in the client. */
export const drawingPagePath = (jobId: string, drawingId: string) =>
  `/jobs/${enc(jobId)}/drawings/${enc(drawingId)}`;
