// Building a formatter costs far more than using one, and the board asks for "today" on every read.
const formatters = new Map<string, Intl.DateTimeFormat>();

/** The calendar date at `now` in a time zone, as YYYY-MM-DD. */
export function todayIn(timeZone: string, now = new Date()): string {
  let formatter = formatters.get(timeZone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    formatters.set(timeZone, formatter);
  }
  return formatter.format(now);
}
