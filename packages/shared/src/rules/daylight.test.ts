import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { daylight, workingWindow } from './daylight.js';

const LONDON = { lat: 51.5074, lon: -0.1278 };
const londonClock = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/London', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });

function minutesOfDay(iso: string | null): number {
  if (iso === null) throw new Error('expected a time');
  const [h, m] = londonClock.format(new Date(iso)).split(':').map(Number);
  return (h as number) * 60 + (m as number);
}
const hm = (s: string): number => Number(s.slice(0, 2)) * 60 + Number(s.slice(3, 5));

/**
 * Sunrise, sunset and civil twilight from astronomy-engine, an ephemeris written apart from suncalc:
 * rise and set with standard refraction and the Sun's apparent radius, twilight at the centre 6° down.
 * Searched from local mean midnight at the site's longitude, so each falls on that local date.
 */
function reference(date: string, lat: number, lon: number) {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  const from = new Date(Date.UTC(y, m - 1, d) - (lon / 15) * 3_600_000);
  const site = new Astronomy.Observer(lat, lon, 0);
  const at = (t: Astronomy.AstroTime | null): number => {
    if (t === null) throw new Error(`no event on ${date} at ${lat}, ${lon}`);
    return t.date.getTime();
  };
  return {
    sunrise: at(Astronomy.SearchRiseSet(Astronomy.Body.Sun, site, +1, from, 1)),
    sunset: at(Astronomy.SearchRiseSet(Astronomy.Body.Sun, site, -1, from, 1)),
    civilDawn: at(Astronomy.SearchAltitude(Astronomy.Body.Sun, site, +1, from, 1, -6)),
    civilDusk: at(Astronomy.SearchAltitude(Astronomy.Body.Sun, site, -1, from, 1, -6)),
  };
}
const minutesApart = (iso: string | null, ms: number): number => {
  if (iso === null) throw new Error('expected a time');
  return Math.abs(Date.parse(iso) - ms) / 60_000;
};

const PLACES = [
  ['London', 51.5074, -0.1278],
  ['Penzance', 50.1188, -5.5376],
  ['Edinburgh', 55.9533, -3.1883],
  ['Lerwick', 60.1546, -1.1494],
  ['New York', 40.7128, -74.006],
  ['Denver', 39.7392, -104.9903],
] as const;
// Equinoxes, solstices, both UK clock changes and a January day.
const DATES = ['2026-03-20', '2026-03-29', '2026-06-21', '2026-09-23', '2026-10-25', '2026-12-21', '2027-01-15'];

describe('daylight', () => {
  it.each(PLACES.flatMap(([name, lat, lon]) => DATES.map((date) => [name, date, lat, lon] as const)))(
    'agrees with astronomy-engine within a minute in %s on %s',
    (_name, date, lat, lon) => {
      // Source: astronomy-engine 2.1.19 (npm), SearchRiseSet (refraction and solar radius) and SearchAltitude −6° (civil twilight);
      // its own method, not suncalc's. ±1 min: the published tables below give whole minutes.
      const t = daylight(date, lat, lon);
      const ref = reference(date, lat, lon);
      expect(minutesApart(t.sunrise, ref.sunrise)).toBeLessThanOrEqual(1);
      expect(minutesApart(t.sunset, ref.sunset)).toBeLessThanOrEqual(1);
      expect(minutesApart(t.civilDawn, ref.civilDawn)).toBeLessThanOrEqual(1);
      expect(minutesApart(t.civilDusk, ref.civilDusk)).toBeLessThanOrEqual(1);
      expect(Math.abs(t.daylightHours - (ref.sunset - ref.sunrise) / 3_600_000) * 60).toBeLessThanOrEqual(1);
    },
  );

  // Dated newspaper tables, to the minute, for an unstated point in London, so ±2 min.
  it.each([
    ['2018-12-21', '08:04', '15:53'], // Source: inews.co.uk, UK sunrise and sunset, Friday 21 December (2018): London 8.04am/3.53pm
    ['2018-12-22', '08:04', '15:54'], // Source: inews.co.uk, Saturday 22 December (2018): London 8.04am/3.54pm
    ['2021-11-25', '07:35', '15:59'], // Source: inews.co.uk, Thursday 25 November (2021): London 7.35am/3.59pm
    ['2021-11-30', '07:42', '15:55'], // Source: inews.co.uk, Tuesday 30 November (2021): London 7.42am/3.55pm
  ])('gives London sunrise and sunset on %s within 2 min of the published %s / %s', (date, rise, set) => {
    const t = daylight(date, LONDON.lat, LONDON.lon);
    expect(Math.abs(minutesOfDay(t.sunrise) - hm(rise))).toBeLessThanOrEqual(2);
    expect(Math.abs(minutesOfDay(t.sunset) - hm(set))).toBeLessThanOrEqual(2);
  });

  it('puts civil dawn before sunrise and civil dusk after sunset', () => {
    // Source: suncalc README — dawn/dusk at −6°, sunrise/sunset at −0.833°
    const t = daylight('2026-03-02', LONDON.lat, LONDON.lon);
    expect(Date.parse(t.civilDawn as string)).toBeLessThan(Date.parse(t.sunrise as string));
    expect(Date.parse(t.civilDusk as string)).toBeGreaterThan(Date.parse(t.sunset as string));
  });

  it('reports polar night and polar day instead of inventing times', () => {
    // Source: Svalbard (78° N) has polar night at the December solstice and midnight sun at the June one — from memory
    expect(daylight('2026-12-21', 78.22, 15.65).polar).toBe('night');
    expect(daylight('2026-06-21', 78.22, 15.65).daylightHours).toBe(24);
  });

  it('refuses coordinates off the globe', () => {
    // Source: Hodboard rule — latitude −90…90, longitude −180…180
    expect(() => daylight('2026-03-02', 91, 0)).toThrow(/latitude/);
    expect(() => daylight('2026-03-02', 51, 181)).toThrow(/longitude/);
  });
});

describe('workingWindow', () => {
  const hours = { start: '07:30', end: '17:00' };

  it('cuts the firm’s hours to daylight in midwinter', () => {
    // Source: common practice, no source — no outdoor work in the dark; the cut is sunrise–sunset by default
    const light = daylight('2026-12-21', LONDON.lat, LONDON.lon);
    const w = workingWindow('2026-12-21', hours, 'Europe/London', { times: light });
    expect(w?.start).toBe(light.sunrise);
    expect(w?.end).toBe(light.sunset);
    expect(w?.hours).toBeLessThan(8);
  });

  it.each([
    ['London', '2026-12-21', 51.5074, -0.1278],
    ['Edinburgh', '2026-12-21', 55.9533, -3.1883],
    ['Lerwick', '2027-01-15', 60.1546, -1.1494],
  ] as const)('cuts a %s winter day on %s to within a minute of astronomy-engine’s sunrise and sunset', (_name, date, lat, lon) => {
    // Source: astronomy-engine 2.1.19 (npm), SearchRiseSet with refraction and solar radius, apart from suncalc; 07:30–17:00 GMT spans both
    const w = workingWindow(date, hours, 'Europe/London', { times: daylight(date, lat, lon) });
    const ref = reference(date, lat, lon);
    if (w === null) throw new Error('expected a window');
    expect(minutesApart(w.start, ref.sunrise)).toBeLessThanOrEqual(1);
    expect(minutesApart(w.end, ref.sunset)).toBeLessThanOrEqual(1);
    expect(Math.abs(w.hours - (ref.sunset - ref.sunrise) / 3_600_000) * 60).toBeLessThanOrEqual(2);
  });

  it('keeps the firm’s hours in midsummer, in summer time', () => {
    // Source: IANA tz database — London is UTC+1 (BST) on 22 Jun 2026; sunrise and sunset lie outside 07:30–17:00 there (see the astronomy-engine cross-check)
    const light = daylight('2026-06-22', LONDON.lat, LONDON.lon);
    const w = workingWindow('2026-06-22', hours, 'Europe/London', { times: light });
    expect(w).toEqual({ start: '2026-06-22T06:30:00.000Z', end: '2026-06-22T16:00:00.000Z', hours: 9.5 });
  });

  it('allows civil twilight when the firm chooses it', () => {
    // Source: civil twilight is the sun's centre 6° below the horizon (suncalc README; checked against astronomy-engine above); working by it is the firm's choice, common practice, no source
    const light = daylight('2026-12-21', LONDON.lat, LONDON.lon);
    const w = workingWindow('2026-12-21', hours, 'Europe/London', { times: light, limit: 'civil-twilight' });
    expect(w?.start).toBe('2026-12-21T07:30:00.000Z');
    expect(w?.end).toBe(light.civilDusk);
  });

  it('returns no window in polar night and refuses hours that end before they start', () => {
    // Source: Svalbard polar night at the December solstice — from memory; hours must end after they start (Hodboard rule)
    const light = daylight('2026-12-21', 78.22, 15.65);
    expect(workingWindow('2026-12-21', hours, 'Arctic/Longyearbyen', { times: light })).toBeNull();
    expect(() => workingWindow('2026-12-21', { start: '17:00', end: '08:00' }, 'Europe/London')).toThrow(/end after/);
  });
});
