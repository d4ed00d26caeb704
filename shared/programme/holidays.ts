// Bank holidays per UK nation: the maintained `date-holidays` library, reconciled with the
// published GOV.UK list (references §3 lists where the two differ; packages.md repeats it).
import Holidays from "date-holidays";
import type { HolidayRegion } from "./types";
import { isoWeekday, parseDay } from "./time";

/**
 * Published GOV.UK bank holidays the library does not know (one-off holidays), dated so that a
 * reader can check each against gov.uk/bank-holidays. Add to this list when GOV.UK announces one.
 */
export const PUBLISHED_ADDITIONS: ReadonlyArray<{
  region: HolidayRegion;
  date: string;
  name: string;
  published: string;
}> = [
  // GOV.UK bank-holidays data, Scotland 2026: a one-off bank holiday on Mon 15 Jun
  // (references §3); date-holidays 3.37 lacks it.
  {
    region: "GB-SCT",
    date: "2026-06-15",
    name: "Additional bank holiday (one-off)",
    published: "GOV.UK bank-holidays data, 2026",
  },
];

/** Published days that the library gives but GOV.UK does not (none known at 3.37.0). */
export const PUBLISHED_REMOVALS: ReadonlyArray<{
  region: HolidayRegion;
  date: string;
}> = [];

const LIBRARY_STATE: Record<HolidayRegion, string> = {
  "GB-ENG": "ENG",
  "GB-WLS": "WLS",
  "GB-SCT": "SCT",
  "GB-NIR": "NIR",
};

const libraries = new Map<HolidayRegion, Holidays>();
const yearCache = new Map<string, number[]>();

/** Day numbers of the bank holidays of `region` in `year`, as GOV.UK publishes them. */
export function bankHolidayDays(region: HolidayRegion, year: number): number[] {
  const key = region + ":" + year;
  const cached = yearCache.get(key);
  if (cached) return cached;
  let lib = libraries.get(region);
  if (!lib) {
    // Always pass the region: without it the library misses Scotland's and NI's own days.
    lib = new Holidays("GB", LIBRARY_STATE[region]);
    libraries.set(region, lib);
  }
  const days = new Set<number>();
  for (const h of lib.getHolidays(year)) {
    // Observances (Mother's Day…) are not days off.
    if (h.type !== "public") continue;
    // `start` is a UTC instant; the local date is the first ten characters of `date`.
    const day = parseDay(h.date.slice(0, 10));
    if (day === null) continue;
    // The library returns a weekend original as well as its substitute weekday; GOV.UK lists
    // only the substitute, so a calendar that works Saturdays stays open on Sat 26 Dec.
    const wd = isoWeekday(day);
    if (wd === 6 || wd === 7) continue;
    days.add(day);
  }
  for (const a of PUBLISHED_ADDITIONS) {
    if (a.region === region && a.date.startsWith(String(year)))
      days.add(parseDay(a.date)!);
  }
  for (const r of PUBLISHED_REMOVALS) {
    if (r.region === region && r.date.startsWith(String(year)))
      days.delete(parseDay(r.date)!);
  }
  const list = [...days].sort((a, b) => a - b);
  yearCache.set(key, list);
  return list;
}
