import rrule from 'rrule';
import { z } from 'zod';
import {
  civilFromDays,
  daysFromCivil,
  formatDayNumber,
  isIsoDate,
  isValidTimeZone,
  isoWeekdayOfDay,
  localDateOf,
  parseIsoDate,
  type IsoDate,
} from './dates.js';
import { englandAndWales, publicHolidays, regionKey, type HolidayRegion } from './holidays.js';

// rrule ships CommonJS: a named ESM import throws at run time.
const { rrulestr } = rrule;

export interface WorkCalendar {
  /** ISO weekdays worked: 1 = Monday … 7 = Sunday. */
  weekdays: number[];
  /** Region whose public and bank holidays are days off; `null` for none. */
  region: HolidayRegion | null;
  /** Firm closure dates. */
  closures: IsoDate[];
  /** A crew's recurring leave as RFC 5545 text (`DTSTART…` line, then `RRULE:`, `EXDATE:`…). */
  leave?: string[];
  /** IANA zone the dates are read in. */
  timeZone: string;
}

export const defaultWorkCalendar: WorkCalendar = Object.freeze({
  weekdays: [1, 2, 3, 4, 5],
  region: englandAndWales,
  closures: [],
  leave: [],
  timeZone: 'Europe/London',
}) as WorkCalendar;

const isoDateSchema = z.string().refine(isIsoDate, { message: 'must be a real date as YYYY-MM-DD' });

export const holidayRegionSchema = z.object({
  country: z.string().regex(/^[A-Z]{2}$/, 'must be an ISO 3166-1 alpha-2 code, e.g. GB'),
  state: z.string().min(1).max(10).optional(),
  region: z.string().min(1).max(10).optional(),
});

function leaveRuleProblem(text: string): string | null {
  try {
    compileLeaveRule(text);
    return null;
  } catch (e) {
    return e instanceof Error ? e.message : String(e);
  }
}

export const workCalendarSchema = z.object({
  weekdays: z
    .array(z.number().int().min(1).max(7))
    .min(1, 'at least one weekday must be worked')
    .refine((w) => new Set(w).size === w.length, { message: 'weekdays must not repeat' }),
  region: holidayRegionSchema.nullable(),
  closures: z.array(isoDateSchema).max(2000),
  leave: z
    .array(
      z.string().max(2000).superRefine((text, ctx) => {
        const problem = leaveRuleProblem(text);
        if (problem !== null) ctx.addIssue({ code: 'custom', message: problem });
      }),
    )
    .max(100)
    .optional(),
  timeZone: z.string().refine(isValidTimeZone, { message: 'must be an IANA time zone, e.g. Europe/London' }),
});

interface LeaveRule {
  between(after: Date, before: Date, inc: boolean): Date[];
  readonly utc: boolean;
}

function compileLeaveRule(text: string): LeaveRule {
  if (!/DTSTART/i.test(text)) throw new RangeError('leave rule needs a DTSTART, e.g. "DTSTART:20260102\\nRRULE:FREQ=WEEKLY;INTERVAL=2;BYDAY=FR"');
  // Working days are plain local dates, so a zoned DTSTART is read as floating wall time;
  // only a UTC start (…Z) needs converting into the calendar's zone.
  const floating = text.replace(/(DTSTART|EXDATE|RDATE);TZID=[^:;\n]+/gi, '$1');
  const utc = /DTSTART[^:\n]*:\d{8}T\d{6}Z/i.test(floating);
  let set: ReturnType<typeof rrulestr>;
  try {
    set = rrulestr(floating, { forceset: true });
  } catch (e) {
    throw new RangeError(`leave rule is not valid RFC 5545: ${e instanceof Error ? e.message : String(e)}`);
  }
  return { between: (after, before, inc) => set.between(after, before, inc), utc };
}

interface Compiled {
  weekdayMask: boolean[];
  region: HolidayRegion | null;
  closures: number[];
  leave: LeaveRule[];
  timeZone: string;
  years: Map<number, { start: number; flags: Uint8Array }>;
}

const byIdentity = new WeakMap<WorkCalendar, Compiled>();
const byValue = new Map<string, Compiled>();
const MAX_BY_VALUE = 500;

function compile(cal: WorkCalendar): Compiled {
  const hit = byIdentity.get(cal);
  if (hit !== undefined) return hit;
  const key = JSON.stringify([cal.weekdays, cal.region && regionKey(cal.region), cal.closures, cal.leave ?? [], cal.timeZone]);
  let c = byValue.get(key);
  if (c === undefined) {
    if (!Array.isArray(cal.weekdays) || cal.weekdays.length === 0) throw new RangeError('calendar must work at least one weekday');
    const weekdayMask = new Array<boolean>(8).fill(false);
    for (const d of cal.weekdays) {
      if (!Number.isInteger(d) || d < 1 || d > 7) throw new RangeError(`weekdays are ISO 1 (Monday) to 7 (Sunday), got ${d}`);
      weekdayMask[d] = true;
    }
    if (!isValidTimeZone(cal.timeZone)) throw new RangeError(`unknown time zone ${JSON.stringify(cal.timeZone)}`);
    c = {
      weekdayMask,
      region: cal.region,
      closures: cal.closures.map((d) => parseIsoDate(d, 'closure date')),
      leave: (cal.leave ?? []).map(compileLeaveRule),
      timeZone: cal.timeZone,
      years: new Map(),
    };
    if (byValue.size >= MAX_BY_VALUE) byValue.clear();
    byValue.set(key, c);
  }
  byIdentity.set(cal, c);
  return c;
}

function buildYear(c: Compiled, year: number): { start: number; flags: Uint8Array } {
  const start = daysFromCivil(year, 1, 1);
  const end = daysFromCivil(year + 1, 1, 1);
  const flags = new Uint8Array(end - start);
  for (let z = start; z < end; z++) flags[z - start] = c.weekdayMask[isoWeekdayOfDay(z)] === true ? 1 : 0;
  const off = (z: number): void => {
    if (z >= start && z < end) flags[z - start] = 0;
  };
  if (c.region !== null) for (const h of publicHolidays(year, c.region)) off(parseIsoDate(h.date));
  for (const z of c.closures) off(z);
  for (const rule of c.leave) {
    // A day either side so a UTC start that lands on another local date is still seen.
    const from = new Date(Date.UTC(year, 0, 1) - 86_400_000);
    const to = new Date(Date.UTC(year + 1, 0, 1) + 86_400_000);
    for (const occ of rule.between(from, to, true)) {
      if (rule.utc) off(parseIsoDate(localDateOf(occ.getTime(), c.timeZone)));
      else off(daysFromCivil(occ.getUTCFullYear(), occ.getUTCMonth() + 1, occ.getUTCDate()));
    }
  }
  const entry = { start, flags };
  c.years.set(year, entry);
  return entry;
}

/** Looks days up year by year, keeping the current year's flags so sequential walks stay cheap. */
class DayCursor {
  private start = 0;
  private end = 0;
  private flags: Uint8Array = new Uint8Array(0);
  constructor(private readonly c: Compiled) {}
  isWorking(z: number): boolean {
    if (z < this.start || z >= this.end) {
      const year = civilFromDays(z).year;
      const y = this.c.years.get(year) ?? buildYear(this.c, year);
      this.start = y.start;
      this.flags = y.flags;
      this.end = y.start + y.flags.length;
    }
    return this.flags[z - this.start] === 1;
  }
}

// Ten years without a working day means the calendar is unusable, not slow.
const SEARCH_LIMIT = 3660;

function noWorkingDay(from: number): never {
  throw new RangeError(`calendar has no working day within ${SEARCH_LIMIT} days of ${formatDayNumber(from)}`);
}

function requireInteger(n: number, label: string): void {
  if (!Number.isInteger(n)) throw new RangeError(`${label} must be an integer, got ${n}`);
}

export function isWorkingDay(date: IsoDate, calendar: WorkCalendar = defaultWorkCalendar): boolean {
  return new DayCursor(compile(calendar)).isWorking(parseIsoDate(date));
}

/** The date `n` working days after `start` (before it when `n` < 0); `start` itself is not counted. */
export function addWorkingDays(start: IsoDate, n: number, calendar: WorkCalendar = defaultWorkCalendar): IsoDate {
  requireInteger(n, 'n');
  const cur = new DayCursor(compile(calendar));
  let z = parseIsoDate(start, 'start');
  const step = n < 0 ? -1 : 1;
  let left = Math.abs(n);
  let idle = 0;
  while (left > 0) {
    z += step;
    if (cur.isWorking(z)) {
      left--;
      idle = 0;
    } else if (++idle > SEARCH_LIMIT) noWorkingDay(z);
  }
  return formatDayNumber(z);
}

/**
 * Working days from `a` to `b`: those in (a, b] when b ≥ a, negated for [b, a) when b < a,
 * so that `workingDaysBetween(a, addWorkingDays(a, n)) === n`.
 */
export function workingDaysBetween(a: IsoDate, b: IsoDate, calendar: WorkCalendar = defaultWorkCalendar): number {
  const cur = new DayCursor(compile(calendar));
  const za = parseIsoDate(a, 'a');
  const zb = parseIsoDate(b, 'b');
  let count = 0;
  if (zb >= za) {
    for (let z = za + 1; z <= zb; z++) if (cur.isWorking(z)) count++;
    return count;
  }
  for (let z = zb; z < za; z++) if (cur.isWorking(z)) count++;
  return -count;
}

/** The first `workingDays` working dates on or after `start`: the days a job occupies. */
export function spanFor(start: IsoDate, workingDays: number, calendar: WorkCalendar = defaultWorkCalendar): IsoDate[] {
  requireInteger(workingDays, 'workingDays');
  if (workingDays < 0) throw new RangeError(`workingDays must be ≥ 0, got ${workingDays}`);
  const cur = new DayCursor(compile(calendar));
  const out: IsoDate[] = [];
  let z = parseIsoDate(start, 'start');
  let idle = 0;
  while (out.length < workingDays) {
    if (cur.isWorking(z)) {
      out.push(formatDayNumber(z));
      idle = 0;
    } else if (++idle > SEARCH_LIMIT) noWorkingDay(z);
    z++;
  }
  return out;
}

/** The first working day on or after `date`. */
export function nextWorkingDay(date: IsoDate, calendar: WorkCalendar = defaultWorkCalendar): IsoDate {
  const first = spanFor(date, 1, calendar)[0];
  if (first === undefined) throw new RangeError('no working day found');
  return first;
}
