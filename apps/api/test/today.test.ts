import { describe, expect, it } from 'vitest';
import { todayIn } from '../src/lib/today.js';

describe('todayIn', () => {
  // Source: IANA time zone database (tzdata): New Zealand keeps daylight time (UTC+13) from late September to early
  // April; the UK is on GMT (UTC+0) in winter.
  it('gives the date where the firm is, not where the server is', () => {
    const lateOnNewYearsEve = new Date('2026-12-31T23:30:00Z');
    expect(todayIn('Europe/London', lateOnNewYearsEve)).toBe('2026-12-31');
    expect(todayIn('Pacific/Auckland', lateOnNewYearsEve)).toBe('2027-01-01');
    expect(todayIn('America/New_York', new Date('2027-01-01T03:00:00Z'))).toBe('2026-12-31');
  });

  it('keeps each zone apart when asked for several in turn', () => {
    const at = new Date('2027-03-28T00:30:00Z');
    const zones = ['Europe/London', 'Asia/Tokyo', 'Europe/London', 'America/Los_Angeles'];
    expect(zones.map((zone) => todayIn(zone, at))).toEqual(['2027-03-28', '2027-03-28', '2027-03-28', '2027-03-27']);
  });

  it('refuses a zone that does not exist', () => {
    expect(() => todayIn('Atlantis/Central', new Date())).toThrow(RangeError);
  });
});
