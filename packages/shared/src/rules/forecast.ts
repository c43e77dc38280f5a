import { z } from 'zod';
import { parseInstant, type IsoInstant } from './dates.js';
import type { RuleSettings } from './settings.js';
import { SOURCES } from './sources.js';

/** One forecast hour at the site; it stands for the hour that starts at `time`. */
export interface ForecastHour {
  time: IsoInstant;
  tempC: number;
  /** Mean wind at 10 m. */
  windMeanMs: number;
  windGustMs: number;
  /** Precipitation amount in the hour. */
  precipMm: number;
  /** 0–1. */
  precipProbability: number;
}

export const forecastHourSchema = z.object({
  time: z.iso.datetime({ offset: true }),
  tempC: z.number().finite().min(-90).max(60),
  windMeanMs: z.number().finite().min(0).max(120),
  windGustMs: z.number().finite().min(0).max(150),
  precipMm: z.number().finite().min(0).max(500),
  precipProbability: z.number().finite().min(0).max(1),
});

export type Verdict = 'go' | 'caution' | 'stop';
export type ReasonUnit = 'm/s' | '°C' | 'mm/h' | 'h';

export interface RuleReason {
  /** Stable id, e.g. `wind.mewp.gust`; the UI keys its text and help on it. */
  ruleId: string;
  verdict: Exclude<Verdict, 'go'>;
  threshold: number;
  unit: ReasonUnit;
  /** The worst value seen (highest wind or rain, lowest temperature…). */
  observed: number;
  /** Start of the forecast hour where `observed` was seen. */
  at: IsoInstant | null;
  /** Working-window hours the rule touched (0 for look-ahead rules). */
  hours: number;
  message: string;
  source: string;
  /**
   * On every wind reason: the Beaufort force of the forecast mean wind at 10 m in the `at` hour. The scale
   * describes mean wind, so a gust or a height-scaled figure never sets it; the message quotes the gust.
   */
  beaufort?: { force: number; name: string };
  /** On a look-ahead reason about the forecast's reach: the spans of the period, before `forecastHorizon`, no forecast hour covers. */
  uncovered?: ForecastGap[];
}

/** A span with no forecast, [from, to). */
export interface ForecastGap {
  from: IsoInstant;
  to: IsoInstant;
}

/**
 * Something the office should know that does not change the verdict: the part of a look-ahead rule's
 * period that lies past the forecast the rules are given (`uncovered`, after `forecastHorizon`).
 */
export interface AssessmentNote {
  /** The look-ahead rule's id, the same as the caution it gives for hours missing before the horizon. */
  ruleId: string;
  message: string;
  source: string;
  uncovered: ForecastGap[];
}

export const HOUR = 3_600_000;

/**
 * The forecast the rules are written for: the assessed day and the next 48 h (`AssessDayInput.forecast`).
 * Look-ahead rules count it from the end of the working window, the latest instant the day is known to
 * reach without the site's time zone: hours missing before then are a gap in the data (a caution), the
 * part of their period after it is beyond what such a forecast reaches (a note).
 */
export const FORECAST_HOURS_AFTER_DAY = 48;

/** Epoch ms where the standard input ends for this assessment: `FORECAST_HOURS_AFTER_DAY` after the window. */
export function forecastHorizon(ctx: HourContext): number {
  return ctx.windowEnd + FORECAST_HOURS_AFTER_DAY * HOUR;
}

/** The forecast read once per assessment; every rule family works from this. */
export interface HourContext {
  forecast: readonly ForecastHour[];
  /** Epoch ms per hour, parsed on first use (NaN until then). */
  times: Float64Array;
  /** Hours overlapping the window: indexes i0 ≤ i < i1. */
  i0: number;
  i1: number;
  /** Window hours each forecast hour covers (0 outside the window). */
  overlap: Float64Array;
  windowStart: number;
  windowEnd: number;
  windowHours: number;
  coveredHours: number;
  settings: RuleSettings;
}

// Scratch buffers reused between calls: assessDay is synchronous and never hands them out,
// and not allocating three typed arrays per job-day keeps the collector quiet on big boards.
let scratchTimes = new Float64Array(256);
let scratchOverlap = new Float64Array(256);
let scratchBlocked = new Uint8Array(256);

export function blockedBuffer(n: number): Uint8Array {
  if (scratchBlocked.length < n) scratchBlocked = new Uint8Array(n * 2);
  return scratchBlocked;
}

export function timeAt(ctx: HourContext, i: number): number {
  let t = ctx.times[i] as number;
  if (t !== t) {
    const h = ctx.forecast[i] as ForecastHour;
    try {
      t = parseInstant(h.time, 'time');
    } catch (e) {
      throw new RangeError(`forecast[${i}]: ${e instanceof Error ? e.message : String(e)}`);
    }
    ctx.times[i] = t;
  }
  return t;
}

/**
 * First index ≥ `from` whose hour starts at or after `ms`. The forecast is in time order and
 * nearly always hourly, so try the index an hourly series would give before bisecting:
 * that reads three times instead of seven.
 */
export function indexAtOrAfter(ctx: HourContext, ms: number, from = 0): number {
  const n = ctx.forecast.length;
  if (from >= n) return n;
  const t0 = timeAt(ctx, from);
  if (t0 >= ms) return from;
  if (timeAt(ctx, n - 1) < ms) return n;
  let lo = from + 1;
  let hi = n - 1;
  const guess = from + Math.ceil((ms - t0) / HOUR);
  if (guess > from && guess < n) {
    if (timeAt(ctx, guess) >= ms) {
      if (timeAt(ctx, guess - 1) < ms) return guess;
      hi = guess - 1;
    } else lo = guess + 1;
  }
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (timeAt(ctx, mid) < ms) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** The hour a temperature rule hit hardest, and the window hours it touched. */
export interface TempExtreme {
  tempC: number;
  /** Index of that hour in the forecast. */
  at: number;
  hours: number;
}

/**
 * Scans the window's hours for those `hits` picks, returning the coldest (or, with `hottest`, the warmest) and the
 * window hours they cover; with `blocked`, marks each hit hour as unusable. Null when no hour hits.
 */
export function windowExtreme(
  ctx: HourContext, hits: (tempC: number, i: number) => boolean, options: { hottest?: boolean; blocked?: Uint8Array } = {},
): TempExtreme | null {
  const f = ctx.forecast;
  const sign = options.hottest ? -1 : 1;
  let best = Infinity;
  let at = -1;
  let hours = 0;
  for (let i = ctx.i0; i < ctx.i1; i++) {
    const t = (f[i] as ForecastHour).tempC;
    if (!hits(t, i)) continue;
    if (options.blocked) options.blocked[i] = 1;
    hours += ctx.overlap[i] as number;
    if (sign * t < best) {
      best = sign * t;
      at = i;
    }
  }
  return at < 0 ? null : { tempC: sign * best, at, hours };
}

/** The coldest hour at or below `atOrBelowC` from the window's start until `untilMs`, for look-ahead rules. */
export function coldestAhead(ctx: HourContext, untilMs: number, atOrBelowC: number): { tempC: number; at: number; stop: number } | null {
  if (ctx.i1 <= ctx.i0) return null;
  const f = ctx.forecast;
  const stop = indexAtOrAfter(ctx, untilMs, ctx.i0);
  let coldest = Infinity;
  let at = -1;
  for (let i = ctx.i0; i < stop; i++) {
    const t = tempAt(f, i);
    if (t <= atOrBelowC && t < coldest) {
      coldest = t;
      at = i;
    }
  }
  return at < 0 ? null : { tempC: coldest, at, stop };
}

/** How much of a look-ahead period the forecast covers, with the spans (epoch ms, [from, to)) it does not. */
export interface LookAheadCover {
  periodHours: number;
  coveredHours: number;
  gaps: Array<[number, number]>;
}

/**
 * The part of [window start, `untilMs`) that no forecast hour covers (each hour stands for the hour
 * from its `time`, cut short by the next reading); null when the forecast covers all of it.
 * Look-ahead rules use it to say how far they could see instead of passing over missing hours.
 */
export function lookAheadCover(ctx: HourContext, untilMs: number): LookAheadCover | null {
  const from = ctx.windowStart;
  if (!(untilMs > from)) return null;
  const n = ctx.forecast.length;
  const periodHours = (untilMs - from) / HOUR;
  const first = ctx.i1 > ctx.i0 ? ctx.i0 : indexAtOrAfter(ctx, from - HOUR + 1);
  const stop = indexAtOrAfter(ctx, untilMs, first);
  if (stop <= first) return { periodHours, coveredHours: 0, gaps: [[from, untilMs]] };
  const t0 = timeAt(ctx, first);
  const last = timeAt(ctx, stop - 1);
  // Forecasts are hourly: a run whose first and last hours are as far apart as its count says is
  // taken as gap-free, so only its end needs reading (two lookups in the common case). Anything
  // else is walked hour by hour.
  if (t0 <= from && last - t0 === (stop - 1 - first) * HOUR) {
    const end = last + HOUR;
    if (end >= untilMs) return null;
    return { periodHours, coveredHours: (end - from) / HOUR, gaps: [[end, untilMs]] };
  }
  const gaps: Array<[number, number]> = [];
  let covered = 0;
  let cursor = from;
  for (let i = first; i < stop; i++) {
    const t = timeAt(ctx, i);
    const next = i + 1 < n ? Math.min(t + HOUR, timeAt(ctx, i + 1)) : t + HOUR;
    const a = Math.max(t, cursor);
    const b = Math.min(next, untilMs);
    if (b <= a) continue;
    if (a > cursor) gaps.push([cursor, a]);
    covered += b - a;
    cursor = b;
  }
  if (cursor < untilMs) gaps.push([cursor, untilMs]);
  return gaps.length === 0 ? null : { periodHours, coveredHours: covered / HOUR, gaps };
}

const utcText = (iso: IsoInstant): string => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
const utcMs = (ms: number): string => utcText(new Date(ms).toISOString());
const hoursText = (h: number): string => String(Math.round(h * 100) / 100);
const daysText = (h: number): string => {
  const days = Math.floor(h / 24 + 1e-9);
  const rest = Math.round((h - days * 24) * 100) / 100;
  const d = days === 0 ? '' : `${days} day${days === 1 ? '' : 's'}`;
  return rest === 0 ? d || '0 h' : `${d}${d ? ' ' : ''}${hoursText(rest)} h`;
};

/** What a look-ahead rule says about the part of its period the forecast does not cover. */
export interface LookAheadSpec {
  ruleId: string;
  /** For the caution text, e.g. "frost-protection period (6 days) from the start of work". */
  period: string;
  /** For the note, e.g. "frost-protection rule". */
  rule: string;
  /** Count the period in days in the note ("2 days 16 h of the 6 days"), not hours. */
  inDays: boolean;
  /** For the caution: what missing hours could hide, and what to do. */
  risk: string;
  defer: string;
}

/**
 * Splits the spans a look-ahead rule could not see at the standard input's horizon (`forecastHorizon`).
 * Hours missing before it are a gap in the data the rules are given: a `forecast.reach.*` caution.
 * The part of the period after it is one no forecast of the standard length reaches: a note that does
 * not change the verdict, since the forecast is read again as it extends.
 */
export function reportLookAheadCover(
  ctx: HourContext, cover: LookAheadCover, spec: LookAheadSpec, out: RuleReason[], notes: AssessmentNote[],
): void {
  const horizon = forecastHorizon(ctx);
  const start = ctx.windowStart;
  const inside: ForecastGap[] = [];
  const beyond: ForecastGap[] = [];
  const insideSpans: string[] = [];
  const beyondSpans: string[] = [];
  let missingInside = 0;
  for (const [a, b] of cover.gaps) {
    if (a < horizon) {
      const e = Math.min(b, horizon);
      const g = { from: new Date(a).toISOString(), to: new Date(e).toISOString() };
      inside.push(g);
      missingInside += e - a;
      insideSpans.push(`${hoursText((a - start) / HOUR)}–${hoursText((e - start) / HOUR)} h after the working window starts (${utcText(g.from)} to ${utcText(g.to)})`);
    }
    if (b > horizon) {
      const s = Math.max(a, horizon);
      beyond.push({ from: new Date(s).toISOString(), to: new Date(b).toISOString() });
      beyondSpans.push(`${utcMs(s)} to ${utcMs(b)}`);
    }
  }
  if (inside.length > 0) {
    const insideHours = (Math.min(horizon, start + cover.periodHours * HOUR) - start) / HOUR;
    const covered = Math.round((insideHours - missingInside / HOUR) * 100) / 100;
    const part = insideHours < cover.periodHours
      ? `the first ${hoursText(insideHours)} h of the ${hoursText(cover.periodHours)} h ${spec.period}, as far as the forecast should reach (${FORECAST_HOURS_AFTER_DAY} h after the working window ends)`
      : `the ${hoursText(cover.periodHours)} h ${spec.period}`;
    out.push({
      ruleId: spec.ruleId,
      verdict: 'caution',
      threshold: insideHours,
      unit: 'h',
      observed: covered,
      at: null,
      hours: 0,
      message: `The forecast covers only ${hoursText(covered)} h of ${part}: no forecast for ${insideSpans.join('; ')}. ${spec.risk} ${spec.defer}`,
      source: SOURCES.forecastReach,
      uncovered: inside,
    });
  }
  if (beyond.length > 0) {
    const amount = spec.inDays ? daysText : (h: number) => `${hoursText(h)} h`;
    notes.push({
      ruleId: spec.ruleId,
      message: `The forecast reaches ${amount(cover.coveredHours)} of the ${amount(cover.periodHours)} the ${spec.rule} looks ahead (none yet for ${beyondSpans.join('; ')}); check it again nearer the day.`,
      source: SOURCES.forecastBeyond,
      uncovered: beyond,
    });
  }
}

/** A temperature reason at the hour `extreme` names. */
export function tempReason(
  ctx: HourContext, extreme: { tempC: number; at: number; hours?: number }, reason: Pick<RuleReason, 'ruleId' | 'verdict' | 'threshold' | 'message' | 'source'>,
): RuleReason {
  // Spelled out rather than spread: this runs for every reason of every job-day, and a spread copies by iteration.
  return {
    ruleId: reason.ruleId,
    verdict: reason.verdict,
    threshold: reason.threshold,
    unit: '°C',
    observed: extreme.tempC,
    at: (ctx.forecast[extreme.at] as ForecastHour).time,
    hours: extreme.hours ?? 0,
    message: reason.message,
    source: reason.source,
  };
}

/** A look-ahead rule's temperature, checked because a NaN would pass every comparison. */
export function tempAt(f: readonly ForecastHour[], i: number): number {
  const t = (f[i] as ForecastHour).tempC;
  if (!Number.isFinite(t)) throw new RangeError(`forecast[${i}] has a missing or non-numeric tempC`);
  return t;
}

/**
 * Reads the hours the window touches, checking their order and values. Hours outside the
 * window are parsed only when a look-ahead rule needs them, so their order is the caller's
 * contract (the API checks it with `assessDayInputSchema`).
 */
export function buildContext(
  forecast: readonly ForecastHour[],
  windowStart: number,
  windowEnd: number,
  settings: RuleSettings,
): HourContext {
  const n = forecast.length;
  if (scratchTimes.length < n) {
    scratchTimes = new Float64Array(n * 2);
    scratchOverlap = new Float64Array(n * 2);
  }
  const times = scratchTimes;
  const overlap = scratchOverlap;
  times.fill(Number.NaN, 0, n);
  const ctx: HourContext = {
    forecast,
    times,
    i0: 0,
    i1: 0,
    overlap,
    windowStart,
    windowEnd,
    windowHours: (windowEnd - windowStart) / HOUR,
    coveredHours: 0,
    settings,
  };
  // The first hour that could reach into the window starts less than an hour before it.
  let i = indexAtOrAfter(ctx, windowStart - HOUR + 1);
  let first = -1;
  let covered = 0;
  let prev = i > 0 ? timeAt(ctx, i - 1) : -Infinity;
  for (; i < n; i++) {
    const t = timeAt(ctx, i);
    if (t <= prev) throw new RangeError(`forecast must be in time order without repeats: forecast[${i}] at ${(forecast[i] as ForecastHour).time}`);
    prev = t;
    if (t >= windowEnd) break;
    const h = forecast[i] as ForecastHour;
    if (
      !Number.isFinite(h.tempC) || !Number.isFinite(h.windMeanMs) || !Number.isFinite(h.windGustMs) ||
      !Number.isFinite(h.precipMm) || !Number.isFinite(h.precipProbability)
    ) {
      throw new RangeError(`forecast[${i}] at ${h.time} has a missing or non-numeric value`);
    }
    // An hour ends at the next reading if that comes sooner, so uneven data never double-counts.
    const next = i + 1 < n ? Math.min(t + HOUR, timeAt(ctx, i + 1)) : t + HOUR;
    const ov = (Math.min(next, windowEnd) - Math.max(t, windowStart)) / HOUR;
    overlap[i] = ov > 0 ? ov : 0;
    if (ov > 0) {
      covered += ov;
      if (first < 0) first = i;
    }
  }
  ctx.i0 = first < 0 ? i : first;
  ctx.i1 = i;
  ctx.coveredHours = covered;
  return ctx;
}


export function fmt(n: number, dp = 1): string {
  const s = n.toFixed(dp);
  return s === '-0.0' || s === '-0' ? s.slice(1) : s;
}
