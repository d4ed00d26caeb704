import { createHash, createHmac } from "node:crypto";

/**
 * Confirmation-link tokens. A token is an HMAC of the booking id, the start it was issued for
 * and its expiry under a server secret: unguessable without the secret, bound to the booking's
 * current dates, and re-derivable so the maker can copy the same link into a text message.
 * Only its SHA-256 is stored, so the database alone never yields a working link.
 */
export function linkToken(
  secret: string,
  bookingId: string,
  forStart: string,
  expiresAt: Date,
): string {
  return createHmac("sha256", `${secret}:booking-links`)
    .update(`${bookingId}|${forStart}|${expiresAt.getTime()}`)
    .digest("base64url");
}

export function hashLinkToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** A link works until a week after the booking's last day. */
export function linkExpiry(finishLocal: string): Date {
  const d = new Date(`${finishLocal.slice(0, 10)}T23:59:59Z`);
  d.setUTCDate(d.getUTCDate() + 7);
  return d;
}
