// Public types of the programme engine. The JSON contract is specified in
// docs brief "programme-engine.md" (issue 3); these types mirror it field for field.

/** ISO 3166-2 codes of the UK nations whose bank holidays a calendar may follow. */
export type HolidayRegion = "GB-ENG" | "GB-WLS" | "GB-SCT" | "GB-NIR";

export type LinkKind = "FS" | "SS" | "FF";
export type LagUnit = "workingDays" | "elapsedHours";

export interface CalendarInput {
  id: string;
  /** ISO weekday numbers, 1 = Monday … 7 = Sunday. Default Mon–Fri. */
  workingWeekdays?: number[] | null;
  /** Local "HH:mm", before 12:00. Default 08:00. */
  dayStart?: string | null;
  /** Local "HH:mm", after 12:00. Default 16:30. */
  dayEnd?: string | null;
  holidayRegion?: HolidayRegion | null;
  /** Extra days off, "YYYY-MM-DD". */
  daysOff?: string[] | null;
}

export interface TaskInput {
  id: string;
  name?: string | null;
  /** One calendar id or a list (a slot works only if it works in all). Default: the workshop calendar. */
  calendar?: string | string[] | null;
  /** Working days in steps of 0.5; 0 is a milestone. */
  durationDays: number;
  resource?: string | null;
  /** "YYYY-MM-DD" (that day's first slot) or "YYYY-MM-DDTHH:mm". */
  notEarlierThan?: string | null;
  /** A pin: "YYYY-MM-DD" (the morning) or a date-time on a slot boundary. */
  bookedStart?: string | null;
  /** "YYYY-MM-DD" (the morning) or a date-time on a slot boundary. */
  actualStart?: string | null;
  /** "YYYY-MM-DD" (that day's end) or a date-time on a slot boundary. */
  actualFinish?: string | null;
}

export interface LinkInput {
  from: string;
  to: string;
  kind?: LinkKind | null;
  lag?: number | null;
  lagUnit?: LagUnit | null;
}

export interface BusyInput {
  resource: string;
  /** "YYYY-MM-DDTHH:mm" local, or a date (from its start). */
  start: string;
  /** "YYYY-MM-DDTHH:mm" local, or a date (to its end). */
  finish: string;
  /** What the other booking is, shown in the clash message, e.g. "job 12". */
  ref?: string | null;
}

export interface ProgrammeInput {
  /** IANA time zone of the job. Default Europe/London. */
  timeZone?: string | null;
  /** "Today", "YYYY-MM-DD". */
  dataDate: string;
  /** Target finish date "YYYY-MM-DD": the programme must finish by the end of that working day. */
  handover?: string | null;
  calendars?: CalendarInput[] | null;
  tasks: TaskInput[];
  links?: LinkInput[] | null;
  busy?: BusyInput[] | null;
}

export type ProblemCode =
  | "booking-too-early"
  | "non-working-day"
  | "clash"
  | "overdue"
  | "handover-at-risk";

export interface Problem {
  code: ProblemCode;
  message: string;
}

export interface WaitingOn {
  task: string;
  /** Local date-time from which that predecessor's rule allows this task to start. */
  allowsFrom: string;
}

export type ReadinessState = "done" | "started" | "clear" | "waiting";

export interface Readiness {
  state: ReadinessState;
  waitingOn: WaitingOn[];
}

export interface TaskResult {
  id: string;
  earlyStart: string;
  earlyFinish: string;
  lateStart: string;
  lateFinish: string;
  totalFloatDays: number;
  freeFloatDays: number;
  critical: boolean;
  plannedStart: string;
  plannedFinish: string;
  readiness: Readiness;
  problems: Problem[];
}

export interface ProgrammeResult {
  /** Latest planned finish, local "YYYY-MM-DDTHH:mm"; null for an empty programme. */
  finish: string | null;
  /** Working days past handover on the workshop calendar; null without a handover. */
  handoverSlipDays: number | null;
  /** The driving path: task ids from start to the programme's finish. */
  criticalPath: string[];
  tasks: TaskResult[];
}

/** Thrown by the engine for input it cannot schedule (unknown ids, a loop …). */
export class ProgrammeInputError extends Error {
  readonly problems: string[];
  constructor(problems: string[]) {
    super(problems.join("\n"));
    this.name = "ProgrammeInputError";
    this.problems = problems;
  }
}
