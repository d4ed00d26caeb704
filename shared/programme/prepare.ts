// Input checking and preparation: turn the JSON contract into flat arrays the passes can walk
// quickly (CSR adjacency, per-task slot tables, instants as local minutes). Every problem is
// collected as one plain-English line (spec: "invalid input … one plain-English line per
// problem"), so the CLI and the API can show them all at once.
import {
  resolveCalendar,
  slotTableFor,
  SlotTable,
  type CalendarDef,
} from "./calendar";
import type { HolidayRegion, ProgrammeInput } from "./types";
import { ProgrammeInputError } from "./types";
import {
  MINUTES_PER_DAY,
  NOON,
  parseDateOrDateTime,
  parseDateTime,
  parseDay,
  parseTime,
  formatTime,
} from "./time";
import { isValidZone } from "./zone";

export const KIND_FS = 0;
export const KIND_SS = 1;
export const KIND_FF = 2;
export const UNIT_WORKING = 0;
export const UNIT_ELAPSED = 1;

const REGIONS: HolidayRegion[] = ["GB-ENG", "GB-WLS", "GB-SCT", "GB-NIR"];
export const DEFAULT_ZONE = "Europe/London";

/** The input flattened for the passes. Instants are local minutes; NaN means "none". */
export interface Prepared {
  input: ProgrammeInput;
  zone: string;
  n: number;
  ids: string[];
  names: string[];
  index: Map<string, number>;
  tables: SlotTable[];
  workshop: SlotTable;
  /** Duration in slots (0 = milestone). */
  dur: Int32Array;
  resource: (string | null)[];
  net: Float64Array;
  pin: Float64Array;
  actS: Float64Array;
  actF: Float64Array;
  dataDay: number;
  handoverDay: number | null;
  // Links, one entry per link.
  m: number;
  eFrom: Int32Array;
  eTo: Int32Array;
  eKind: Uint8Array;
  eUnit: Uint8Array;
  /** Lag in slots (workingDays × 2) or in real minutes (elapsedHours × 60). */
  eLag: Int32Array;
  // CSR adjacency: edges into / out of each task.
  inStart: Int32Array;
  inEdges: Int32Array;
  outStart: Int32Array;
  outEdges: Int32Array;
  /** Tasks in topological order. */
  order: Int32Array;
  busy: {
    resource: string;
    start: number;
    finish: number;
    ref: string | null;
  }[];
}

function label(id: string): string {
  return 'Task "' + id + '"';
}

function isHalfStep(x: number): boolean {
  return Number.isFinite(x) && Math.abs(x * 2 - Math.round(x * 2)) < 1e-9;
}

/** Check and flatten an input; throws ProgrammeInputError listing every problem. */
export function prepare(input: ProgrammeInput): Prepared {
  const problems: string[] = [];
  const zone = input.timeZone ?? DEFAULT_ZONE;
  if (!isValidZone(zone))
    problems.push(`timeZone "${zone}" is not a known IANA time zone`);
  const dataDay =
    typeof input.dataDate === "string" ? parseDay(input.dataDate) : null;
  if (dataDay === null)
    problems.push(`dataDate "${input.dataDate}" is not a date (YYYY-MM-DD)`);
  let handoverDay: number | null = null;
  if (input.handover != null) {
    handoverDay = parseDay(input.handover);
    if (handoverDay === null)
      problems.push(`handover "${input.handover}" is not a date (YYYY-MM-DD)`);
  }

  // Calendars. Without any, the contract's defaults make one called "workshop".
  const calInputs =
    input.calendars && input.calendars.length > 0
      ? input.calendars
      : [{ id: "workshop" }];
  const defs = new Map<string, CalendarDef>();
  for (const c of calInputs) {
    const where = `Calendar "${c.id}"`;
    if (defs.has(c.id)) problems.push(`${where} is listed twice`);
    const ds = parseTime(c.dayStart ?? "08:00");
    const de = parseTime(c.dayEnd ?? "16:30");
    if (ds === null)
      problems.push(`${where}: dayStart "${c.dayStart}" is not a time (HH:mm)`);
    else if (ds >= NOON)
      problems.push(
        `${where}: dayStart ${c.dayStart} must be before 12:00 (the morning slot ends at 12:00)`,
      );
    if (de === null)
      problems.push(`${where}: dayEnd "${c.dayEnd}" is not a time (HH:mm)`);
    else if (de <= NOON)
      problems.push(
        `${where}: dayEnd ${c.dayEnd} must be after 12:00 (the afternoon slot starts at 12:00)`,
      );
    const wds = c.workingWeekdays ?? [1, 2, 3, 4, 5];
    if (wds.length === 0) problems.push(`${where} has no working weekdays`);
    for (const w of wds)
      if (!Number.isInteger(w) || w < 1 || w > 7)
        problems.push(
          `${where}: weekday ${w} is not an ISO weekday number (1 = Monday … 7 = Sunday)`,
        );
    if (c.holidayRegion != null && !REGIONS.includes(c.holidayRegion))
      problems.push(
        `${where}: holidayRegion "${c.holidayRegion}" is not one of ${REGIONS.join(", ")}`,
      );
    for (const d of c.daysOff ?? [])
      if (parseDay(d) === null)
        problems.push(`${where}: day off "${d}" is not a date (YYYY-MM-DD)`);
    defs.set(c.id, resolveCalendar(c));
  }
  const workshopDef = defs.get("workshop") ?? defs.get(calInputs[0].id)!;

  // The slot tables start well before every date in the input so that negative lags and
  // negative float have room; rounding keeps the table cache warm between runs.
  // ISO dates compare as strings, so the earliest is found without parsing each one.
  let minDate = typeof input.dataDate === "string" ? input.dataDate : "9999";
  const consider = (s: string | null | undefined) => {
    if (typeof s === "string" && s < minDate) minDate = s;
  };
  consider(input.handover);
  for (const t of input.tasks) {
    consider(t.notEarlierThan);
    consider(t.bookedStart);
    consider(t.actualStart);
    consider(t.actualFinish);
  }
  for (const b of input.busy ?? []) consider(b.start);
  const minDay = parseDay(minDate.slice(0, 10)) ?? dataDay ?? 0;
  const baseDay = Math.floor((minDay - 800) / 512) * 512;

  const tasks = input.tasks;
  const n = tasks.length;
  const ids: string[] = new Array(n);
  const names: string[] = new Array(n);
  const index = new Map<string, number>();
  const tables: SlotTable[] = new Array(n);
  const dur = new Int32Array(n);
  const resource: (string | null)[] = new Array(n);
  const net = new Float64Array(n).fill(NaN);
  const pin = new Float64Array(n).fill(NaN);
  const actS = new Float64Array(n).fill(NaN);
  const actF = new Float64Array(n).fill(NaN);
  const tableByKey = new Map<string, SlotTable | null>();
  const pairTables = new Map<string, Map<string, SlotTable | null>>();
  const workshop = slotTableFor([workshopDef], baseDay);

  for (let i = 0; i < n; i++) {
    const t = tasks[i];
    ids[i] = t.id;
    names[i] = t.name ?? t.id;
    resource[i] = t.resource ?? null;
    const where = label(t.id);
    if (typeof t.id !== "string" || t.id === "")
      problems.push(`Task ${i + 1} has no id`);
    // One map operation per task: a duplicate id leaves the size unchanged.
    const size = index.size;
    index.set(t.id, i);
    if (index.size === size) problems.push(`${where} is listed twice`);

    // Calendar: one id or a list; absent means the workshop calendar.
    const cal = t.calendar;
    // Two-calendar lists (trade + site) are the common case: look them up without joining.
    let pair: Map<string, SlotTable | null> | undefined;
    let key: string;
    if (cal == null) key = "";
    else if (typeof cal === "string") key = cal;
    else if (cal.length === 2) {
      pair = pairTables.get(cal[0]);
      if (!pair) pairTables.set(cal[0], (pair = new Map()));
      key = cal[1];
    } else key = "\u0000" + cal.join("\u0000");
    let tb = (pair ?? tableByKey).get(key);
    if (tb === undefined) {
      const calIds =
        cal == null ? [workshopDef.id] : Array.isArray(cal) ? cal : [cal];
      const members: CalendarDef[] = [];
      let ok = calIds.length > 0;
      for (const cid of calIds) {
        const def = defs.get(cid);
        if (!def) {
          problems.push(
            `${where} uses calendar "${cid}", which is not in calendars`,
          );
          ok = false;
        } else members.push(def);
      }
      if (
        ok &&
        ![1, 2, 3, 4, 5, 6, 7].some((w) =>
          members.every((m) => m.weekdays.includes(w)),
        )
      ) {
        problems.push(
          `${where}: calendars ${calIds.join(" and ")} share no working weekday`,
        );
        ok = false;
      }
      tb = ok ? slotTableFor(members, baseDay) : null;
      (pair ?? tableByKey).set(key, tb);
    }
    tables[i] = tb ?? workshop;

    if (!isHalfStep(t.durationDays) || t.durationDays < 0)
      problems.push(
        `${where}: durationDays ${t.durationDays} must be zero or more, in steps of 0.5`,
      );
    else dur[i] = Math.round(t.durationDays * 2);

    const table = tables[i];
    if (t.notEarlierThan != null) {
      const v = parseDateOrDateTime(t.notEarlierThan, 0);
      if (Number.isNaN(v))
        problems.push(
          `${where}: notEarlierThan "${t.notEarlierThan}" is not a date or date-time`,
        );
      else net[i] = v;
    }
    pin[i] = slotInstant(
      t.bookedStart,
      "bookedStart",
      "start",
      table,
      where,
      problems,
    );
    actS[i] = slotInstant(
      t.actualStart,
      "actualStart",
      "start",
      table,
      where,
      problems,
    );
    actF[i] = slotInstant(
      t.actualFinish,
      "actualFinish",
      "finish",
      table,
      where,
      problems,
    );
    if (!Number.isNaN(actS[i]) && !Number.isNaN(actF[i]) && actF[i] < actS[i])
      problems.push(`${where}: actualFinish is before actualStart`);
  }

  // Links.
  const links = input.links ?? [];
  const m = links.length;
  const eFrom = new Int32Array(m);
  const eTo = new Int32Array(m);
  const eKind = new Uint8Array(m);
  const eUnit = new Uint8Array(m);
  const eLag = new Int32Array(m);
  const inCount = new Int32Array(n + 1);
  const outCount = new Int32Array(n + 1);
  for (let e = 0; e < m; e++) {
    const l = links[e];
    const f = index.get(l.from);
    const to = index.get(l.to);
    const where = "Link " + l.from + " → " + l.to;
    if (f === undefined)
      problems.push(`${where}: task "${l.from}" is not in tasks`);
    if (to === undefined)
      problems.push(`${where}: task "${l.to}" is not in tasks`);
    if (f === undefined || to === undefined) {
      continue;
    }
    if (f === to) {
      // Named as the person knows the task (its name; the id when it has none).
      problems.push(`${names[f]} cannot wait for itself`);
      continue;
    }
    eFrom[e] = f;
    eTo[e] = to;
    const kind = l.kind ?? "FS";
    if (kind === "FS") eKind[e] = KIND_FS;
    else if (kind === "SS") eKind[e] = KIND_SS;
    else if (kind === "FF") eKind[e] = KIND_FF;
    else problems.push(`${where}: kind "${kind}" is not FS, SS or FF`);
    const lag = l.lag ?? 0;
    const unit = l.lagUnit ?? "workingDays";
    if (unit === "workingDays") {
      if (!isHalfStep(lag))
        problems.push(
          `${where}: a lag in working days must be in steps of 0.5 (got ${lag})`,
        );
      else eLag[e] = Math.round(lag * 2);
      eUnit[e] = UNIT_WORKING;
    } else if (unit === "elapsedHours") {
      if (!Number.isFinite(lag))
        problems.push(`${where}: lag ${lag} is not a number of hours`);
      else eLag[e] = Math.round(lag * 60);
      eUnit[e] = UNIT_ELAPSED;
    } else
      problems.push(
        `${where}: lagUnit "${unit}" is not workingDays or elapsedHours`,
      );
    inCount[to + 1]++;
    outCount[f + 1]++;
  }

  const busy: Prepared["busy"] = [];
  for (const b of input.busy ?? []) {
    const where = `Busy interval of "${b.resource}"${b.ref ? ` (${b.ref})` : ""}`;
    // A date alone runs from the start of that day to its end.
    const s = parseDateOrDateTime(b.start, 0);
    const f = parseDateOrDateTime(b.finish, MINUTES_PER_DAY);
    if (Number.isNaN(s))
      problems.push(`${where}: start "${b.start}" is not a date or date-time`);
    if (Number.isNaN(f))
      problems.push(
        `${where}: finish "${b.finish}" is not a date or date-time`,
      );
    if (!Number.isNaN(s) && !Number.isNaN(f) && !(f > s))
      problems.push(`${where}: finish is not after start`);
    if (!Number.isNaN(s) && !Number.isNaN(f))
      busy.push({
        resource: b.resource,
        start: s,
        finish: f,
        ref: b.ref ?? null,
      });
  }

  if (problems.length > 0) throw new ProgrammeInputError(problems);

  // CSR adjacency.
  for (let i = 0; i < n; i++) {
    inCount[i + 1] += inCount[i];
    outCount[i + 1] += outCount[i];
  }
  const inStart = inCount.slice();
  const outStart = outCount.slice();
  const inEdges = new Int32Array(m);
  const outEdges = new Int32Array(m);
  const inFill = inStart.slice(0, n);
  const outFill = outStart.slice(0, n);
  for (let e = 0; e < m; e++) {
    inEdges[inFill[eTo[e]]++] = e;
    outEdges[outFill[eFrom[e]]++] = e;
  }

  const order = topologicalOrder(
    n,
    m,
    eFrom,
    eTo,
    inStart,
    inEdges,
    outStart,
    outEdges,
    ids,
    names,
  );

  return {
    input,
    zone,
    n,
    ids,
    names,
    index,
    tables,
    workshop,
    dur,
    resource,
    net,
    pin,
    actS,
    actF,
    dataDay: dataDay!,
    handoverDay,
    m,
    eFrom,
    eTo,
    eKind,
    eUnit,
    eLag,
    inStart,
    inEdges,
    outStart,
    outEdges,
    order,
    busy,
  };
}

/**
 * A booked or actual date: a date alone is the morning slot (for a finish, the day's end); a
 * date-time must sit on a slot boundary of the task's calendar (spec "Conventions").
 */
function slotInstant(
  value: string | null | undefined,
  field: string,
  role: "start" | "finish",
  tb: SlotTable,
  where: string,
  problems: string[],
): number {
  if (value == null) return NaN;
  if (value.length === 10) {
    const d = parseDay(value);
    if (d === null) {
      problems.push(`${where}: ${field} "${value}" is not a date`);
      return NaN;
    }
    return d * MINUTES_PER_DAY + (role === "start" ? tb.dayStart : tb.dayEnd);
  }
  const t = parseDateTime(value);
  if (t === null) {
    problems.push(
      `${where}: ${field} "${value}" is not a date (YYYY-MM-DD) or date-time (YYYY-MM-DDTHH:mm)`,
    );
    return NaN;
  }
  const minute = t - Math.floor(t / MINUTES_PER_DAY) * MINUTES_PER_DAY;
  const allowed = role === "start" ? [tb.dayStart, NOON] : [NOON, tb.dayEnd];
  if (!allowed.includes(minute)) {
    problems.push(
      `${where}: ${field} ${value} is not at the ${role} of a slot (${allowed.map(formatTime).join(" or ")})`,
    );
    return NaN;
  }
  return t;
}

/** Kahn's algorithm; a loop is reported with the tasks in it (by name), in link order. */
function topologicalOrder(
  n: number,
  m: number,
  eFrom: Int32Array,
  eTo: Int32Array,
  inStart: Int32Array,
  inEdges: Int32Array,
  outStart: Int32Array,
  outEdges: Int32Array,
  ids: string[],
  names: string[],
): Int32Array {
  const indeg = new Int32Array(n);
  for (let e = 0; e < m; e++) indeg[eTo[e]]++;
  const order = new Int32Array(n);
  let head = 0;
  let tail = 0;
  for (let i = 0; i < n; i++) if (indeg[i] === 0) order[tail++] = i;
  while (head < tail) {
    const i = order[head++];
    for (let k = outStart[i]; k < outStart[i + 1]; k++) {
      const j = eTo[outEdges[k]];
      if (--indeg[j] === 0) order[tail++] = j;
    }
  }
  if (tail === n) return order;
  // Every remaining task has a predecessor that also remains: walking back from one of them
  // must revisit a task, and the walk between the two visits is a loop.
  const problems: string[] = [];
  const reported = new Uint8Array(n);
  for (let s = 0; s < n; s++) {
    if (indeg[s] === 0 || reported[s]) continue;
    const seenAt = new Map<number, number>();
    const walk: number[] = [];
    let cur = s;
    while (!seenAt.has(cur)) {
      seenAt.set(cur, walk.length);
      walk.push(cur);
      let next = -1;
      for (let k = inStart[cur]; k < inStart[cur + 1]; k++) {
        const p = eFrom[inEdges[k]];
        if (indeg[p] > 0) {
          next = p;
          break;
        }
      }
      cur = next;
    }
    let loop = walk.slice(seenAt.get(cur)!).reverse();
    if (loop.some((t) => reported[t])) continue;
    // Start the loop at its smallest id so that the message does not depend on input order.
    let first = 0;
    for (let k = 1; k < loop.length; k++)
      if (ids[loop[k]] < ids[loop[first]]) first = k;
    loop = [...loop.slice(first), ...loop.slice(0, first)];
    for (const t of loop) reported[t] = 1;
    // Tasks by name (the id when unnamed): the message reaches people, who never see ids.
    problems.push(
      `Links form a loop: ${[...loop, loop[0]].map((t) => names[t]).join(" → ")}`,
    );
  }
  throw new ProgrammeInputError(problems);
}
