import rrule from 'rrule';
import { describe, expect, it } from 'vitest';
import { ruleDates, timeOffRule, timeOffRuleProblem } from './time-off-rule.js';

const { rrulestr } = rrule;

describe('timeOffRule', () => {
  it.each([
    // Source: RFC 5545 §3.8.5.3 example "Every other week on Monday, Wednesday, and Friday" shape (FREQ=WEEKLY;INTERVAL=2;BYDAY=…).
    ['every other Friday', { startDate: '2027-01-08', endDate: '2027-01-08', repeats: 'fortnightly' as const, repeatUntil: null },
      'DTSTART:20270108\nRRULE:FREQ=WEEKLY;INTERVAL=2;WKST=MO;BYDAY=FR', '2027-01-01', '2027-02-05', ['2027-01-08', '2027-01-22', '2027-02-05']],
    // Source: RFC 5545 §3.3.10 (COUNT bounds a rule); a one-off run of days as a daily rule.
    ['a one-off week off over a weekend', { startDate: '2027-03-04', endDate: '2027-03-08', repeats: 'none' as const, repeatUntil: null },
      'DTSTART:20270304\nRRULE:FREQ=DAILY;COUNT=5', '2027-03-01', '2027-03-31', ['2027-03-04', '2027-03-05', '2027-03-06', '2027-03-07', '2027-03-08']],
    // Source: RFC 5545 §3.3.10 BYMONTHDAY and UNTIL.
    ['the 15th of each month until April', { startDate: '2027-01-15', endDate: '2027-01-15', repeats: 'monthly' as const, repeatUntil: '2027-04-01' },
      'DTSTART:20270115\nRRULE:FREQ=MONTHLY;BYMONTHDAY=15;UNTIL=20270401', '2027-01-01', '2027-06-30', ['2027-01-15', '2027-02-15', '2027-03-15']],
  ])('writes %s as RFC 5545 text that a general parser expands the same way', (_name, entry, text, from, to, expected) => {
    expect(timeOffRule(entry)).toBe(text);
    // Cross-check with the rrule library's own expansion, outside our calendar code.
    const parsed = rrulestr(text, { forceset: true });
    const byLibrary = parsed
      .between(new Date(`${from}T00:00:00Z`), new Date(`${to}T23:59:59Z`), true)
      .map((d) => d.toISOString().slice(0, 10));
    expect(byLibrary).toEqual(expected);
    expect(ruleDates(text, from, to, 'Europe/London')).toEqual(expected);
  });

  it('refuses a monthly entry longer than one day', () => {
    expect(timeOffRuleProblem({ startDate: '2027-01-15', endDate: '2027-01-16', repeats: 'monthly', repeatUntil: null })).toMatch(/one day/);
  });
});
