import { TZDate } from '@date-fns/tz';

/** A plain calendar date, `YYYY-MM-DD`, read in the calendar's own time zone. */
export type IsoDate = string;
/** An instant with an explicit offset or `Z`, e.g. `2026-03-02T08:00:00Z`. */
export type IsoInstant = string;

const DAY_MS = 86_400_000;

// Day numbers (days since 1970-01-01) keep working-day arithmetic in integers, so the
// clock change can never shift a date: a date is not an instant.
// Civil-from-days / days-from-civil after H. Hinnant, "chrono-Compatible Low-Level Date Algorithms".
export function daysFromCivil(y: number, m: number, d: number): number {
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const mp = m > 2 ? m - 3 : m + 9;
  const doy = (((153 * mp + 2) / 5) | 0) + d - 1;
  const doe = yoe * 365 + ((yoe / 4) | 0) - ((yoe / 100) | 0) + doy;
  return era * 146_097 + doe - 719_468;
}

export function civilFromDays(z: number): { year: number; month: number; day: number } {
  const zz = z + 719_468;
  const era = Math.floor(zz / 146_097);
  const doe = zz - era * 146_097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36_524) - Math.floor(doe / 146_096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: yoe + era * 400 + (month <= 2 ? 1 : 0), month, day };
}

export function yearOfDay(z: number): number {
  return civilFromDays(z).year;
}

const PAD2: readonly string[] = Array.from({ length: 32 }, (_, i) => (i < 10 ? `0${i}` : String(i)));

// Boards format the same few thousand dates over and over: keep each string once.
const FORMAT_BASE = daysFromCivil(1900, 1, 1);
const FORMAT_SPAN = daysFromCivil(2200, 1, 1) - FORMAT_BASE;
const formatted: (string | undefined)[] = new Array<string | undefined>(FORMAT_SPAN);

function formatUncached(z: number): IsoDate {
  const { year, month, day } = civilFromDays(z);
  const y = year >= 1000 && year <= 9999 ? String(year) : String(year).padStart(4, '0');
  return `${y}-${PAD2[month]}-${PAD2[day]}`;
}

export function formatDayNumber(z: number): IsoDate {
  const k = z - FORMAT_BASE;
  if (k < 0 || k >= FORMAT_SPAN) return formatUncached(z);
  let s = formatted[k];
  if (s === undefined) {
    s = formatUncached(z);
    formatted[k] = s;
  }
  return s;
}

/** Parses `YYYY-MM-DD` to a day number; throws a RangeError naming the bad value. */
export function parseIsoDate(date: IsoDate, label = 'date'): number {
  if (typeof date !== 'string' || date.length !== 10 || date.charCodeAt(4) !== 45 || date.charCodeAt(7) !== 45) {
    throw new RangeError(`${label} must be a date as YYYY-MM-DD, got ${JSON.stringify(date)}`);
  }
  const y = digits(date, 0, 4);
  const mo = digits(date, 5, 2);
  const d = digits(date, 8, 2);
  if (y < 0 || mo < 0 || d < 0) throw new RangeError(`${label} must be a date as YYYY-MM-DD, got ${JSON.stringify(date)}`);
  if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo)) {
    throw new RangeError(`${label} is not a real calendar date: ${JSON.stringify(date)}`);
  }
  return daysFromCivil(y, mo, d);
}

const MONTH_DAYS = [0, 31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31] as const;

export function daysInMonth(year: number, month: number): number {
  if (month === 2 && ((year % 4 === 0 && year % 100 !== 0) || year % 400 === 0)) return 29;
  return MONTH_DAYS[month] ?? 0;
}

export function isIsoDate(value: string): boolean {
  try {
    parseIsoDate(value);
    return true;
  } catch {
    return false;
  }
}

/** ISO weekday of a day number: 1 = Monday … 7 = Sunday (1970-01-01 was a Thursday). */
export function isoWeekdayOfDay(z: number): number {
  return ((((z + 3) % 7) + 7) % 7) + 1;
}

export function isoWeekday(date: IsoDate): number {
  return isoWeekdayOfDay(parseIsoDate(date));
}

export function addDays(date: IsoDate, n: number): IsoDate {
  return formatDayNumber(parseIsoDate(date) + n);
}

/** Whole calendar days from `a` to `b` (negative when `b` is earlier). */
export function daysBetween(a: IsoDate, b: IsoDate): number {
  return parseIsoDate(b, 'b') - parseIsoDate(a, 'a');
}

const D0 = 48;
function digits(s: string, from: number, count: number): number {
  let v = 0;
  for (let i = from; i < from + count; i++) {
    const c = s.charCodeAt(i) - D0;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

/**
 * Parses an ISO 8601 instant to epoch milliseconds. The common shapes
 * (`YYYY-MM-DDTHH:MM[:SS[.fff]](Z|±HH:MM)`) are read by hand because `Date.parse`
 * costs about 300 ns a call here and a job-day reads ~72 hourly times.
 * Anything else falls back to `Date.parse`. Strings without an offset are refused:
 * a local time is ambiguous without its zone.
 */
export function parseInstant(s: IsoInstant, label = 'time'): number {
  const n = s.length;
  if (n >= 17 && s.charCodeAt(4) === 45 && s.charCodeAt(7) === 45 && s.charCodeAt(10) === 84 && s.charCodeAt(13) === 58) {
    const y = d2(s, 0) * 100 + d2(s, 2);
    const mo = d2(s, 5);
    const d = d2(s, 8);
    const h = d2(s, 11);
    const mi = d2(s, 14);
    let i = 16;
    let sec = 0;
    let ms = 0;
    if (s.charCodeAt(16) === 58) {
      sec = d2(s, 17);
      i = 19;
      if (s.charCodeAt(19) === 46) {
        i = 20;
        let scale = 100;
        for (; i < n; i++) {
          const c = s.charCodeAt(i) - 48;
          if (c < 0 || c > 9) break;
          ms += c * scale;
          scale = (scale / 10) | 0;
        }
      }
    }
    let offsetMin = -100_000;
    const c = s.charCodeAt(i);
    if (c === 90) {
      if (i === n - 1) offsetMin = 0;
    } else if ((c === 43 || c === 45) && i + 6 === n && s.charCodeAt(i + 3) === 58) {
      const oh = d2(s, i + 1);
      const om = d2(s, i + 4);
      if (oh >= 0 && om >= 0) offsetMin = (c === 43 ? 1 : -1) * (oh * 60 + om);
    }
    if (
      offsetMin !== -100_000 && y >= 0 && mo >= 1 && mo <= 12 && d >= 1 && d <= 31 && h >= 0 && h <= 24 &&
      mi >= 0 && mi <= 59 && sec >= 0 && sec <= 60
    ) {
      return (daysFromCivil(y, mo, d) * 24 + h) * 3_600_000 + mi * 60_000 + sec * 1000 + ms - offsetMin * 60_000;
    }
  }
  if (!/(Z|[+-]\d{2}:?\d{2})$/.test(s)) {
    throw new RangeError(`${label} must be an ISO 8601 instant with an offset or Z, got ${JSON.stringify(s)}`);
  }
  const t = Date.parse(s);
  if (Number.isNaN(t)) throw new RangeError(`${label} is not a valid ISO 8601 instant: ${JSON.stringify(s)}`);
  return t;
}

/** Two ASCII digits at `i`, or a large negative number if either is not a digit. */
function d2(s: string, i: number): number {
  const a = s.charCodeAt(i) - 48;
  const b = s.charCodeAt(i + 1) - 48;
  return a >= 0 && a <= 9 && b >= 0 && b <= 9 ? a * 10 + b : -10_000;
}

export function toIsoInstant(ms: number): IsoInstant {
  return new Date(ms).toISOString();
}

const dateFormatters = new Map<string, Intl.DateTimeFormat>();
function dateFormatter(timeZone: string): Intl.DateTimeFormat {
  let f = dateFormatters.get(timeZone);
  if (f === undefined) {
    f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    dateFormatters.set(timeZone, f);
  }
  return f;
}

/** The calendar date an instant falls on in `timeZone`. */
export function localDateOf(instant: IsoInstant | number, timeZone: string): IsoDate {
  const ms = typeof instant === 'number' ? instant : parseInstant(instant);
  const parts = dateFormatter(timeZone).formatToParts(new Date(ms));
  let y = '';
  let m = '';
  let d = '';
  for (const p of parts) {
    if (p.type === 'year') y = p.value;
    else if (p.type === 'month') m = p.value;
    else if (p.type === 'day') d = p.value;
  }
  return `${y}-${m}-${d}`;
}

export function isValidTimeZone(timeZone: string): boolean {
  try {
    dateFormatter(timeZone);
    return true;
  } catch {
    return false;
  }
}

const HH_MM = /^([01]\d|2[0-3]):([0-5]\d)$/;

/** The instant of wall-clock `HH:MM` on `date` in `timeZone` (DST-aware). */
export function zonedTimeToInstant(date: IsoDate, hhmm: string, timeZone: string): number {
  const m = HH_MM.exec(hhmm);
  if (m === null) throw new RangeError(`time of day must be HH:MM (24-hour), got ${JSON.stringify(hhmm)}`);
  const { year, month, day } = civilFromDays(parseIsoDate(date));
  return new TZDate(year, month - 1, day, Number(m[1]), Number(m[2]), 0, 0, timeZone).getTime();
}

export const MS_PER_DAY = DAY_MS;
export const MS_PER_HOUR = 3_600_000;

const WEEKDAY_NAMES = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'] as const;
const MONTH_NAMES = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'] as const;

/**
 * A calendar date as people read it in a message, e.g. "Wed 26 May": the words the web app's date-fns "EEE d MMM"
 * gives, from the date's own day number, so no time zone can shift it and no formatting library is needed here.
 */
export function shortDayLabel(date: IsoDate): string {
  const z = parseIsoDate(date);
  const { month, day } = civilFromDays(z);
  return `${WEEKDAY_NAMES[isoWeekdayOfDay(z) - 1]} ${day} ${MONTH_NAMES[month - 1]}`;
}

/** A run of dates as "Mon 30 Nov to Thu 3 Dec", or one day's label when it starts and ends on the same day. */
export function dayRangeLabel(first: IsoDate, last: IsoDate): string {
  return first === last ? shortDayLabel(first) : `${shortDayLabel(first)} to ${shortDayLabel(last)}`;
}
