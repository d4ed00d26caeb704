import { z } from "zod";
import { holidayRegionSchema, isoDateSchema, partySchema } from "./common";

/** A date (that morning / that day's end) or a date-time on a slot boundary, local to the job. */
export const slotInstantSchema = z
  .string()
  .regex(
    /^\d{4}-\d{2}-\d{2}(T([01]\d|2[0-3]):[0-5]\d)?$/,
    "Use a date like 2026-03-14, or 2026-03-14T12:00",
  );

export const hazardSchema = z.enum(["electrical", "height", "tall-unit"]);
export type Hazard = z.infer<typeof hazardSchema>;
export const linkKindSchema = z.enum(["FS", "SS", "FF"]);
export const lagUnitSchema = z.enum(["workingDays", "elapsedHours"]);

/** A task's length in working days, in half days (one slot); tasks and starters share it. */
export const durationSchema = z
  .number({ message: "Enter the duration in working days" })
  .min(0, "A duration cannot be negative")
  .max(250, "Keep a task under 250 working days")
  .refine(
    (d) => Number.isInteger(d * 2),
    "Use whole or half days (0.5 is one morning or afternoon)",
  );

/**
 * How far a link's lag may go either way, per unit (issue 13): 60 working days is a season's
 * wait, 720 hours (30 days) more drying or curing than any finish needs. The form, the link
 * routes and the starters all check lags with `lagProblem`, so the limit lives here only.
 */
export const LAG_LIMITS = {
  workingDays: { max: 60, words: "60 working days" },
  elapsedHours: { max: 720, words: "720 hours (30 days)" },
} as const satisfies Record<z.infer<typeof lagUnitSchema>, unknown>;

/** What is wrong with a lag in its unit (out of range, not a half day), or null when it is fine. */
export function lagProblem(
  lag: number,
  unit: z.infer<typeof lagUnitSchema>,
): string | null {
  if (Math.abs(lag) > LAG_LIMITS[unit].max)
    return `Keep the lag within ${LAG_LIMITS[unit].words} either way`;
  if (unit === "workingDays" && !Number.isInteger(lag * 2))
    return "Working-day lags go in whole or half days";
  return null;
}

// The type message only: a schema-wide message would also replace the range checks' (zod 4),
// which is how a lag of 10^9 came to say "Enter the lag".
/** A lag as a number; its range and steps depend on the unit (`refineLag`). */
export const lagSchema = z.number({
  error: (iss) => (iss.code === "invalid_type" ? "Enter the lag" : undefined),
});

/** Adds `lagProblem`'s message on `lag` when both the lag and its unit are known. */
export function refineLag(
  l: { lag?: number; lagUnit?: z.infer<typeof lagUnitSchema> },
  ctx: z.RefinementCtx,
): void {
  if (l.lag === undefined || l.lagUnit === undefined) return;
  const problem = lagProblem(l.lag, l.lagUnit);
  if (problem)
    ctx.addIssue({ code: "custom", path: ["lag"], message: problem });
}

export const versionSchema = z
  .number({ message: "The programme version is missing" })
  .int()
  .min(1);

const taskFields = {
  name: z.string().trim().min(1, "Give the task a name").max(160),
  party: partySchema,
  durationDays: durationSchema,
  notEarlierThan: isoDateSchema.nullable(),
  customerNote: z.string().max(1000),
  internalNote: z.string().max(2000),
  hazards: z.array(hazardSchema).max(3),
};

export const taskFieldsSchema = z.object({
  ...taskFields,
  notEarlierThan: taskFields.notEarlierThan.default(null),
  customerNote: taskFields.customerNote.default(""),
  internalNote: taskFields.internalNote.default(""),
  hazards: taskFields.hazards.default([]),
});

export const createTaskBodySchema = taskFieldsSchema.extend({
  version: versionSchema,
});
export type CreateTaskBody = z.input<typeof createTaskBodySchema>;

// Without the new task's defaults: zod's `.partial()` keeps a field's default, so an edit sending
// only the duration used to clear the task's hazards, notes and "not earlier than".
export const updateTaskBodySchema = z
  .object(taskFields)
  .partial()
  .extend({ version: versionSchema });

export const versionQuerySchema = z.object({
  version: z.coerce.number().int().min(1, "The programme version is missing"),
});

export const reorderBodySchema = z.object({
  version: versionSchema,
  taskIds: z.array(z.uuid()).min(1),
});

/** A "waits for" link: `toTaskId` waits for `fromTaskId`. */
export const linkFieldsSchema = z.object({
  fromTaskId: z.uuid({ message: "Choose the task it waits for" }),
  toTaskId: z.uuid({ message: "Choose the waiting task" }),
  kind: linkKindSchema.default("FS"),
  lag: lagSchema.default(0),
  lagUnit: lagUnitSchema.default("workingDays"),
});
export const createLinkBodySchema = linkFieldsSchema
  .extend({ version: versionSchema })
  .refine((l) => l.fromTaskId !== l.toTaskId, {
    message: "A task cannot wait for itself",
    path: ["fromTaskId"],
  })
  .superRefine(refineLag);
export type CreateLinkBody = z.input<typeof createLinkBodySchema>;

export const updateLinkBodySchema = z
  .object({
    version: versionSchema,
    kind: linkKindSchema.optional(),
    lag: lagSchema.optional(),
    lagUnit: lagUnitSchema.optional(),
  })
  // Without a unit the lag is checked against the link's stored unit (programme service).
  .superRefine(refineLag);

export const progressBodySchema = z
  .object({
    version: versionSchema,
    actualStart: slotInstantSchema.nullable(),
    actualFinish: slotInstantSchema.nullable(),
  })
  .refine((b) => b.actualStart !== null || b.actualFinish === null, {
    message: "A task is started before it is done",
    path: ["actualStart"],
  })
  .refine(
    (b) => !b.actualStart || !b.actualFinish || b.actualStart <= b.actualFinish,
    {
      message: "It cannot finish before it starts",
      path: ["actualFinish"],
    },
  );

/** One proposed edit, previewed or applied: move a task (not earlier than) and/or change its duration. */
export const programmeChangeSchema = z
  .object({
    taskId: z.uuid(),
    notEarlierThan: isoDateSchema.nullable().optional(),
    durationDays: durationSchema.optional(),
  })
  .refine(
    (c) => c.notEarlierThan !== undefined || c.durationDays !== undefined,
    { message: "Say what changes" },
  );
export type ProgrammeChange = z.infer<typeof programmeChangeSchema>;

export const changeBodySchema = z.object({
  version: versionSchema,
  changes: z.array(programmeChangeSchema).min(1).max(100),
});
export type ChangeBody = z.input<typeof changeBodySchema>;

const taskResultSchema = z.object({
  id: z.string(),
  earlyStart: z.string(),
  earlyFinish: z.string(),
  lateStart: z.string(),
  lateFinish: z.string(),
  totalFloatDays: z.number(),
  freeFloatDays: z.number(),
  critical: z.boolean(),
  plannedStart: z.string(),
  plannedFinish: z.string(),
  readiness: z.object({
    state: z.enum(["done", "started", "clear", "waiting"]),
    waitingOn: z.array(z.object({ task: z.string(), allowsFrom: z.string() })),
  }),
  problems: z.array(
    z.object({
      code: z.enum([
        "booking-too-early",
        "non-working-day",
        "clash",
        "overdue",
        "handover-at-risk",
      ]),
      message: z.string(),
    }),
  ),
});

export const programmeResultSchema = z.object({
  finish: z.string().nullable(),
  handoverSlipDays: z.number().nullable(),
  criticalPath: z.array(z.string()),
  tasks: z.array(taskResultSchema),
});

export const programmeTaskSchema = z.object({
  id: z.string(),
  name: z.string(),
  party: partySchema,
  durationDays: z.number(),
  sortOrder: z.number(),
  notEarlierThan: z.string().nullable(),
  actualStart: z.string().nullable(),
  actualFinish: z.string().nullable(),
  customerNote: z.string(),
  internalNote: z.string(),
  hazards: z.array(hazardSchema),
  booking: z
    .object({
      id: z.string(),
      tradeId: z.string(),
      tradeName: z.string(),
      state: z.string(),
      start: z.string(),
      finish: z.string(),
    })
    .nullable(),
});
export type ProgrammeTask = z.infer<typeof programmeTaskSchema>;

export const programmeLinkSchema = z.object({
  id: z.string(),
  fromTaskId: z.string(),
  toTaskId: z.string(),
  kind: linkKindSchema,
  lag: z.number(),
  lagUnit: lagUnitSchema,
});

/** A calendar as the engine reads it (`CalendarInput`), as the server builds them. */
const engineCalendarSchema = z.object({
  id: z.string(),
  workingWeekdays: z.array(z.number().int()),
  dayStart: z.string(),
  dayEnd: z.string(),
  holidayRegion: holidayRegionSchema.nullable(),
  daysOff: z.array(z.string()),
});

/**
 * The part of the engine input that `tasks` and `links` do not already say (issue 15: the input
 * used to repeat every task and link). `engineInputOf` (shared/schemas/programme-view.ts) puts the
 * exact input the server scheduled back together from the whole response.
 */
export const programmeEngineSchema = z.object({
  /** The workshop's, the site's and each booked trade's (`trade:<tradeId>`) calendar. */
  calendars: z.array(engineCalendarSchema),
  /** The booked trades' time held elsewhere (other jobs, other workshops as "busy"). */
  busy: z.array(
    z.object({
      resource: z.string(),
      start: z.string(),
      finish: z.string(),
      ref: z.string(),
    }),
  ),
  /** The engine's resource name of each booked trade (its business name, made unique), by trade id. */
  resources: z.record(z.string(), z.string()),
});
export type ProgrammeEngine = z.infer<typeof programmeEngineSchema>;

/**
 * A job's programme: what is stored (tasks, links), what else the engine needs (`engine`, so the
 * client re-runs the same engine for instant previews) and the server's result.
 */
export const programmeResponseSchema = z.object({
  jobId: z.string(),
  version: z.number(),
  dataDate: z.string(),
  handover: z.string().nullable(),
  timeZone: z.string(),
  tasks: z.array(programmeTaskSchema),
  links: z.array(programmeLinkSchema),
  engine: programmeEngineSchema,
  result: programmeResultSchema,
});
export type ProgrammeResponse = z.infer<typeof programmeResponseSchema>;

const impactSchema = z.object({
  moves: z.array(
    z.object({
      task: z.string(),
      fromStart: z.string(),
      toStart: z.string(),
      fromFinish: z.string(),
      toFinish: z.string(),
      byDays: z.number(),
    }),
  ),
  reconfirm: z.array(
    z.object({
      task: z.string(),
      bookedStart: z.string(),
      proposedStart: z.string(),
      reason: z.string(),
    }),
  ),
  handover: z.object({
    finishBefore: z.string().nullable(),
    finishAfter: z.string().nullable(),
    slipDaysBefore: z.number().nullable(),
    slipDaysAfter: z.number().nullable(),
    changeDays: z.number(),
  }),
});

export const previewResponseSchema = z.object({
  impact: impactSchema,
  result: programmeResultSchema,
});

/**
 * What one programme edit changed (issue 15), instead of the whole programme: the tasks and
 * links added or changed (whole rows) or removed, the results that differ (moved dates, floats,
 * readiness, problems), the finish and handover slip, and the new `version`. The client lays it
 * over its cached programme with `applyProgrammeEdit` when `version` is its own + 1, and reloads
 * otherwise. Built on the server by `programmeEditOf(before, after)`.
 */
export const programmeEditSchema = z.object({
  jobId: z.string(),
  /** The job's version after this edit. */
  version: z.number(),
  dataDate: z.string(),
  handover: z.string().nullable(),
  timeZone: z.string(),
  /** Tasks added or changed, whole (a reorder lists every task whose place moved). */
  tasks: z.array(programmeTaskSchema),
  removedTaskIds: z.array(z.string()),
  /** Every task id in order, only when merging would not give the server's order by itself. */
  taskOrder: z.array(z.string()).optional(),
  /** Links added or changed, whole. */
  links: z.array(programmeLinkSchema),
  removedLinkIds: z.array(z.string()),
  /** Every link id in order, only when merging would not give the server's order by itself. */
  linkOrder: z.array(z.string()).optional(),
  /** Only when it changed (a moved booking, another trade's calendar…). */
  engine: programmeEngineSchema.optional(),
  result: z.object({
    finish: z.string().nullable(),
    handoverSlipDays: z.number().nullable(),
    /** Only when it changed. */
    criticalPath: z.array(z.string()).optional(),
    /** The results of added tasks and of every task whose result differs. */
    tasks: z.array(taskResultSchema),
  }),
});
export type ProgrammeEdit = z.infer<typeof programmeEditSchema>;

/** A new task's answer: its id and what changed. */
export const createTaskResponseSchema = programmeEditSchema.extend({
  taskId: z.string(),
});
/** An applied move's answer: the server's own knock-on and what changed. */
export const applyResponseSchema = programmeEditSchema.extend({
  impact: impactSchema,
});
