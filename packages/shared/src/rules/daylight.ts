import * as SunCalc from 'suncalc';
import { civilFromDays, parseIsoDate, toIsoInstant, zonedTimeToInstant, type IsoDate, type IsoInstant } from './dates.js';

export interface DaylightTimes {
  date: IsoDate;
  /** Upper limb on the horizon with standard refraction (sun centre 0.833° below). */
  sunrise: IsoInstant | null;
  sunset: IsoInstant | null;
  /** Civil twilight: sun centre 6° below the horizon. */
  civilDawn: IsoInstant | null;
  civilDusk: IsoInstant | null;
  solarNoon: IsoInstant;
  /** Sunrise to sunset, hours; 24 in polar day, 0 in polar night. */
  daylightHours: number;
  polar: 'day' | 'night' | null;
}

function iso(d: Date | null | undefined): IsoInstant | null {
  return d instanceof Date && !Number.isNaN(d.getTime()) ? d.toISOString() : null;
}

/** Sunrise, sunset and civil twilight for a site on a local date (instants, UTC). */
export function daylight(date: IsoDate, lat: number, lon: number): DaylightTimes {
  if (!Number.isFinite(lat) || lat < -90 || lat > 90) throw new RangeError(`latitude must be between -90 and 90, got ${lat}`);
  if (!Number.isFinite(lon) || lon < -180 || lon > 180) throw new RangeError(`longitude must be between -180 and 180, got ${lon}`);
  const { year, month, day } = civilFromDays(parseIsoDate(date));
  // suncalc answers for the solar day containing the instant given; local mean noon
  // at the site's longitude picks the right one whatever the site's clock zone.
  const noon = new Date(Date.UTC(year, month - 1, day, 12) - (lon / 15) * 3_600_000);
  const t = SunCalc.getTimes(noon, lat, lon);
  const sunrise = iso(t.sunrise);
  const sunset = iso(t.sunset);
  const polar = t.alwaysUp === true ? 'day' : t.alwaysDown === true ? 'night' : null;
  let daylightHours = polar === 'day' ? 24 : 0;
  if (t.sunrise instanceof Date && t.sunset instanceof Date) daylightHours = (t.sunset.getTime() - t.sunrise.getTime()) / 3_600_000;
  return {
    date,
    sunrise,
    sunset,
    civilDawn: iso(t.dawn),
    civilDusk: iso(t.dusk),
    solarNoon: t.solarNoon.toISOString(),
    daylightHours,
    polar,
  };
}

export interface WorkingHours {
  /** Wall-clock `HH:MM` in the site's zone. */
  start: string;
  end: string;
}

export interface WorkingWindow {
  start: IsoInstant;
  end: IsoInstant;
  hours: number;
}

export type DaylightLimit = 'sunrise-sunset' | 'civil-twilight' | 'none';

/**
 * The day's working window: the firm's hours on that date (clock changes included),
 * cut to daylight so the window shrinks in winter. `null` when no daylight is left.
 */
export function workingWindow(
  date: IsoDate,
  hours: WorkingHours,
  timeZone: string,
  light?: { times: DaylightTimes; limit?: DaylightLimit },
): WorkingWindow | null {
  let start = zonedTimeToInstant(date, hours.start, timeZone);
  let end = zonedTimeToInstant(date, hours.end, timeZone);
  if (end <= start) throw new RangeError(`working hours must end after they start (${hours.start}–${hours.end})`);
  const limit = light?.limit ?? 'sunrise-sunset';
  if (light !== undefined && limit !== 'none') {
    const t = light.times;
    if (t.polar === 'night') return null;
    const from = limit === 'civil-twilight' ? t.civilDawn : t.sunrise;
    const to = limit === 'civil-twilight' ? t.civilDusk : t.sunset;
    if (from !== null) start = Math.max(start, Date.parse(from));
    if (to !== null) end = Math.min(end, Date.parse(to));
  }
  if (end <= start) return null;
  return { start: toIsoInstant(start), end: toIsoInstant(end), hours: (end - start) / 3_600_000 };
}
