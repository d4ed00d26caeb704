export const myVisitsPath = "/api/me/visits";
export const visitPath = (bookingId: string) =>
  `/api/visits/${encodeURIComponent(bookingId)}`;
