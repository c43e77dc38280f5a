import { describe, expect, it } from 'vitest';
import { compareCodes } from './compare';

describe('ordering machine text', () => {
  it('puts ISO dates and times in time order, across months and years', () => {
    // Source: RFC 3339 §5.1 (Ordering): with fixed-width fields, most significant first, in one time zone, sorting the text sorts the times.
    const dates = ['2027-01-04', '2026-12-31', '2026-12-04T09:30:00Z', '2026-02-28', '2026-12-04T08:05:00Z'];
    expect([...dates].sort(compareCodes)).toEqual(['2026-02-28', '2026-12-04T08:05:00Z', '2026-12-04T09:30:00Z', '2026-12-31', '2027-01-04']);
  });

  it('agrees with the default collation on ids and codes, and says equal for equal text', () => {
    const ids = ['c3a1f2e0-0000-4000-8000-000000000002', '0b7e9d10-0000-4000-8000-000000000001', 'double-booked', 'access-not-confirmed'];
    expect([...ids].sort(compareCodes)).toEqual([...ids].sort((a, b) => a.localeCompare(b)));
    expect(compareCodes('J0004', 'J0004')).toBe(0);
  });
});
