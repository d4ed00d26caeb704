// The date arithmetic and change detection behind the timeline, without a database. Calendar
// facts checked against ISO 8601 / the proleptic Gregorian calendar (2028 is a leap year, 2027
// is not; 31 Dec rolls into 1 Jan).
import { describe, expect, it } from "vitest";
import type { Job } from "../jobs/jobs.entity";
import type { TimelineView } from "./timeline.entity";
import {
  awayDaysOf,
  datesOfRanges,
  plusDays,
  presentTimeline,
  rangesOfDates,
  snapshotOf,
  type VisitRow,
} from "./timeline.presenter";

describe("away ranges and dates", () => {
  it("steps over month, year and leap-day boundaries", () => {
    expect(plusDays("2027-12-31", 1)).toBe("2028-01-01");
    expect(plusDays("2028-02-28", 1)).toBe("2028-02-29");
    expect(plusDays("2027-02-28", 1)).toBe("2027-03-01");
    expect(plusDays("2027-03-01", -1)).toBe("2027-02-28");
  });

  it("expands ranges to each day once and folds them back into runs", () => {
    const dates = datesOfRanges([
      { from: "2027-12-30", to: "2028-01-02" },
      { from: "2028-01-01", to: "2028-01-03" }, // overlaps the first
      { from: "2028-01-10", to: "2028-01-10" },
    ]);
    expect(dates).toEqual([
      "2027-12-30",
      "2027-12-31",
      "2028-01-01",
      "2028-01-02",
      "2028-01-03",
      "2028-01-10",
    ]);
    expect(rangesOfDates(dates)).toEqual([
      { from: "2027-12-30", to: "2028-01-03" },
      { from: "2028-01-10", to: "2028-01-10" },
    ]);
    // Adjacent ranges are one stretch of days away.
    expect(
      rangesOfDates(
        datesOfRanges([
          { from: "2028-02-27", to: "2028-02-28" },
          { from: "2028-02-29", to: "2028-03-01" },
        ]),
      ),
    ).toEqual([{ from: "2028-02-27", to: "2028-03-01" }]);
  });

  it("finds a visit's days that are away, over a weekend too", () => {
    const away = new Set(["2027-01-08", "2027-01-11"]);
    expect(
      awayDaysOf(
        { start: "2027-01-08T08:00", finish: "2027-01-11T16:30" },
        away,
      ),
    ).toEqual(["2027-01-08", "2027-01-11"]);
    expect(
      awayDaysOf(
        { start: "2027-01-12T08:00", finish: "2027-01-12T12:00" },
        away,
      ),
    ).toEqual([]);
  });
});

describe("changes since the last look", () => {
  const row = (o: Partial<VisitRow> = {}): VisitRow => ({
    id: "b1",
    party: "plasterer",
    businessName: "Ashby Plaster & Coving",
    taskName: "Template coving",
    start: "2027-01-12T08:00",
    finish: "2027-01-12T12:00",
    arrival: { window: "morning", from: null, to: null },
    prepare: null,
    settled: true,
    done: false,
    ...o,
  });
  const job = {
    id: "j1",
    title: "Alcoves",
    timeZone: "Europe/London",
    handoverDate: "2027-01-29",
    siteClosedDates: [],
    version: 3,
  } as unknown as Job;
  const present = (rows: VisitRow[], view: TimelineView | null) =>
    presentTimeline({
      job,
      workshopName: "Hollin & Vane Joinery",
      today: "2027-01-04",
      rows,
      view,
    });
  const viewOf = (rows: VisitRow[], handover: string | null) =>
    ({
      seenAt: new Date("2027-01-04T09:00:00Z"),
      seen: snapshotOf(rows, handover),
    }) as TimelineView;

  it("has nothing to compare on the first look", () => {
    expect(present([row()], null).visits[0].change).toBeNull();
  });

  it("says what a moved visit was, and flags a new one", () => {
    const before = [row()];
    const after = [
      row({ start: "2027-01-14T12:00", finish: "2027-01-14T16:30" }),
      row({ id: "b2", taskName: "Fit coving & make good" }),
    ];
    const t = present(after, viewOf(before, "2027-01-29"));
    expect(t.visits.find((v) => v.id === "b1")!.change).toEqual({
      kind: "moved",
      was: {
        start: "2027-01-12T08:00",
        finish: "2027-01-12T12:00",
        arrival: { window: "morning", from: null, to: null },
      },
    });
    expect(t.visits.find((v) => v.id === "b2")!.change).toEqual({
      kind: "new",
    });
    expect(t.handoverWas).toBeNull();
  });

  it("sees an arrival time change, a new handover, and not a visit that is over", () => {
    const before = [
      row({ arrival: { window: "range", from: "08:00", to: "09:00" } }),
      row({ id: "old", start: "2027-01-01T08:00", finish: "2027-01-01T12:00" }),
    ];
    const after = [
      row({ arrival: { window: "range", from: "10:00", to: "11:00" } }),
      row({
        id: "old",
        start: "2027-01-02T08:00",
        finish: "2027-01-02T12:00",
      }),
    ];
    const t = present(after, viewOf(before, "2027-01-22"));
    expect(t.visits.find((v) => v.id === "b1")!.change?.kind).toBe("moved");
    const old = t.visits.find((v) => v.id === "old")!;
    expect(old.past).toBe(true);
    expect(old.change).toBeNull();
    expect(t.handoverWas).toBe("2027-01-22");
  });
});
