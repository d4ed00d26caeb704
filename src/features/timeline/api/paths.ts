const job = (jobId: string) => `/api/jobs/${encodeURIComponent(jobId)}`;

export const timelinePaths = {
  timeline: (jobId: string) => `${job(jobId)}/timeline`,
  seen: (jobId: string) => `${job(jobId)}/timeline/seen`,
  awayDates: (jobId: string) => `${job(jobId)}/away-dates`,
};
