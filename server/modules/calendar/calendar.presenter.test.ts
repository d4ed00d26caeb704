// The calendar's entry and mark rules without a database (issue 15).
import { describe, expect, it } from "vitest";
import {
  entriesOfTasks,
  lastDayOf,
  type CalendarTask,
} from "../../../shared/schemas";
import {
  holidayMarks,
  planCalendar,
  tradeCalendar,
  type PlannedJob,
  type Visit,
} from "./calendar.presenter";

const task = (over: Partial<CalendarTask> & { id: string }): CalendarTask => ({
  name: over.id,
  party: "workshop",
  actualStart: null,
  actualFinish: null,
  booking: null,
  ...over,
});
const plan = (id: string, start: string, finish: string) => ({
  id,
  plannedStart: start,
  plannedFinish: finish,
});

describe("entries of a programme", () => {
  it("names the state, the trade and the last day each task touches", () => {
    const entries = entriesOfTasks(
      { id: "j1", title: "Alcoves" },
      [
        task({ id: "fit", actualStart: "2027-03-01" }),
        task({
          id: "cove",
          party: "plasterer",
          booking: { state: "draft", tradeId: "t1", tradeName: "Ashby" },
        }),
        task({
          id: "paint",
          party: "decorator",
          booking: { state: "declined", tradeId: "t2", tradeName: "Kestrel" },
        }),
        task({ id: "gone" }),
      ],
      [
        plan("fit", "2027-03-01T08:00", "2027-03-03T08:00"),
        plan("cove", "2027-03-03T12:00", "2027-03-03T16:30"),
        plan("paint", "2027-03-04T08:00", "2027-03-04T08:00"),
      ],
    );
    expect(entries).toEqual([
      {
        id: "j1:fit",
        jobId: "j1",
        jobTitle: "Alcoves",
        taskId: "fit",
        taskName: "fit",
        party: "workshop",
        who: null,
        tradeId: null,
        state: "workshop",
        start: "2027-03-01",
        // Finished at the next day's start: the work ends the day before.
        last: "2027-03-02",
        movable: false,
      },
      expect.objectContaining({
        id: "j1:cove",
        state: "draft",
        who: "Ashby",
        tradeId: "t1",
        start: "2027-03-03",
        last: "2027-03-03",
        movable: true,
      }),
      // A declined booking leaves the task unbooked; a zero-length task keeps its one day.
      expect.objectContaining({
        id: "j1:paint",
        state: "not-booked",
        who: null,
        start: "2027-03-04",
        last: "2027-03-04",
      }),
    ]);
  });

  it("reads a finish at or before 08:00 as the day before", () => {
    expect(lastDayOf("2027-03-01T08:00")).toBe("2027-02-28");
    expect(lastDayOf("2027-03-01T12:00")).toBe("2027-03-01");
    expect(lastDayOf("2027-03-01")).toBe("2027-03-01");
  });
});

const job = (over: Partial<PlannedJob> = {}): PlannedJob => ({
  id: "j1",
  title: "Alcoves",
  tasks: [task({ id: "a" }), task({ id: "b" }), task({ id: "c" })],
  planned: [
    plan("a", "2027-02-25T08:00", "2027-03-01T16:30"),
    plan("b", "2027-03-10T08:00", "2027-03-10T16:30"),
    plan("c", "2027-04-01T08:00", "2027-04-01T16:30"),
  ],
  calendars: [
    { id: "workshop", holidayRegion: "GB-ENG", daysOff: ["2027-03-12"] },
    {
      id: "site",
      holidayRegion: "GB-ENG",
      daysOff: ["2027-03-09", "2027-05-01"],
    },
    { id: "trade:t1", holidayRegion: "GB-ENG", daysOff: ["2027-03-11"] },
  ],
  tradeNames: new Map([["t1", "Ashby Plaster & Coving"]]),
  ...over,
});

describe("a workshop's or a job's calendar", () => {
  it("keeps the entries with a day in the range and marks the closed days and days off in it", () => {
    const c = planCalendar([job(), job({ id: "j2", title: "Wardrobe" })], {
      from: "2027-03-01",
      to: "2027-03-31",
    });
    // "a" ends on the first day of the range; "c" lies after it.
    expect(c.entries.map((e) => e.id)).toEqual([
      "j1:a",
      "j2:a",
      "j1:b",
      "j2:b",
    ]);
    // Two jobs closing the same day give one mark.
    expect(c.marks).toEqual([
      { date: "2027-03-09", kind: "closed", label: "Site closed" },
      {
        date: "2027-03-11",
        kind: "day-off",
        label: "Day off: Ashby Plaster & Coving",
      },
      { date: "2027-03-12", kind: "day-off", label: "Workshop closed" },
      // Easter 2027 (GOV.UK, England and Wales): Good Friday 26 Mar, Easter Monday 29 Mar.
      { date: "2027-03-26", kind: "holiday", label: "Bank holiday" },
      { date: "2027-03-29", kind: "holiday", label: "Bank holiday" },
    ]);
  });

  it("marks the bank holidays of every region involved", () => {
    // GOV.UK bank holidays 2026 (gov.uk/bank-holidays): Scotland's summer holiday Mon 3 Aug and
    // St Andrew's Day Mon 30 Nov; England and Wales's summer holiday Mon 31 Aug.
    const range = { from: "2026-08-01", to: "2026-11-30" };
    const scottish = job({
      calendars: [{ id: "site", holidayRegion: "GB-SCT" }],
    });
    expect(
      planCalendar([scottish], range, ["GB-ENG"]).marks.map((m) => m.date),
    ).toEqual(["2026-08-03", "2026-08-31", "2026-11-30"]);
    expect(holidayMarks(["GB-ENG"], range).map((m) => m.date)).toEqual([
      "2026-08-31",
    ]);
    // A range across the new year reads both years' lists.
    expect(
      holidayMarks(["GB-ENG", null], {
        from: "2026-12-24",
        to: "2027-01-04",
      }),
    ).toEqual([
      { date: "2026-12-25", kind: "holiday", label: "Bank holiday" },
      { date: "2026-12-28", kind: "holiday", label: "Bank holiday" },
      { date: "2027-01-01", kind: "holiday", label: "Bank holiday" },
    ]);
  });
});

describe("a trade's own calendar", () => {
  const visit = (over: Partial<Visit>): Visit => ({
    bookingId: "b1",
    jobId: "j1",
    jobTitle: "Alcove cabinets",
    jobArea: "Wetherfold",
    workshopName: "Hollin & Vane Joinery",
    taskId: "t1",
    taskName: "Template coving",
    tradeKind: "plasterer",
    state: "sent",
    start: "2027-03-02T08:00",
    finish: "2027-03-02T12:00",
    ...over,
  });

  it("shows offered bookings only, on their booked days, never movable", () => {
    const c = tradeCalendar(
      [
        visit({}),
        visit({ bookingId: "b2", state: "draft" }),
        visit({ bookingId: "b3", state: "declined" }),
        visit({ bookingId: "b4", state: "cancelled" }),
        visit({
          bookingId: "b5",
          state: "needs-reconfirming",
          taskName: null,
          start: "2027-03-03T08:00",
          finish: "2027-03-04T16:30",
        }),
        visit({ bookingId: "b6", start: "2027-05-03T08:00" }),
      ],
      ["2027-03-05", "2027-06-01"],
      ["GB-ENG"],
      { from: "2027-03-01", to: "2027-03-31" },
    );
    expect(c.entries).toEqual([
      {
        id: "j1:b1",
        jobId: "j1",
        jobTitle: "Alcove cabinets, Wetherfold",
        taskId: "t1",
        taskName: "Template coving",
        party: "plasterer",
        who: "Hollin & Vane Joinery",
        tradeId: null,
        state: "sent",
        start: "2027-03-02",
        last: "2027-03-02",
        movable: false,
      },
      expect.objectContaining({
        id: "j1:b5",
        taskName: "Visit",
        state: "needs-reconfirming",
        start: "2027-03-03",
        last: "2027-03-04",
      }),
    ]);
    expect(c.marks).toEqual([
      { date: "2027-03-05", kind: "day-off", label: "Your day off" },
      { date: "2027-03-26", kind: "holiday", label: "Bank holiday" },
      { date: "2027-03-29", kind: "holiday", label: "Bank holiday" },
    ]);
  });
});
