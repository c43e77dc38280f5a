import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  addWorkingDays,
  defaultWorkCalendar,
  isWorkingDay,
  nextWorkingDay,
  spanFor,
  workCalendarSchema,
  workingDaysBetween,
  type WorkCalendar,
} from './calendar.js';
import { addDays } from './dates.js';
import { govUkBankHolidays } from './fixtures/gov-uk-bank-holidays.js';

const eng = defaultWorkCalendar;
const withLeave = (leave: string[], extra: Partial<WorkCalendar> = {}): WorkCalendar => ({ ...eng, leave, ...extra });

describe('isWorkingDay', () => {
  it.each([
    ['2026-04-02', true], // Source: gov.uk bank-holidays.json — Maundy Thursday is not a bank holiday
    ['2026-04-03', false], // Source: gov.uk bank-holidays.json, Good Friday 2026
    ['2026-04-06', false], // Source: gov.uk bank-holidays.json, Easter Monday 2026
    ['2026-04-07', true], // Source: gov.uk bank-holidays.json, the day after Easter Monday
    ['2026-12-28', false], // Source: gov.uk bank-holidays.json, Boxing Day 2026 substitute day
    ['2026-12-29', true], // Source: gov.uk bank-holidays.json, no holiday on 29 Dec 2026
    ['2027-03-26', false], // Source: gov.uk bank-holidays.json, Good Friday 2027 (not 2 April)
    ['2027-04-02', true], // Source: gov.uk bank-holidays.json — a public copy wrongly listed 2 Apr 2027
    ['2026-03-07', false], // Source: calendar weekdays Monday–Friday; 7 Mar 2026 is a Saturday
  ])('says %s is a working day: %s', (date, expected) => {
    expect(isWorkingDay(date, eng)).toBe(expected);
  });

  it('treats every official bank holiday 2025–2027 as a day off', () => {
    for (const e of govUkBankHolidays['england-and-wales'].events) {
      // Source: gov.uk bank-holidays.json, england-and-wales (hand-typed secondary copy: see the fixture header)
      expect(isWorkingDay(e.date, eng), e.date).toBe(false);
    }
  });

  it('works a Saturday when the firm works Saturdays, except the day gov.uk moved a holiday from', () => {
    const sixDays: WorkCalendar = { ...eng, weekdays: [1, 2, 3, 4, 5, 6] };
    expect(isWorkingDay('2026-03-07', sixDays)).toBe(true);
    // Source: gov.uk bank-holidays.json lists 28 Dec 2026, not Saturday 26 Dec, as the bank holiday
    expect(isWorkingDay('2026-12-26', sixDays)).toBe(true);
  });

  it('keeps firm closures off the board', () => {
    // Source: Hodboard rule — firm closure dates are days off; gov.uk bank-holidays.json (hand-typed copy): 25 and 28 Dec 2026 and 1 Jan 2027 are bank holidays, 2–3 Jan 2027 a weekend
    const shut = { ...eng, closures: ['2026-12-29', '2026-12-30', '2026-12-31'] };
    expect(spanFor('2026-12-24', 3, shut)).toEqual(['2026-12-24', '2027-01-04', '2027-01-05']);
  });

  it('ignores holidays when the calendar has no region', () => {
    // Source: Hodboard rule — a calendar without a region has no public holidays; 3 Apr 2026 (Good Friday) is a Friday
    expect(isWorkingDay('2026-04-03', { ...eng, region: null })).toBe(true);
  });

  it('takes a crew’s every-other-Friday leave from an RFC 5545 rule', () => {
    // Source: RFC 5545 §3.8.5.3 RRULE, FREQ=WEEKLY;INTERVAL=2;BYDAY=FR
    const cal = withLeave(['DTSTART:20260102\nRRULE:FREQ=WEEKLY;INTERVAL=2;BYDAY=FR']);
    expect(isWorkingDay('2026-01-02', cal)).toBe(false);
    expect(isWorkingDay('2026-01-09', cal)).toBe(true);
    expect(isWorkingDay('2026-01-16', cal)).toBe(false);
    expect(isWorkingDay('2026-07-03', cal)).toBe(false);
  });

  it('reads a zoned leave start as the local date even in summer time', () => {
    // Source: RFC 5545 §3.3.5 form 3, DTSTART;TZID=… is local time in that zone
    const cal = withLeave(['DTSTART;TZID=Europe/London:20260703T000000\nRRULE:FREQ=WEEKLY;INTERVAL=2;BYDAY=FR']);
    expect(isWorkingDay('2026-07-03', cal)).toBe(false);
    expect(isWorkingDay('2026-07-02', cal)).toBe(true);
  });

  it('moves a UTC leave start into the calendar’s zone', () => {
    // Source: RFC 5545 §3.3.5 form 2, a trailing Z is UTC; 23:00Z on 2 Jul is 00:00 on 3 Jul in London (BST)
    const cal = withLeave(['DTSTART:20260702T230000Z\nRRULE:FREQ=WEEKLY;COUNT=2']);
    expect(isWorkingDay('2026-07-03', cal)).toBe(false);
    expect(isWorkingDay('2026-07-02', cal)).toBe(true);
    expect(isWorkingDay('2026-07-10', cal)).toBe(false);
  });

  it('honours EXDATE in a leave rule', () => {
    // Source: RFC 5545 §3.8.5.1 EXDATE
    const cal = withLeave(['DTSTART:20260105\nRRULE:FREQ=WEEKLY;BYDAY=MO;COUNT=3\nEXDATE:20260112']);
    expect(spanFor('2026-01-05', 3, cal)).toEqual(['2026-01-06', '2026-01-07', '2026-01-08']);
    expect(isWorkingDay('2026-01-12', cal)).toBe(true);
    expect(isWorkingDay('2026-01-19', cal)).toBe(false);
  });
});

describe('addWorkingDays and workingDaysBetween', () => {
  it.each([
    ['2026-04-02', 1, '2026-04-07'], // Source: gov.uk bank-holidays.json, Good Friday and Easter Monday 2026
    ['2026-04-07', -1, '2026-04-02'], // Source: gov.uk bank-holidays.json, the same Easter backwards
    ['2026-12-24', 1, '2026-12-29'], // Source: gov.uk bank-holidays.json, 25 and 28 Dec 2026
    ['2027-12-24', 1, '2027-12-29'], // Source: gov.uk bank-holidays.json, 27 and 28 Dec 2027 substitute days
    ['2026-03-27', 1, '2026-03-30'], // Source: weekend across the spring clock change (29 Mar 2026) — from memory
    ['2026-10-23', 5, '2026-10-30'], // Source: weekend across the autumn clock change (25 Oct 2026) — from memory
    ['2026-03-07', 1, '2026-03-09'], // Source: Monday–Friday calendar, from a Saturday
    ['2026-03-02', 0, '2026-03-02'], // Source: n = 0 returns the start itself
  ])('from %s, %d working days lands on %s', (start, n, expected) => {
    expect(addWorkingDays(start, n, eng)).toBe(expected);
    expect(workingDaysBetween(start, expected, eng)).toBe(n);
  });

  it('counts back to the same number of working days it added', () => {
    // Source: Hodboard rule — workingDaysBetween counts (a, b], so it undoes addWorkingDays, whatever the holidays, closures and leave
    const cal = withLeave(['DTSTART:20250103\nRRULE:FREQ=WEEKLY;INTERVAL=2;BYDAY=FR'], { closures: ['2026-08-28'] });
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 3 * 365 }), fc.integer({ min: -120, max: 120 }), (offset, n) => {
        const start = addDays('2025-01-01', offset);
        expect(workingDaysBetween(start, addWorkingDays(start, n, cal), cal)).toBe(n);
      }),
    );
  });

  it('always lands on a working day', () => {
    // Source: Hodboard rule — addWorkingDays never lands on a day off
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 3 * 365 }), fc.integer({ min: 1, max: 60 }), (offset, n) => {
        expect(isWorkingDay(addWorkingDays(addDays('2025-01-01', offset), n, eng), eng)).toBe(true);
      }),
    );
  });

  it('refuses fractional days and calendars with no working weekday', () => {
    // Source: Hodboard rule — whole working days only, and a calendar needs a day it can work
    expect(() => addWorkingDays('2026-03-02', 1.5, eng)).toThrow(/integer/);
    expect(() => spanFor('2026-03-02', 3, { ...eng, weekdays: [] })).toThrow(/at least one weekday/);
    expect(() => spanFor('2026-03-02', 3, { ...eng, weekdays: [6], closures: [] , region: null, leave: ['DTSTART:20260307\nRRULE:FREQ=WEEKLY;BYDAY=SA'] })).toThrow(/no working day/);
  });
});

describe('spanFor', () => {
  it('lists the working days of a job over Easter 2026', () => {
    // Source: gov.uk bank-holidays.json, 3 and 6 Apr 2026
    expect(spanFor('2026-04-01', 5, eng)).toEqual(['2026-04-01', '2026-04-02', '2026-04-07', '2026-04-08', '2026-04-09']);
  });

  it('starts on the next working day when the start is a day off', () => {
    // Source: gov.uk bank-holidays.json, england-and-wales (hand-typed copy): Good Friday 3 Apr and Easter Monday 6 Apr 2026; 4–5 Apr is a weekend
    expect(spanFor('2026-04-03', 1, eng)).toEqual(['2026-04-07']);
    expect(nextWorkingDay('2026-04-04', eng)).toBe('2026-04-07');
  });

  it('returns exactly n ascending working days, first on or after the start', () => {
    // Source: Hodboard rule — spanFor(start, n) is the first n working days on or after the start
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 3 * 365 }), fc.integer({ min: 0, max: 40 }), (offset, n) => {
        const start = addDays('2025-01-01', offset);
        const span = spanFor(start, n, eng);
        expect(span).toHaveLength(n);
        for (let i = 0; i < span.length; i++) {
          const d = span[i] as string;
          expect(isWorkingDay(d, eng)).toBe(true);
          if (i > 0) expect(workingDaysBetween(span[i - 1] as string, d, eng)).toBe(1);
        }
        if (n > 0) expect(span[0]).toBe(nextWorkingDay(start, eng));
      }),
    );
  });

  it('refuses a negative length', () => {
    // Source: Hodboard rule — a job has zero or more working days
    expect(() => spanFor('2026-03-02', -1, eng)).toThrow(RangeError);
  });
});

describe('workCalendarSchema', () => {
  it('accepts the default calendar', () => {
    // Source: Hodboard rule — the default calendar (Mon–Fri, England, Europe/London) passes its own schema
    expect(workCalendarSchema.parse(defaultWorkCalendar)).toEqual(defaultWorkCalendar);
  });

  it.each([
    [{ weekdays: [] }, 'weekdays'],
    [{ weekdays: [0] }, 'weekdays'],
    [{ weekdays: [1, 1] }, 'weekdays'],
    [{ closures: ['2026-02-30'] }, 'closures'],
    [{ timeZone: 'Mars/Olympus' }, 'timeZone'],
    [{ leave: ['RRULE:FREQ=WEEKLY'] }, 'leave'],
    [{ leave: ['DTSTART:20260102\nRRULE:FREQ=SOMETIMES'] }, 'leave'],
    [{ region: { country: 'gb' } }, 'region'],
  ])('rejects %j with an error at %s', (patch, path) => {
    // Source: Hodboard rule — weekdays are ISO 8601 1–7 without repeats, dates real, zones IANA names, leave RFC 5545 with DTSTART
    const r = workCalendarSchema.safeParse({ ...defaultWorkCalendar, ...patch });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path[0]).toBe(path);
  });
});
