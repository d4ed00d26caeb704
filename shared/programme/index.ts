// Public API of the programme engine (issue 3). Pure: plain data in, plain data out.
export { scheduleProgramme } from "./schedule";
export { startWindow, firstFreeStart, impactOf } from "./questions";
export type {
  StartWindow,
  FreeStart,
  Impact,
  TaskMove,
  Reconfirm,
} from "./questions";
export {
  parseProgrammeInput,
  ProgrammeInputSchema,
  CalendarSchema,
  TaskSchema,
  LinkSchema,
  BusySchema,
  HolidayRegionSchema,
  LinkKindSchema,
  LagUnitSchema,
  DateSchema,
  DateOrDateTimeSchema,
  TimeOfDaySchema,
} from "./schema";
export type { ParseResult } from "./schema";
export { bankHolidayDays, PUBLISHED_ADDITIONS } from "./holidays";
export { isWorkingDay, workingDaysBetween } from "./calendar";
export { clearFromWhenDone } from "./readiness";
export * from "./types";
