import { format, parseISO } from 'date-fns';

/** Dates travel as ISO yyyy-mm-dd; shown the way UK sites write them on a day sheet. */
export function formatDay(isoDate: string): string {
  return format(parseISO(isoDate), 'EEE d MMM yyyy');
}

export function toIsoDate(date: Date | null | undefined): string | null {
  return date ? format(date, 'yyyy-MM-dd') : null;
}

export function fromIsoDate(isoDate: string | null | undefined): Date | null {
  return isoDate ? parseISO(isoDate) : null;
}
