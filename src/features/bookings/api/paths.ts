export const bookingPath = (bookingId: string) =>
  `/api/bookings/${encodeURIComponent(bookingId)}`;
