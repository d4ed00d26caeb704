const job = (jobId: string) => `/api/jobs/${encodeURIComponent(jobId)}/thread`;

export const threadPaths = {
  thread: job,
  messages: (jobId: string) => `${job(jobId)}/messages`,
  upload: (jobId: string) => `${job(jobId)}/messages/upload`,
  read: (jobId: string) => `${job(jobId)}/read`,
};

/** Adds query parameters to an API path that may carry some already. */
export function withQuery(
  path: string,
  params: Record<string, string | number | undefined>,
): string {
  const url = new URL(path, "http://x");
  for (const [k, v] of Object.entries(params))
    if (v !== undefined) url.searchParams.set(k, String(v));
  return `${url.pathname}${url.search}`;
}
