import { format } from 'date-fns';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  addDays,
  dayRangeLabel,
  daysBetween,
  formatDayNumber,
  isoWeekday,
  localDateOf,
  parseInstant,
  parseIsoDate,
  shortDayLabel,
  zonedTimeToInstant,
} from './dates.js';

describe('ISO dates', () => {
  it.each([
    ['1970-01-01', 0, 4], // Source: POSIX epoch, 1 Jan 1970 was a Thursday
    ['2000-02-29', 11_016, 2], // Source: Gregorian leap-year rule (400-year exception), 29 Feb 2000 was a Tuesday
    ['2026-03-02', 20_514, 1], // Source: proleptic Gregorian calendar, 2 Mar 2026 is a Monday (checked against the platform Date below)
  ])('reads %s as day %d, ISO weekday %d', (date, day, weekday) => {
    expect(parseIsoDate(date)).toBe(day);
    expect(formatDayNumber(day)).toBe(date);
    expect(isoWeekday(date)).toBe(weekday);
  });

  it.each(['2026-02-29', '2026-13-01', '2026-04-31', '26-03-02', '2026-3-2', '2026-03-02T00:00Z', ''])(
    'refuses %j as a date',
    (bad) => {
      expect(() => parseIsoDate(bad)).toThrow(RangeError);
    },
  );

  it('round-trips any day number through its string', () => {
    fc.assert(
      fc.property(fc.integer({ min: -200_000, max: 200_000 }), (z) => {
        expect(parseIsoDate(formatDayNumber(z))).toBe(z);
      }),
    );
  });

  it('agrees with the platform calendar for any date', () => {
    fc.assert(
      fc.property(fc.integer({ min: -50_000, max: 80_000 }), (z) => {
        expect(formatDayNumber(z)).toBe(new Date(z * 86_400_000).toISOString().slice(0, 10));
      }),
    );
  });

  it('adds and counts calendar days across the clock change without slipping', () => {
    // Source: UK summer time starts 01:00 UTC on the last Sunday in March (29 Mar 2026) — from memory
    expect(addDays('2026-03-28', 2)).toBe('2026-03-30');
    expect(daysBetween('2026-03-28', '2026-03-30')).toBe(2);
    expect(addDays('2026-10-24', 2)).toBe('2026-10-26');
  });
});

describe('instants', () => {
  it.each([
    '2026-03-02T08:00:00Z',
    '2026-03-02T08:00:00.250Z',
    '2026-03-02T08:00Z',
    '2026-07-02T09:00:00+01:00',
    '2026-07-02T03:30:00-05:30',
    '2026-07-02T09:00:00.5+01:00',
  ])('reads %s exactly as the platform does', (s) => {
    expect(parseInstant(s)).toBe(Date.parse(s));
  });

  it('refuses a time with no offset, which would be ambiguous', () => {
    expect(() => parseInstant('2026-03-02T08:00:00')).toThrow(/offset/);
    expect(() => parseInstant('yesterday Z')).toThrow(RangeError);
  });

  it('matches the platform for any instant it prints', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 4_102_444_800_000 }), (ms) => {
        expect(parseInstant(new Date(ms).toISOString())).toBe(ms);
      }),
    );
  });

  it.each([
    ['2026-03-28', '08:00', '2026-03-28T08:00:00.000Z'], // Source: GMT (UTC+0) before the last Sunday in March — from memory
    ['2026-03-30', '08:00', '2026-03-30T07:00:00.000Z'], // Source: BST (UTC+1) after it — from memory
    ['2026-10-24', '08:00', '2026-10-24T07:00:00.000Z'], // Source: BST until the last Sunday in October — from memory
    ['2026-10-26', '08:00', '2026-10-26T08:00:00.000Z'], // Source: GMT again — from memory
  ])('places %s %s London time at %s', (date, hhmm, iso) => {
    expect(new Date(zonedTimeToInstant(date, hhmm, 'Europe/London')).toISOString()).toBe(iso);
  });

  it('finds the local date of an instant near midnight in summer time', () => {
    expect(localDateOf('2026-07-02T23:30:00Z', 'Europe/London')).toBe('2026-07-03');
    expect(localDateOf('2026-01-02T23:30:00Z', 'Europe/London')).toBe('2026-01-02');
  });
});

describe('day labels in messages', () => {
  it('names the weekday, day and month of a date, whatever the machine\'s time zone', () => {
    // Source: proleptic Gregorian calendar: 30 Nov 2026 is a Monday, 26 May 2027 a Wednesday, 29 Feb 2028 a Tuesday.
    expect(shortDayLabel('2026-11-30')).toBe('Mon 30 Nov');
    expect(shortDayLabel('2027-05-26')).toBe('Wed 26 May');
    expect(shortDayLabel('2028-02-29')).toBe('Tue 29 Feb');
    expect(dayRangeLabel('2026-11-30', '2026-12-03')).toBe('Mon 30 Nov to Thu 3 Dec');
    expect(dayRangeLabel('2027-05-26', '2027-05-26')).toBe('Wed 26 May');
    expect(() => shortDayLabel('2027-02-30')).toThrow();
  });

  it('agrees with date-fns for any date', () => {
    // Source: date-fns (registry reference library), format "EEE d MMM" of a Date built from the same parts; the
    // label must match the web app's, which formats with date-fns.
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 60_000 }), (day) => {
        const date = formatDayNumber(day);
        const [y, m, d] = date.split('-').map(Number) as [number, number, number];
        expect(shortDayLabel(date)).toBe(format(new Date(y, m - 1, d), 'EEE d MMM'));
      }),
    );
  });
});
