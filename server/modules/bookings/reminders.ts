import { In, IsNull } from "typeorm";
import { isWorkingDay, type CalendarInput } from "../../../shared/programme";
import { localToday } from "../jobs/jobs.presenter";
import { loadProgramme } from "../programme/programme-input";
import { Booking } from "./bookings.entity";
import { queueBookingMail, type NoticeContext } from "./booking-notices";
import {
  ensureLink,
  loadBooking,
  recordEvent,
  type BookingDeps,
} from "./bookings.service";

/** The `n`th working day after `today` on the given calendars (looking at most 3 weeks a day on). */
export function workingDayAhead(
  calendars: CalendarInput[],
  today: string,
  n: number,
): string | null {
  const d = new Date(`${today}T12:00:00Z`);
  let found = 0;
  for (let i = 0; i < 21 * Math.max(n, 1); i++) {
    d.setUTCDate(d.getUTCDate() + 1);
    const day = d.toISOString().slice(0, 10);
    if (isWorkingDay(calendars, day) && ++found === n) return day;
  }
  return null;
}

/** The next working day after `today` on the given calendars (at most three weeks on). */
export function nextWorkingDay(
  calendars: CalendarInput[],
  today: string,
): string | null {
  return workingDayAhead(calendars, today, 1);
}

/** "the working day before", "2 working days before": when the workshop's reminders go. */
export function reminderWhen(days: number): string {
  return days === 1 ? "the working day before" : `${days} working days before`;
}

/**
 * Sends each confirmed trade a reminder the workshop's `reminderDays` working days before their
 * visit (on the task's own calendars; 0 sends none; issue 14). Safe to run from several processes at once: a reminder is claimed by the UPDATE
 * that sets `reminderSentAt`, so only one process sends it.
 */
export async function sendDueReminders(
  deps: BookingDeps,
  now = new Date(),
): Promise<number> {
  const { ds } = deps;
  const candidates = await ds.manager.find(Booking, {
    where: { state: In(["confirmed"]), reminderSentAt: IsNull() },
  });
  let sent = 0;
  for (const c of candidates) {
    const claimed = await ds.transaction(async (m) => {
      const l = await loadBooking(m, c.id);
      const days = l.workshop.reminderDays;
      if (days < 1) return false;
      const data = await loadProgramme(m, l.job, l.workshop, now);
      const task = data.input.tasks.find((t) => t.id === l.task.id);
      const ids = Array.isArray(task?.calendar)
        ? task!.calendar
        : [task?.calendar ?? "workshop"];
      const calendars = (data.input.calendars ?? []).filter((cal) =>
        ids.includes(cal.id),
      );
      const today = localToday(l.job.timeZone, now);
      if (
        workingDayAhead(calendars, today, days) !== l.booking.start.slice(0, 10)
      )
        return false;
      const res = await m
        .createQueryBuilder()
        .update(Booking)
        .set({ reminderSentAt: now })
        .where("id = :id AND reminderSentAt IS NULL", { id: c.id })
        .execute();
      if (res.affected !== 1) return false;
      const ctx: NoticeContext = {
        appUrl: deps.appUrl,
        replyDomain: deps.replyDomain,
        workshop: l.workshop,
        job: l.job,
        task: l.task,
        trade: l.trade,
        waitsOn: [],
        link: await ensureLink(m, deps, l.booking),
        showAddress: true,
      };
      await queueBookingMail(m, ctx, l.booking, "reminder", { today });
      await recordEvent(
        m,
        l.booking,
        l.booking.state,
        l.booking.state,
        "system",
        null,
        `Reminder sent for ${reminderWhen(days)}`,
      );
      return true;
    });
    if (claimed) sent++;
  }
  return sent;
}
