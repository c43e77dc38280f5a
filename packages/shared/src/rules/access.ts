import { z } from 'zod';
import { addWorkingDays, defaultWorkCalendar, isWorkingDay, workCalendarSchema, type WorkCalendar } from './calendar.js';
import type { Activity } from './activities.js';
import { assessDay, type DayAssessment } from './assess-day.js';
import { civilFromDays, daysFromCivil, daysInMonth, formatDayNumber, isIsoDate, MS_PER_HOUR, parseIsoDate, toIsoInstant, zonedTimeToInstant, type IsoDate } from './dates.js';
import type { ForecastHour } from './forecast.js';
import type { RuleSettings } from './settings.js';

export interface AccessWindowSettings {
  /** The calendar scaffolders erect and strike on; defaults to England & Wales, Monday–Friday. */
  calendar?: WorkCalendar;
  /** Working days before the first job day by which the scaffold must be up (default 1). */
  erectLeadWorkingDays?: number;
  /** Calendar days after the last job day before striking, e.g. for mortar or render to cure (default 0). */
  curingDays?: number;
}

export interface AccessWindow {
  erectBy: IsoDate;
  firstUse: IsoDate;
  lastUse: IsoDate;
  strikeFrom: IsoDate;
}

/** When the scaffold must be up and when it may come down, for a job's working days (from `spanFor`). */
export function accessWindowFor(jobSpan: readonly IsoDate[], settings: AccessWindowSettings = {}): AccessWindow {
  const first = jobSpan[0];
  const last = jobSpan[jobSpan.length - 1];
  if (first === undefined || last === undefined) throw new RangeError('the job span must hold at least one date');
  const calendar = settings.calendar ?? defaultWorkCalendar;
  const lead = settings.erectLeadWorkingDays ?? 1;
  const curing = settings.curingDays ?? 0;
  if (!Number.isInteger(lead) || lead < 0) throw new RangeError(`erectLeadWorkingDays must be a whole number ≥ 0, got ${lead}`);
  if (!Number.isInteger(curing) || curing < 0) throw new RangeError(`curingDays must be a whole number ≥ 0, got ${curing}`);
  const zFirst = parseIsoDate(first, 'first job day');
  const zLast = parseIsoDate(last, 'last job day');
  if (zLast < zFirst) throw new RangeError('the job span must be in date order');
  return {
    erectBy: lead === 0 ? first : addWorkingDays(first, -lead, calendar),
    firstUse: first,
    lastUse: last,
    strikeFrom: addWorkingDays(formatDayNumber(zLast + curing), 1, calendar),
  };
}

export interface HireTerms {
  /** Charge per week or part week, integer pence. */
  weeklyRate: number;
  /** Weeks charged however short the hire. */
  minimumWeeks: number;
}

export interface HireCost {
  /** Days on hire: erect day to strike day, counted as elapsed days (Mon → next Mon is 7). */
  hireDays: number;
  chargedWeeks: number;
  pence: number;
}

export const hireTermsSchema = z.object({
  weeklyRate: z.number().int().min(0).max(100_000_000),
  minimumWeeks: z.number().int().min(0).max(520),
});

/** Hire for an access window, part weeks rounded up, never below the minimum. */
export function hireCost(window: Pick<AccessWindow, 'erectBy' | 'strikeFrom'>, terms: HireTerms): HireCost {
  const parsed = hireTermsSchema.safeParse(terms);
  if (!parsed.success) throw new RangeError(`hire terms: ${parsed.error.issues.map((i) => `${i.path.join('.')} ${i.message}`).join('; ')}`);
  const days = Math.max(1, parseIsoDate(window.strikeFrom, 'strikeFrom') - parseIsoDate(window.erectBy, 'erectBy'));
  const weeks = Math.max(terms.minimumWeeks, Math.ceil(days / 7));
  return { hireDays: days, chargedWeeks: weeks, pence: weeks * terms.weeklyRate };
}

export type InspectionRegime = 'uk' | 'us';
export type InspectionReason = 'after-assembly' | 'within-7-days' | 'after-adverse-weather' | 'before-shift' | 'after-occurrence';

export interface InspectionDue {
  /** Inspect on or before this date (before work on it). */
  date: IsoDate;
  reasons: InspectionReason[];
  source: string;
}

const UK_SOURCE = 'Work at Height Regulations 2005 reg 12 (secondary copy: HSE/EEF summary); report contents in Schedule 7';
const US_SOURCE = '29 CFR 1926.451(f)(3): competent person inspects before each work shift and after any occurrence';

export interface InspectionOptions {
  /** Working days; US pre-shift inspections fall on these (default Monday–Friday, no holidays). */
  calendar?: WorkCalendar;
  /** UK interval in days (default 7, the regulation's maximum). */
  intervalDays?: number;
}

const usDefaultCalendar: WorkCalendar = { weekdays: [1, 2, 3, 4, 5], region: null, closures: [], timeZone: 'UTC' };

/**
 * Scaffold inspections from erection to strike. UK: after assembly before first use, then
 * no more than 7 days apart, and after each adverse-weather event (the day after it, before
 * work resumes). US: before every shift and after any occurrence. Includes the strike day,
 * since people still work on the scaffold while striking it.
 */
export function inspectionsDue(
  erectedOn: IsoDate,
  struckOn: IsoDate,
  adverseEvents: readonly IsoDate[],
  regime: InspectionRegime,
  options: InspectionOptions = {},
): InspectionDue[] {
  const z0 = parseIsoDate(erectedOn, 'erectedOn');
  const z1 = parseIsoDate(struckOn, 'struckOn');
  if (z1 < z0) throw new RangeError('the scaffold must be struck on or after the day it is erected');
  const interval = options.intervalDays ?? 7;
  if (!Number.isInteger(interval) || interval < 1 || interval > 7) throw new RangeError(`intervalDays must be 1–7, got ${interval}`);
  const due = new Map<number, Set<InspectionReason>>();
  const add = (z: number, r: InspectionReason): void => {
    let s = due.get(z);
    if (s === undefined) {
      s = new Set();
      due.set(z, s);
    }
    s.add(r);
  };
  const events = [...new Set(adverseEvents.map((d) => parseIsoDate(d, 'adverse event')))]
    .map((z) => z + 1)
    .filter((z) => z > z0 && z <= z1)
    .sort((a, b) => a - b);

  if (regime === 'uk') {
    add(z0, 'after-assembly');
    let last = z0;
    let e = 0;
    for (;;) {
      const next = last + interval;
      const ev = events[e];
      if (ev !== undefined && ev <= next) {
        add(ev, 'after-adverse-weather');
        last = ev;
        e++;
        continue;
      }
      if (next > z1) break;
      add(next, 'within-7-days');
      last = next;
    }
  } else {
    const cal = options.calendar ?? usDefaultCalendar;
    for (let z = z0; z <= z1; z++) {
      const d = formatDayNumber(z);
      if (isWorkingDay(d, cal)) add(z, 'before-shift');
    }
    for (const ev of events) add(ev, 'after-occurrence');
  }
  return [...due.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([z, r]) => ({ date: formatDayNumber(z), reasons: [...r], source: regime === 'uk' ? UK_SOURCE : US_SOURCE }));
}

/** Days whose assessment stopped any activity for wind: each needs a scaffold inspection after it. */
export function adverseWeatherDays(days: readonly { date: IsoDate; assessment: DayAssessment }[]): IsoDate[] {
  return days
    .filter((d) => d.assessment.activities.some((a) => a.reasons.some((r) => r.verdict === 'stop' && r.ruleId.startsWith('wind.'))))
    .map((d) => d.date);
}

/**
 * The days from `from` to `to` on which the wind reached the activity's stop limit at any hour, day or night:
 * access left standing takes the weather whether anyone is on it or not. Days without forecast hours are skipped.
 */
export function windStopDays(
  hours: readonly ForecastHour[],
  from: IsoDate,
  to: IsoDate,
  timeZone: string,
  activity: Activity,
  settings?: RuleSettings,
): IsoDate[] {
  const z0 = parseIsoDate(from, 'from');
  const z1 = parseIsoDate(to, 'to');
  const days: { date: IsoDate; assessment: DayAssessment }[] = [];
  for (let z = z0; z <= z1; z++) {
    const date = formatDayNumber(z);
    const start = zonedTimeToInstant(date, '00:00', timeZone);
    const end = zonedTimeToInstant(formatDayNumber(z + 1), '00:00', timeZone);
    const forecast = hours.filter((h) => {
      const t = Date.parse(h.time);
      return t >= start - MS_PER_HOUR && t < end;
    });
    if (forecast.length === 0) continue;
    const window = { start: toIsoInstant(start), end: toIsoInstant(end) };
    days.push({ date, assessment: assessDay({ activities: [activity], forecast, window, ...(settings ? { settings } : {}) }) });
  }
  return adverseWeatherDays(days);
}

/**
 * How long inspection reports are kept once the access comes down: the regulation keeps them on site until the
 * construction work is complete, then at an office for 3 months. Hodboard counts from the strike date.
 */
export const INSPECTION_RECORD_RETENTION_MONTHS = 3;
const RETENTION_SOURCE = 'Work at Height Regulations 2005 reg 12(6): keep the report on site until the work is complete, then for 3 months (secondary copy)';

export interface RecordRetention {
  /** Null while the access is still up: records are kept for the life of the booking. */
  keepUntil: IsoDate | null;
  source: string;
}

/** The last day inspection records must be kept, counted in calendar months from the strike (a month end clamps: 30 Nov + 3 months is 28/29 Feb). */
export function inspectionRecordsKeptUntil(struckOn: IsoDate | null, months = INSPECTION_RECORD_RETENTION_MONTHS): RecordRetention {
  if (!Number.isInteger(months) || months < 0 || months > 120) throw new RangeError(`months must be a whole number 0–120, got ${months}`);
  if (struckOn === null) return { keepUntil: null, source: RETENTION_SOURCE };
  const { year, month, day } = civilFromDays(parseIsoDate(struckOn, 'struckOn'));
  const index = month - 1 + months;
  const y = year + Math.floor(index / 12);
  const m = (index % 12) + 1;
  return { keepUntil: formatDayNumber(daysFromCivil(y, m, Math.min(day, daysInMonth(y, m)))), source: RETENTION_SOURCE };
}

export const accessWindowSettingsSchema = z.object({
  calendar: workCalendarSchema.optional(),
  erectLeadWorkingDays: z.number().int().min(0).max(30).optional(),
  curingDays: z.number().int().min(0).max(60).optional(),
});

export const isoDateStringSchema = z.string().refine(isIsoDate, { message: 'must be a real date as YYYY-MM-DD' });
