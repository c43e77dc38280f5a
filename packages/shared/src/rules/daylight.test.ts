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

describe('daylight', () => {
  // Published times are to the minute and for an unstated point in London, so ±2 min.
  it.each([
    ['2011-06-21', '04:42', '21:20', 2], // Source: foxywaitingroom.wordpress.com 21 Jun 2011, London sunrise 4:42 am, sunset 9:20 pm
    ['2018-12-21', '08:04', '15:53', 2], // Source: inews.co.uk, UK sunrise and sunset, Friday 21 December (2018): London 8.04am/3.53pm
    ['2018-12-22', '08:04', '15:54', 2], // Source: inews.co.uk, Saturday 22 December (2018): London 8.04am/3.54pm
    ['2021-11-25', '07:35', '15:59', 2], // Source: inews.co.uk, Thursday 25 November (2021): London 7.35am/3.59pm
    ['2021-11-30', '07:42', '15:55', 2], // Source: inews.co.uk, Tuesday 30 November (2021): London 7.42am/3.55pm
    ['2026-01-01', '08:07', '16:01', 3], // Source: whattime.city/london/sun, 1st-of-month table (year not stated, so ±3 min)
    ['2026-06-01', '04:51', '21:07', 3], // Source: whattime.city/london/sun, 1st-of-month table (year not stated, so ±3 min)
    ['2026-12-01', '07:43', '15:57', 3], // Source: whattime.city/london/sun, 1st-of-month table (year not stated, so ±3 min)
  ])('gives London sunrise and sunset on %s within the published %s / %s', (date, rise, set, tolerance) => {
    const t = daylight(date, LONDON.lat, LONDON.lon);
    expect(Math.abs(minutesOfDay(t.sunrise) - hm(rise))).toBeLessThanOrEqual(tolerance);
    expect(Math.abs(minutesOfDay(t.sunset) - hm(set))).toBeLessThanOrEqual(tolerance);
  });

  it('gives the published length of London’s shortest day', () => {
    // Source: flat36.blogspot.com (Oct 2007): 22 Dec 2007 lasts 7 h 49 min 40 s, sunset 3:53 pm
    const t = daylight('2007-12-22', LONDON.lat, LONDON.lon);
    expect(Math.abs(t.daylightHours * 3600 - (7 * 3600 + 49 * 60 + 40))).toBeLessThanOrEqual(120);
  });

  it('puts civil dawn before sunrise and civil dusk after sunset', () => {
    // Source: suncalc README — dawn/dusk at −6°, sunrise/sunset at −0.833°
    const t = daylight('2026-03-02', LONDON.lat, LONDON.lon);
    expect(Date.parse(t.civilDawn as string)).toBeLessThan(Date.parse(t.sunrise as string));
    expect(Date.parse(t.civilDusk as string)).toBeGreaterThan(Date.parse(t.sunset as string));
  });

  it('reports polar night and polar day instead of inventing times', () => {
    expect(daylight('2026-12-21', 78.22, 15.65).polar).toBe('night');
    expect(daylight('2026-06-21', 78.22, 15.65).daylightHours).toBe(24);
  });

  it('refuses coordinates off the globe', () => {
    expect(() => daylight('2026-03-02', 91, 0)).toThrow(/latitude/);
    expect(() => daylight('2026-03-02', 51, 181)).toThrow(/longitude/);
  });
});

describe('workingWindow', () => {
  const hours = { start: '07:30', end: '17:00' };

  it('cuts the firm’s hours to daylight in midwinter', () => {
    const light = daylight('2026-12-21', LONDON.lat, LONDON.lon);
    const w = workingWindow('2026-12-21', hours, 'Europe/London', { times: light });
    expect(w?.start).toBe(light.sunrise);
    expect(w?.end).toBe(light.sunset);
    expect(w?.hours).toBeLessThan(8);
  });

  it('keeps the firm’s hours in midsummer, in summer time', () => {
    const light = daylight('2026-06-22', LONDON.lat, LONDON.lon);
    const w = workingWindow('2026-06-22', hours, 'Europe/London', { times: light });
    expect(w).toEqual({ start: '2026-06-22T06:30:00.000Z', end: '2026-06-22T16:00:00.000Z', hours: 9.5 });
  });

  it('allows civil twilight when the firm chooses it', () => {
    const light = daylight('2026-12-21', LONDON.lat, LONDON.lon);
    const w = workingWindow('2026-12-21', hours, 'Europe/London', { times: light, limit: 'civil-twilight' });
    expect(w?.start).toBe('2026-12-21T07:30:00.000Z');
    expect(w?.end).toBe(light.civilDusk);
  });

  it('returns no window in polar night and refuses hours that end before they start', () => {
    const light = daylight('2026-12-21', 78.22, 15.65);
    expect(workingWindow('2026-12-21', hours, 'Arctic/Longyearbyen', { times: light })).toBeNull();
    expect(() => workingWindow('2026-12-21', { start: '17:00', end: '08:00' }, 'Europe/London')).toThrow(/end after/);
  });
});
