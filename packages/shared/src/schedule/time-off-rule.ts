import { addDays, daysBetween, isoWeekday, isWorkingDay, type WorkCalendar } from '../rules/index.js';
import type { TimeOffValues } from '../schemas/board.js';

const BYDAY = ['', 'MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'] as const;

const compact = (date: string) => date.replaceAll('-', '');

/**
 * Writes a leave or closure entry as RFC 5545 recurrence text (RFC 5545 §3.3.10, §3.8.5.3), the form the
 * working-day calendar reads. A one-off run of days is a daily rule with a count; a weekly or fortnightly
 * entry repeats the same weekdays; a monthly entry repeats one day of the month.
 */
export function timeOffRule(entry: Pick<TimeOffValues, 'startDate' | 'endDate' | 'repeats' | 'repeatUntil'>): string {
  const length = daysBetween(entry.startDate, entry.endDate) + 1;
  const until = entry.repeatUntil ? `;UNTIL=${compact(entry.repeatUntil)}` : '';
  const start = `DTSTART:${compact(entry.startDate)}`;
  switch (entry.repeats) {
    case 'none':
      return `${start}\nRRULE:FREQ=DAILY;COUNT=${length}`;
    case 'weekly':
    case 'fortnightly': {
      if (length > 7) throw new RangeError('A weekly entry covers at most seven days');
      const days = Array.from({ length }, (_, i) => BYDAY[isoWeekday(addDays(entry.startDate, i))]);
      const interval = entry.repeats === 'weekly' ? 1 : 2;
      return `${start}\nRRULE:FREQ=WEEKLY;INTERVAL=${interval};WKST=MO;BYDAY=${days.join(',')}${until}`;
    }
    case 'monthly': {
      if (length > 1) throw new RangeError('A monthly entry covers one day');
      return `${start}\nRRULE:FREQ=MONTHLY;BYMONTHDAY=${Number(entry.startDate.slice(8, 10))}${until}`;
    }
  }
}

/** Checks an entry can be written as a rule; returns the problem in words, or null. */
export function timeOffRuleProblem(entry: Pick<TimeOffValues, 'startDate' | 'endDate' | 'repeats' | 'repeatUntil'>): string | null {
  try {
    timeOffRule(entry);
    return null;
  } catch (error) {
    return error instanceof Error ? error.message : String(error);
  }
}

/** The dates in [from, to] that a rule takes off, read through the same calendar code the spans use. */
export function ruleDates(rule: string, from: string, to: string, timeZone: string): string[] {
  const calendar: WorkCalendar = { weekdays: [1, 2, 3, 4, 5, 6, 7], region: null, closures: [], leave: [rule], timeZone };
  const dates: string[] = [];
  for (let date = from; date <= to; date = addDays(date, 1)) if (!isWorkingDay(date, calendar)) dates.push(date);
  return dates;
}
