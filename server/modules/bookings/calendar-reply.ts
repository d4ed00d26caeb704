import type { DataSource } from "typeorm";
import type { InboundMail } from "../../infra/mail/inbound";
import { lockingTransaction } from "../../db/locks";
import { Booking } from "./bookings.entity";
import { postSystemNote } from "../thread/thread-notes";
import { notifyWorkshop, whenWords } from "./booking-notices";
import {
  applyAnswer,
  loadBooking,
  recordEvent,
  type BookingDeps,
} from "./bookings.service";
import { parseItipReply } from "./itip-reply";

/**
 * An iTIP REPLY mailed to a booking's organizer address (RFC 6047) by the trade's calendar app.
 * Checked per RFC 6047 §2.2.1 — only the invited attendee may answer for themselves (the mail's
 * From and the ATTENDEE must both be the trade's address) — and UID and SEQUENCE must match the
 * booking's current invitation (RFC 5546 §2.1.5: a reply to an older sequence is stale). Then it is
 * recorded exactly like a click on the confirmation link. Throws (→ SMTP 550) when refused.
 */
export async function receiveCalendarReply(
  deps: BookingDeps,
  ds: DataSource,
  mail: InboundMail,
): Promise<void> {
  const address = mail.to
    .map((t) => t.toLowerCase())
    .find(
      (t) => t.startsWith("booking-") && t.endsWith(`@${deps.replyDomain}`),
    );
  if (!address) throw new Error("No booking reply address in this message");
  const bookingId = address.slice("booking-".length, address.indexOf("@"));
  const part =
    mail.calendarParts.find((p) =>
      ["REPLY", "COUNTER"].includes((p.method ?? "").toUpperCase()),
    ) ?? mail.calendarParts[0];
  if (!part) throw new Error("No calendar reply in this message");
  const parsed = parseItipReply(part.content);
  if (!parsed.ok) throw new Error(parsed.problem);
  const reply = parsed.reply;
  await lockingTransaction(ds, async (m) => {
    const known = await m.findOneBy(Booking, { id: bookingId });
    if (!known) throw new Error("Unknown booking");
    const l = await loadBooking(m, known.id, true);
    const booking = l.booking; // as it stands under the lock
    const trade = l.trade.email.toLowerCase();
    // The From: header, the SMTP envelope sender (MAIL FROM) and the ATTENDEE must all be the
    // trade (issue 16: From alone is trivially forged). In production the inbound relay checks
    // SPF/DKIM/DMARC before handing the message on (DEVELOPERS.md, "Calendar replies").
    if (
      mail.from.toLowerCase() !== trade ||
      mail.envelopeFrom.toLowerCase() !== trade ||
      reply.attendeeEmail.toLowerCase() !== trade
    ) {
      throw new Error("Only the invited trade may answer this invitation");
    }
    if (reply.uid !== booking.icalUid)
      throw new Error("This reply is for another invitation");
    if (reply.sequence !== booking.sequence)
      throw new Error(
        "This reply is for an older version of the invitation; the dates have changed",
      );
    if (reply.method === "COUNTER") {
      // "Propose new time" in a calendar app (RFC 5546 §3.2.7): the same proposal as the link's
      // "propose another start", through the same answer path (issue 16: it used to bounce).
      await applyAnswer(
        m,
        deps,
        l,
        {
          answer: "propose",
          proposedStart: reply.proposedStart,
          note: reply.comment ?? "Proposed from their calendar app",
        },
        "calendar-reply",
        null,
      );
      return;
    }
    if (reply.partstat === "TENTATIVE") {
      // Tentative is "maybe" (RFC 5545 §3.2.12): recorded in the history and told to the workshop,
      // while the booking still waits for a yes or no (issue 16: it was answered 250 and dropped).
      const note = reply.comment
        ? `Maybe, from their calendar app: ${reply.comment}`
        : "Maybe, from their calendar app";
      await recordEvent(
        m,
        booking,
        booking.state,
        booking.state,
        "calendar-reply",
        null,
        note,
        { partstat: "TENTATIVE" },
      );
      const line = `${l.trade.businessName} answered "maybe" for ${l.task.name}, ${whenWords(booking)}: ${l.job.title}. It still waits for a yes or no.`;
      await postSystemNote(m, l.job, "workshop", line);
      await notifyWorkshop(m, l, line, `${deps.appUrl}/jobs/${l.job.id}`);
      return;
    }
    await applyAnswer(
      m,
      deps,
      l,
      {
        answer: reply.partstat === "ACCEPTED" ? "confirm" : "decline",
        proposedStart: null,
        note: reply.comment ?? `Answered from their calendar app`,
      },
      "calendar-reply",
      null,
    );
  });
}
