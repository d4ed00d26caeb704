// Bank holidays and daylight saving, against published data.
import { describe, expect, it } from "vitest";
import { workingDaysBetween } from "./calendar";
import { scheduleProgramme } from "./schedule";
import { task } from "./test-helpers";
import { formatLocal, parseDateTime } from "./time";
import { addElapsedMinutes } from "./zone";
import type { HolidayRegion, ProgrammeInput } from "./types";

// Source: GOV.UK bank holidays data (the data behind gov.uk/bank-holidays), 2026–2027, as copied
// in references §3. Substitute days only where a holiday falls at a weekend.
const GOV_UK: Record<
  "england-and-wales" | "scotland" | "northern-ireland",
  string[]
> = {
  "england-and-wales": [
    "2026-01-01",
    "2026-04-03",
    "2026-04-06",
    "2026-05-04",
    "2026-05-25",
    "2026-08-31",
    "2026-12-25",
    "2026-12-28",
    "2027-01-01",
    "2027-03-26",
    "2027-03-29",
    "2027-05-03",
    "2027-05-31",
    "2027-08-30",
    "2027-12-27",
    "2027-12-28",
  ],
  scotland: [
    "2026-01-01",
    "2026-01-02",
    "2026-04-03",
    "2026-05-04",
    "2026-05-25",
    "2026-06-15",
    "2026-08-03",
    "2026-11-30",
    "2026-12-25",
    "2026-12-28",
    "2027-01-01",
    "2027-01-04",
    "2027-03-26",
    "2027-05-03",
    "2027-05-31",
    "2027-08-02",
    "2027-11-30",
    "2027-12-27",
    "2027-12-28",
  ],
  "northern-ireland": [
    "2026-01-01",
    "2026-03-17",
    "2026-04-03",
    "2026-04-06",
    "2026-05-04",
    "2026-05-25",
    "2026-07-13",
    "2026-08-31",
    "2026-12-25",
    "2026-12-28",
    "2027-01-01",
    "2027-03-17",
    "2027-03-26",
    "2027-03-29",
    "2027-05-03",
    "2027-05-31",
    "2027-07-12",
    "2027-08-30",
    "2027-12-27",
    "2027-12-28",
  ],
};

const NATIONS: { division: keyof typeof GOV_UK; regions: HolidayRegion[] }[] = [
  { division: "england-and-wales", regions: ["GB-ENG", "GB-WLS"] },
  { division: "scotland", regions: ["GB-SCT"] },
  { division: "northern-ireland", regions: ["GB-NIR"] },
];

function allDays(from: string, to: string): string[] {
  const out: string[] = [];
  for (
    let t = Date.parse(from + "T00:00:00Z");
    t <= Date.parse(to + "T00:00:00Z");
    t += 86400000
  )
    out.push(new Date(t).toISOString().slice(0, 10));
  return out;
}
const weekday = (d: string) => new Date(d + "T00:00:00Z").getUTCDay(); // 0 = Sunday

describe("bank holidays match GOV.UK 2026–2027 day by day (source: GOV.UK bank-holidays data, references §3)", () => {
  for (const { division, regions } of NATIONS) {
    for (const region of regions) {
      it(`${region} (${division})`, () => {
        // A seven-day calendar shows the holidays alone: every day not working must be a listed
        // holiday, and every listed holiday must be not working.
        const everyDay = {
          id: "c",
          workingWeekdays: [1, 2, 3, 4, 5, 6, 7],
          holidayRegion: region,
        };
        const working = new Set(
          workingDaysBetween(everyDay, "2026-01-01", "2027-12-31"),
        );
        const off = allDays("2026-01-01", "2027-12-31").filter(
          (d) => !working.has(d),
        );
        expect(off).toEqual(GOV_UK[division]);
      });
    }
  }

  // Working days Mon–Fri, computed from the published list (references §3).
  it.each([
    ["GB-ENG", 2026, 253],
    ["GB-ENG", 2027, 253],
    ["GB-WLS", 2026, 253],
    ["GB-SCT", 2026, 251],
    ["GB-SCT", 2027, 252],
    ["GB-NIR", 2026, 251],
    ["GB-NIR", 2027, 251],
  ] as const)("%s has %i working days Mon–Fri in %i", (region, year, count) => {
    const cal = { id: "c", holidayRegion: region };
    expect(
      workingDaysBetween(cal, `${year}-01-01`, `${year}-12-31`).length,
    ).toBe(count);
  });

  it("keeps a Saturday working when the library lists a Saturday original (Boxing Day 2026)", () => {
    // date-holidays returns Sat 26 Dec 2026 as well as its substitute Mon 28 Dec; GOV.UK lists
    // only the substitute, so a Mon–Sat calendar works on the Saturday.
    const monSat = {
      id: "c",
      workingWeekdays: [1, 2, 3, 4, 5, 6],
      holidayRegion: "GB-ENG" as const,
    };
    expect(workingDaysBetween(monSat, "2026-12-24", "2026-12-29")).toEqual([
      "2026-12-24",
      "2026-12-26",
      "2026-12-29",
    ]);
    expect(weekday("2026-12-26")).toBe(6);
  });
});

function oneTask(
  region: HolidayRegion,
  start: string,
  days: number,
): ProgrammeInput {
  return {
    dataDate: start,
    calendars: [{ id: "workshop", holidayRegion: region }],
    tasks: [{ id: "t", durationDays: days }],
  };
}

describe("duration checks across bank holidays (computed, references §3; start day counted)", () => {
  it.each([
    // Mon 21 Dec + 5 days: 21, 22, 23, 24, (25 Christmas, 26–27 weekend, 28 substitute) 29.
    ["GB-ENG", "2026-12-21", 5, "2026-12-29"],
    // Mon 30 Mar + 5 days: 30, 31, 1 Apr, 2 Apr, (3 Good Friday, weekend, 6 Easter Monday) 7.
    ["GB-ENG", "2026-03-30", 5, "2026-04-07"],
    // Thu 11 Jun + 3 days in Scotland: 11, 12, (weekend, 15 one-off holiday) 16.
    ["GB-SCT", "2026-06-11", 3, "2026-06-16"],
    // The same in England & Wales, where 15 Jun is a working day.
    ["GB-ENG", "2026-06-11", 3, "2026-06-15"],
  ] as const)("%s: %i + %i days finishes %s", (region, start, days, finish) => {
    const r = scheduleProgramme(oneTask(region, start, days));
    expect(task(r, "t").earlyStart).toBe(`${start}T08:00`);
    expect(task(r, "t").earlyFinish).toBe(`${finish}T16:30`);
  });
});

describe('daylight saving in Europe/London (source: GOV.UK "When do the clocks change"; tz database europe file; references §4)', () => {
  const sevenDay = {
    id: "workshop",
    workingWeekdays: [1, 2, 3, 4, 5, 6, 7],
    dayStart: "08:00",
    dayEnd: "18:00",
  };
  function elapsed(
    dataDate: string,
    predFinishDay: string,
    hours: number,
  ): ProgrammeInput {
    // A task ending at 17:00 local on predFinishDay (a calendar whose day ends 17:00), then an
    // FS elapsed-hours lag into a milestone on a 08:00–18:00 seven-day calendar, so the
    // milestone shows the instant rounded only to that calendar's slot boundaries.
    return {
      timeZone: "Europe/London",
      dataDate,
      calendars: [
        sevenDay,
        { id: "to17", workingWeekdays: [1, 2, 3, 4, 5, 6, 7], dayEnd: "17:00" },
      ],
      tasks: [
        {
          id: "pred",
          calendar: "to17",
          durationDays: 0.5,
          actualStart: `${predFinishDay}T12:00`,
          actualFinish: `${predFinishDay}T17:00`,
        },
        { id: "cure", calendar: "workshop", durationDays: 0 },
        { id: "paint", calendar: "workshop", durationDays: 0.5 },
      ],
      links: [
        {
          from: "pred",
          to: "cure",
          kind: "FS",
          lag: hours,
          lagUnit: "elapsedHours",
        },
        {
          from: "pred",
          to: "paint",
          kind: "FS",
          lag: hours,
          lagUnit: "elapsedHours",
        },
      ],
    };
  }

  it("Fri 27 Mar 2026 17:00 GMT + 48 h = Sun 29 Mar 18:00 BST (clocks go forward at 01:00 UTC)", () => {
    const r = scheduleProgramme(elapsed("2026-03-27", "2026-03-27", 48));
    // 18:00 BST is the end of the Sunday afternoon slot on the 08:00–18:00 calendar.
    expect(task(r, "cure").earlyStart).toBe("2026-03-29T18:00");
    // A half-day task starts at the first slot starting at or after it: Mon 30 Mar 08:00.
    expect(task(r, "paint").earlyStart).toBe("2026-03-30T08:00");
  });

  it("Sat 24 Oct 2026 12:00 BST + 24 h = Sun 25 Oct 11:00 GMT (clocks go back at 01:00 UTC)", () => {
    const input = elapsed("2026-10-24", "2026-10-24", 24);
    // Finish the predecessor at 12:00 instead of 17:00 for this check.
    input.tasks[0] = {
      id: "pred",
      calendar: "to17",
      durationDays: 0.5,
      actualStart: "2026-10-24T08:00",
      actualFinish: "2026-10-24T12:00",
    };
    const r = scheduleProgramme(input);
    // 11:00 GMT is inside Sunday's morning slot; the next boundary is 12:00, where both the
    // milestone and the half-day task start. (Wall-clock 24 h would give 12:00 too; the exact
    // instant is checked in the conversion test below.)
    expect(task(r, "cure").earlyStart).toBe("2026-10-25T12:00");
    expect(task(r, "paint").earlyStart).toBe("2026-10-25T12:00");
  });

  it("converts the two published instants exactly (elapsed time across the change)", () => {
    const local = (s: string) => parseDateTime(s)!;
    expect(
      formatLocal(
        addElapsedMinutes("Europe/London", local("2026-03-27T17:00"), 48 * 60),
      ),
    ).toBe("2026-03-29T18:00");
    expect(
      formatLocal(
        addElapsedMinutes("Europe/London", local("2026-10-24T12:00"), 24 * 60),
      ),
    ).toBe("2026-10-25T11:00");
    // And back again: the backward pass uses negative elapsed time.
    expect(
      formatLocal(
        addElapsedMinutes("Europe/London", local("2026-03-29T18:00"), -48 * 60),
      ),
    ).toBe("2026-03-27T17:00");
    // 2027 changes (Sun 28 Mar, Sun 31 Oct; references §4): a day across each is 23 h / 25 h.
    expect(
      formatLocal(
        addElapsedMinutes("Europe/London", local("2027-03-27T12:00"), 23 * 60),
      ),
    ).toBe("2027-03-28T12:00");
    expect(
      formatLocal(
        addElapsedMinutes("Europe/London", local("2027-10-30T12:00"), 25 * 60),
      ),
    ).toBe("2027-10-31T12:00");
  });

  it("counts real hours, not wall-clock hours, across each change", () => {
    // Around the spring change a wall-clock reading would be 1 h early: 17:00 + 15 h real is
    // 09:00 BST on Sun 29 Mar (08:00 by the wall clock + 1 h). On the 08:00 calendar, 09:00 is
    // inside the morning slot, so the milestone sits at 12:00; with 14 h real (08:00 BST) it sits
    // at 08:00.
    const fifteen = scheduleProgramme(elapsed("2026-03-28", "2026-03-28", 15));
    expect(task(fifteen, "cure").earlyStart).toBe("2026-03-29T12:00");
    const fourteen = scheduleProgramme(elapsed("2026-03-28", "2026-03-28", 14));
    expect(task(fourteen, "cure").earlyStart).toBe("2026-03-29T08:00");
    // Autumn: Sat 24 Oct 17:00 BST + 16 h real = Sun 25 Oct 08:00 GMT (wall clock would say 09:00).
    const autumn = scheduleProgramme(elapsed("2026-10-24", "2026-10-24", 16));
    expect(task(autumn, "cure").earlyStart).toBe("2026-10-25T08:00");
    const autumn17 = scheduleProgramme(elapsed("2026-10-24", "2026-10-24", 17));
    expect(task(autumn17, "cure").earlyStart).toBe("2026-10-25T12:00");
  });

  it("never shifts a slot: working hours stay 08:00–16:30 local either side of the change", () => {
    const r = scheduleProgramme({
      dataDate: "2026-03-26",
      calendars: [{ id: "workshop", holidayRegion: "GB-ENG" }],
      tasks: [{ id: "t", durationDays: 2.5 }],
    });
    // Thu 26, Fri 27 (GMT), Mon 30 Mar morning (BST): finishes at 12:00 local.
    expect(task(r, "t").earlyFinish).toBe("2026-03-30T12:00");
  });
});
