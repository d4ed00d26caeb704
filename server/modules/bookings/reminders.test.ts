import { afterAll, beforeAll, expect, it } from "vitest";
import { startTestApp, type TestApp } from "../../../tests/setup/test-app";
import { demoJobTitles } from "../../../tests/factories/demo-scenario";
import { Job } from "../jobs/jobs.entity";
import { Trade } from "../trades/trades.entity";
import { Booking } from "./bookings.entity";
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
    (x) => x.to.includes(decorator.email) && x.subject.startsWith("Tomorrow:"),
  );
  expect(mail.subject).toBe(`Tomorrow: Fill, caulk & paint at ${job.area}`);
  // Confirmed, so the full address is in the reminder.
  expect(mail.text).toContain("14 Larkspur Terrace, Wetherfold");
});
