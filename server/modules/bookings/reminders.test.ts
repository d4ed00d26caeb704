import { afterAll, beforeAll, expect, it } from "vitest";
import { startTestApp, type TestApp } from "../../../tests/setup/test-app";
import { demoJobTitles } from "../../../tests/factories/demo-scenario";
import { Job } from "../jobs/jobs.entity";
import { Trade } from "../trades/trades.entity";
import { Booking } from "./bookings.entity";
import { dayWords } from "./booking-notices";
import { nextWorkingDay } from "./reminders";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ demo: true });
}, 120_000);
afterAll(async () => t?.close());

it("finds the next working day across a weekend and a bank holiday (GOV.UK: Mon 28 Dec 2026 is the Boxing Day substitute)", () => {
  const cal = [
    {
      id: "site",
      workingWeekdays: [1, 2, 3, 4, 5],
      holidayRegion: "GB-ENG" as const,
      daysOff: [],
    },
  ];
  expect(nextWorkingDay(cal, "2026-12-04")).toBe("2026-12-07"); // Fri → Mon
  expect(nextWorkingDay(cal, "2026-12-24")).toBe("2026-12-29"); // Thu → Tue: 25 Dec and 28 Dec are bank holidays
});

it("reminds a confirmed trade once, the working day before their visit", async () => {
  const m = t.db.ds.manager;
  const job = await m.findOneByOrFail(Job, { title: demoJobTitles.alcoves });
  const decorator = await m.findOneByOrFail(Trade, {
    businessName: "Kestrel Decorating",
  });
  const booking = await m.findOneByOrFail(Booking, {
    jobId: job.id,
    tradeId: decorator.id,
  });
  // The evening before the visit's day, in London: pick the working day before the booked start.
  const start = booking.start.slice(0, 10);
  const d = new Date(`${start}T12:00:00Z`);
  do d.setUTCDate(d.getUTCDate() - 1);
  while ([0, 6].includes(d.getUTCDay()));
  const dayBefore = new Date(`${d.toISOString().slice(0, 10)}T17:00:00Z`);
  const twoDaysBefore = new Date(dayBefore.getTime() - 3 * 86400_000);

  expect(await t.sitecue.sendReminders(twoDaysBefore)).toBe(0);
  expect(await t.sitecue.sendReminders(dayBefore)).toBe(1);
  expect(await t.sitecue.sendReminders(dayBefore)).toBe(0); // once only
  const mail = await t.mail.waitFor(
    (x) =>
      x.to.includes(decorator.email) &&
      x.subject.includes("Fill, caulk & paint"),
  );
  // "Tomorrow" only when the visit is the next calendar day; a Monday visit reminded on the
  // Friday names its day (issue 16).
  const next = new Date(`${dayBefore.toISOString().slice(0, 10)}T12:00:00Z`);
  next.setUTCDate(next.getUTCDate() + 1);
  const when =
    next.toISOString().slice(0, 10) === start
      ? "Tomorrow"
      : `On ${dayWords(start)}`;
  expect(mail.subject).toBe(
    `${when}: Fill, caulk & paint at ${job.area} for Hollin & Vane Joinery`,
  );
  // Confirmed already: the reminder does not ask them to confirm.
  expect(mail.text).not.toMatch(/Confirm, say you can't make it/);
  expect(mail.text).not.toContain("accepting or declining it");
  // Confirmed, so the full address is in the reminder.
  expect(mail.text).toContain("14 Larkspur Terrace, Wetherfold");
});
