import { describe, expect, it } from 'vitest';
import { govUkBankHolidays } from './fixtures/gov-uk-bank-holidays.js';
import { englandAndWales, publicHolidays } from './holidays.js';

const official = govUkBankHolidays['england-and-wales'].events;

describe('publicHolidays', () => {
  it.each([
    [2025], // Source: gov.uk bank-holidays.json, england-and-wales (hand-typed secondary copy, checked against two copies of the live file: see the fixture header)
    [2026], // Source: gov.uk bank-holidays.json, england-and-wales (hand-typed secondary copy, checked against two copies of the live file: see the fixture header)
    [2027], // Source: gov.uk bank-holidays.json, england-and-wales (hand-typed secondary copy, checked against two copies of the live file: see the fixture header)
  ])('matches the official England and Wales dates for %d', (year) => {
    const expected = official.filter((e) => e.date.startsWith(String(year))).map((e) => e.date);
    expect(publicHolidays(year, englandAndWales).map((h) => h.date)).toEqual(expected);
  });

  it('gives Wales the same bank holidays as England', () => {
    // Source: gov.uk bank-holidays.json has one "england-and-wales" division
    for (const year of [2025, 2026, 2027]) {
      expect(publicHolidays(year, { country: 'GB', state: 'WLS' }).map((h) => h.date)).toEqual(
        publicHolidays(year, englandAndWales).map((h) => h.date),
      );
    }
  });

  it.each([
    ['2026-12-26', '2026-12-28'], // Source: gov.uk bank-holidays.json, Boxing Day 2026 "Substitute day"
    ['2027-12-25', '2027-12-27'], // Source: gov.uk bank-holidays.json, Christmas Day 2027 "Substitute day"
    ['2027-12-26', '2027-12-28'], // Source: gov.uk bank-holidays.json, Boxing Day 2027 "Substitute day"
  ])('keeps the substitute for a weekend holiday on %s but not the weekend date', (weekend, substitute) => {
    const dates = publicHolidays(Number(weekend.slice(0, 4))).map((h) => h.date);
    expect(dates).toContain(substitute);
    expect(dates).not.toContain(weekend);
  });

  it('leaves out observances such as Mother’s Day and Easter Sunday', () => {
    // Source: date-holidays data/countries/GB.yaml lists them as type observance
    const dates = publicHolidays(2026).map((h) => h.date);
    expect(dates).not.toContain('2026-03-15');
    expect(dates).not.toContain('2026-04-05');
  });

  it('knows Scotland’s own days', () => {
    // Source: date-holidays GB.yaml, SCT: 2 January and St Andrew's Day (30 Nov 2026 is a Monday) — from memory for gov.uk
    const dates = publicHolidays(2026, { country: 'GB', state: 'SCT' }).map((h) => h.date);
    expect(dates).toContain('2026-01-02');
    expect(dates).toContain('2026-11-30');
    expect(dates).not.toContain('2026-04-06');
  });

  it('refuses an unknown region with a clear error', () => {
    expect(() => publicHolidays(2026, { country: 'XX' })).toThrow(/unknown holiday country/);
    expect(() => publicHolidays(2026, { country: 'GB', state: 'ZZZ' })).toThrow(/unknown holiday state/);
  });
});
