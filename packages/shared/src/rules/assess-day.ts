import { z } from 'zod';
import { activities, heightActivities, mortarActivities, mortarKinds, type Activity, type MortarKind } from './activities.js';
import { checkConcreteColdWeather, checkConcreteFreezing, checkUkConcreteDischarge } from './concrete-rules.js';
import { parseInstant, type IsoInstant } from './dates.js';
import {
  blockedBuffer, buildContext, fmt, forecastHourSchema, type AssessmentNote, type ForecastHour, type HourContext, type RuleReason, type Verdict,
} from './forecast.js';
import { usableHoursShown } from './units.js';
import {
  checkFrostProtection,
  checkUkMortarCold,
  checkUkMortarHeat,
  checkUsMortarCold,
  checkUsMortarHeat,
} from './mortar-rules.js';
import { checkHeavyRain, checkRainOnFreshWork } from './rain-rules.js';
import { defaultRuleSettings, ruleSettingsSchema, type RuleSettings } from './settings.js';
import { SOURCES } from './sources.js';
import { checkWind, windLimitsFor, type WindLimit } from './wind-rules.js';

/** An activity, with its mortar when it is laid in mortar (cement by default). */
export type PlannedActivity = Activity | { activity: Activity; mortar?: MortarKind };

export interface AssessDayInput {
  activities: readonly PlannedActivity[];
  /** Hourly forecast for the day and the next 48 h (`FORECAST_HOURS_AFTER_DAY`), in time order. */
  forecast: readonly ForecastHour[];
  window: { start: IsoInstant; end: IsoInstant };
  /** A resolved settings object (see `resolveRuleSettings`); defaults when omitted. */
  settings?: RuleSettings;
}

export interface ActivityAssessment {
  activity: Activity;
  mortar?: MortarKind;
  /** The worst verdict of its reasons (go when it has none). */
  verdict: Verdict;
  /** Window hours free of any stop rule and covered by the forecast. */
  usableHours: number;
  reasons: RuleReason[];
  /** What the office should know that does not change the verdict: look-ahead periods past the forecast's horizon. */
  notes: AssessmentNote[];
  /** Standing cautions that apply whatever the weather. */
  advice: readonly string[];
}

/** A note on the day, once however many of its activities gave it. */
export interface DayNote extends AssessmentNote {
  activities: Activity[];
}

export interface DayAssessment {
  /** The worst verdict of the day's activities. */
  verdict: Verdict;
  windowHours: number;
  activities: ActivityAssessment[];
  /** The activities' notes, each rule's note once (activities with the same rule and period give the same one). */
  notes: DayNote[];
}

const plannedActivitySchema = z.union([
  z.enum(activities),
  z.object({ activity: z.enum(activities), mortar: z.enum(mortarKinds).optional() }),
]);

export const assessDayInputSchema = z
  .object({
    activities: z.array(plannedActivitySchema).min(1).max(20),
    forecast: z.array(forecastHourSchema).max(24 * 16),
    window: z.object({ start: z.iso.datetime({ offset: true }), end: z.iso.datetime({ offset: true }) }),
    settings: ruleSettingsSchema.optional(),
  })
  .refine((v) => Date.parse(v.window.end) > Date.parse(v.window.start), {
    message: 'the working window must end after it starts',
    path: ['window', 'end'],
  });

const HEIGHT_ADVICE: readonly string[] = Object.freeze([
  'Work at height: check the scaffold, tower or platform and edge protection before use, keep to the inspection schedule, and follow the Work at Height Regulations 2005 (or local equivalent) and the competent person on site. Wind rises with height: forecasts are for 10 m.',
]);
const MORTAR_ADVICE: readonly string[] = Object.freeze([
  'Cover new work at the end of each day and whenever work stops (NBS F10/185); rake out and relay any mortar damaged by frost. Follow the mortar manufacturer’s and the specifier’s guidance, and the site’s competent person.',
]);
const CONCRETE_ADVICE: readonly string[] = Object.freeze([
  'Cover fresh concrete against rain and frost; follow the concrete supplier’s and the specifier’s guidance on curing and protection, and the site’s competent person.',
]);
const GROUND_ADVICE: readonly string[] = Object.freeze([
  'Excavations: support or batter trench sides and inspect them at the start of each shift and after heavy rain, as a competent person and local regulations require.',
]);
const NO_ADVICE: readonly string[] = Object.freeze([]);

function adviceFor(a: Activity): readonly string[] {
  if (heightActivities.has(a)) return HEIGHT_ADVICE;
  if (mortarActivities.has(a)) return MORTAR_ADVICE;
  if (a === 'concrete') return CONCRETE_ADVICE;
  if (a === 'groundworks') return GROUND_ADVICE;
  return NO_ADVICE;
}

// Wind limits depend only on the settings object; build them once per settings object.
const windCache = new WeakMap<RuleSettings, Map<Activity, readonly WindLimit[]>>();
function windLimits(a: Activity, s: RuleSettings): readonly WindLimit[] {
  let m = windCache.get(s);
  if (m === undefined) {
    m = new Map();
    windCache.set(s, m);
  }
  let w = m.get(a);
  if (w === undefined) {
    w = windLimitsFor(a, s);
    m.set(a, w);
  }
  return w;
}

const RANK: Record<Verdict, number> = { go: 0, caution: 1, stop: 2 };

export function worseVerdict(a: Verdict, b: Verdict): Verdict {
  return RANK[b] > RANK[a] ? b : a;
}

function assessActivity(ctx: HourContext, activity: Activity, mortar: MortarKind | undefined, blocked: Uint8Array): ActivityAssessment {
  const s = ctx.settings;
  blocked.fill(0, ctx.i0, ctx.i1);
  const reasons: RuleReason[] = [];
  const notes: AssessmentNote[] = [];
  for (const w of windLimits(activity, s)) checkWind(ctx, w, blocked, reasons);
  if (mortarActivities.has(activity)) {
    const kind = mortar ?? 'cement';
    if (s.practice === 'uk') {
      checkUkMortarCold(ctx, kind, blocked, reasons);
      checkFrostProtection(ctx, reasons, notes);
      checkUkMortarHeat(ctx, reasons);
    } else {
      checkUsMortarCold(ctx, reasons, notes);
      checkUsMortarHeat(ctx, reasons);
    }
    checkRainOnFreshWork(ctx, blocked, reasons);
  } else if (activity === 'concrete') {
    checkConcreteFreezing(ctx, blocked, reasons);
    if (s.practice === 'uk') checkUkConcreteDischarge(ctx, reasons);
    checkConcreteColdWeather(ctx, reasons, notes);
    checkRainOnFreshWork(ctx, blocked, reasons);
  } else if (activity === 'groundworks') {
    checkHeavyRain(ctx, reasons);
  }

  let usable = 0;
  for (let i = ctx.i0; i < ctx.i1; i++) if (blocked[i] === 0) usable += ctx.overlap[i] as number;
  usable = Math.round(usable * 100) / 100;

  const missing = Math.round((ctx.windowHours - ctx.coveredHours) * 100) / 100;
  if (missing > 0) {
    reasons.push({
      ruleId: 'forecast.missing',
      verdict: 'caution',
      threshold: 0,
      unit: 'h',
      observed: missing,
      at: null,
      hours: missing,
      message: `${fmt(missing)} h of the working window has no forecast: those hours are not counted as usable.`,
      source: SOURCES.forecast,
    });
  }

  // The worst of the reasons: a stop rule that touches any working hour stops the activity for the day,
  // even when the hours it leaves would be enough to start (those are still reported as usable hours).
  let verdict: Verdict = 'go';
  for (const r of reasons) verdict = worseVerdict(verdict, r.verdict);
  const needed = Math.min(s.minUsableHours, ctx.windowHours);
  if (usable < needed || usable === 0) {
    verdict = 'stop';
    reasons.push({
      ruleId: 'day.usable-hours',
      verdict: 'stop',
      threshold: needed,
      unit: 'h',
      observed: usable,
      at: null,
      hours: 0,
      message: `Only ${fmt(usableHoursShown(usable))} usable h of ${fmt(ctx.windowHours)} in the working window, fewer than the ${fmt(needed)} h the firm needs to start.`,
      source: SOURCES.usableHours,
    });
  }
  const result: ActivityAssessment = { activity, verdict, usableHours: usable, reasons, notes, advice: adviceFor(activity) };
  if (mortarActivities.has(activity)) result.mortar = mortar ?? 'cement';
  return result;
}

/**
 * Go / caution / stop for each planned activity on one day at one site, with the usable
 * hours in the working window and the reasons behind each verdict. Pure: the caller passes
 * the forecast, window and thresholds.
 */
export function assessDay(input: AssessDayInput): DayAssessment {
  const settings = input.settings ?? (defaultRuleSettings as RuleSettings);
  const start = parseInstant(input.window.start, 'window.start');
  const end = parseInstant(input.window.end, 'window.end');
  if (!(end > start)) throw new RangeError(`the working window must end after it starts (${input.window.start} – ${input.window.end})`);
  if (input.activities.length === 0) throw new RangeError('plan at least one activity');
  const ctx = buildContext(input.forecast, start, end, settings);
  const blocked = blockedBuffer(input.forecast.length);
  const out: ActivityAssessment[] = [];
  let verdict: Verdict = 'go';
  for (const p of input.activities) {
    const activity = typeof p === 'string' ? p : p.activity;
    const mortar = typeof p === 'string' ? undefined : p.mortar;
    if (!activities.includes(activity)) throw new RangeError(`unknown activity ${JSON.stringify(activity)}`);
    const a = assessActivity(ctx, activity, mortar, blocked);
    verdict = worseVerdict(verdict, a.verdict);
    out.push(a);
  }
  return { verdict, windowHours: ctx.windowHours, activities: out, notes: dayNotes(out) };
}

function dayNotes(assessed: readonly ActivityAssessment[]): DayNote[] {
  const notes: DayNote[] = [];
  for (const a of assessed) {
    for (const n of a.notes) {
      const same = notes.find((d) => d.ruleId === n.ruleId && d.message === n.message);
      if (same) same.activities.push(a.activity);
      else notes.push({ ruleId: n.ruleId, message: n.message, source: n.source, uncovered: n.uncovered, activities: [a.activity] });
    }
  }
  return notes;
}
