// zod 4 schemas for the input JSON contract (spec "The JSON contract"), shared with the API:
// the API answers invalid input with 422 and the same plain-English lines as the CLI.
import { z } from "zod";
import { prepare } from "./prepare";
import { parseDateTime, parseDay, parseTime } from "./time";
import { ProgrammeInputError, type ProgrammeInput } from "./types";

const isDate = (s: string) => parseDay(s) !== null;
const isDateOrDateTime = (s: string) =>
  parseDay(s) !== null || parseDateTime(s) !== null;
const halfStep = (x: number) =>
  Number.isFinite(x) && Number.isInteger(Math.round(x * 2 * 1e9) / 1e9);

export const DateSchema = z
  .string()
  .refine(isDate, { error: "must be a date written YYYY-MM-DD" });
export const DateOrDateTimeSchema = z.string().refine(isDateOrDateTime, {
  error: "must be a date (YYYY-MM-DD) or a local date-time (YYYY-MM-DDTHH:mm)",
});
export const TimeOfDaySchema = z.string().refine((s) => parseTime(s) !== null, {
  error: "must be a time written HH:mm",
});

export const HolidayRegionSchema = z.enum(
  ["GB-ENG", "GB-WLS", "GB-SCT", "GB-NIR"],
  {
    error: "must be GB-ENG, GB-WLS, GB-SCT, GB-NIR or null",
  },
);

export const CalendarSchema = z.object({
  id: z.string().min(1, { error: "must not be empty" }),
  workingWeekdays: z
    .array(
      z.number().int().min(1).max(7, {
        error: "must be an ISO weekday number, 1 = Monday … 7 = Sunday",
      }),
    )
    .min(1, { error: "must list at least one working weekday" })
    .nullish(),
  dayStart: TimeOfDaySchema.nullish(),
  dayEnd: TimeOfDaySchema.nullish(),
  holidayRegion: HolidayRegionSchema.nullish(),
  daysOff: z.array(DateSchema).nullish(),
});

export const TaskSchema = z.object({
  id: z.string().min(1, { error: "must not be empty" }),
  name: z.string().nullish(),
  calendar: z.union([z.string(), z.array(z.string()).min(1)]).nullish(),
  durationDays: z
    .number({ error: "must be a number of working days" })
    .min(0, { error: "must not be negative" })
    .refine(halfStep, { error: "must be a multiple of 0.5 working days" }),
  resource: z.string().nullish(),
  notEarlierThan: DateOrDateTimeSchema.nullish(),
  bookedStart: DateOrDateTimeSchema.nullish(),
  actualStart: DateOrDateTimeSchema.nullish(),
  actualFinish: DateOrDateTimeSchema.nullish(),
});

export const LinkKindSchema = z.enum(["FS", "SS", "FF"], {
  error: "must be FS, SS or FF",
});
export const LagUnitSchema = z.enum(["workingDays", "elapsedHours"], {
  error: "must be workingDays or elapsedHours",
});

export const LinkSchema = z
  .object({
    from: z.string(),
    to: z.string(),
    kind: LinkKindSchema.nullish(),
    lag: z.number({ error: "must be a number" }).nullish(),
    lagUnit: LagUnitSchema.nullish(),
  })
  .refine(
    (l) =>
      (l.lagUnit ?? "workingDays") !== "workingDays" || halfStep(l.lag ?? 0),
    {
      error: "must be a multiple of 0.5 working days",
      path: ["lag"],
    },
  );

export const BusySchema = z.object({
  resource: z.string().min(1),
  start: DateOrDateTimeSchema,
  finish: DateOrDateTimeSchema,
  ref: z.string().nullish(),
});

export const ProgrammeInputSchema = z.object({
  timeZone: z.string().nullish(),
  dataDate: DateSchema,
  handover: DateSchema.nullish(),
  calendars: z.array(CalendarSchema).nullish(),
  tasks: z.array(TaskSchema),
  links: z.array(LinkSchema).nullish(),
  busy: z.array(BusySchema).nullish(),
});

// The schema's output must be assignable to the engine's hand-written input type.
type SchemaOutput = z.infer<typeof ProgrammeInputSchema>;
const _check: (x: SchemaOutput) => ProgrammeInput = (x) => x;
void _check;

export type ParseResult =
  { ok: true; input: ProgrammeInput } | { ok: false; problems: string[] };

function where(path: PropertyKey[], raw: unknown): string {
  const [top, index, ...rest] = path;
  const field = rest.map(String).join(".");
  if ((top === "tasks" || top === "calendars") && typeof index === "number") {
    const item = (raw as Record<string, unknown[]>)?.[top]?.[index] as
      { id?: unknown } | undefined;
    const noun = top === "tasks" ? "Task" : "Calendar";
    const name =
      typeof item?.id === "string"
        ? `${noun} "${item.id}"`
        : `${noun} ${index + 1}`;
    return field ? `${name}: ${field}` : name;
  }
  if (top === "links" && typeof index === "number") {
    const l = (raw as { links?: { from?: unknown; to?: unknown }[] })?.links?.[
      index
    ];
    const name =
      l && typeof l.from === "string" && typeof l.to === "string"
        ? `Link ${l.from} → ${l.to}`
        : `Link ${index + 1}`;
    return field ? `${name}: ${field}` : name;
  }
  if (top === "busy" && typeof index === "number")
    return `Busy interval ${index + 1}${field ? `: ${field}` : ""}`;
  return path.map(String).join(".") || "The input";
}

/** Check JSON against the contract and the engine's rules; problems are plain-English lines. */
export function parseProgrammeInput(raw: unknown): ParseResult {
  if (typeof raw !== "object" || raw === null || Array.isArray(raw))
    return {
      ok: false,
      problems: ["The input must be a JSON object with dataDate and tasks"],
    };
  const parsed = ProgrammeInputSchema.safeParse(raw);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) =>
      `${where(i.path, raw)} ${i.message}`.replace(/ +/g, " "),
    );
    return { ok: false, problems: [...new Set(problems)] };
  }
  const input = parsed.data as ProgrammeInput;
  try {
    // Unknown ids, loops, slot boundaries and the like need the whole input to check.
    prepare(input);
  } catch (err) {
    if (err instanceof ProgrammeInputError)
      return { ok: false, problems: err.problems };
    throw err;
  }
  return { ok: true, input };
}
