/**
 * Orders machine text (ISO dates and times, ids, codes) by its characters, which is their order. localeCompare is for
 * words people read: its first call builds a collator, some milliseconds inside a board's first render on a phone.
 */
export function compareCodes(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
