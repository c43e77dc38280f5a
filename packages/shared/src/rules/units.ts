// Exact factors: 1 mile = 1609.344 m and 1 knot = 1852 m/h by definition (NIST SP 811 — from memory,
// not checked against its text); NOAA AOML FAQ A14 gives the same factors rounded (0.4470, 0.5144).
const MS_PER_MPH = 0.44704;
const MS_PER_KNOT = 1852 / 3600;
const KMH_PER_MS = 3.6;

export const msToKmh = (ms: number): number => ms * KMH_PER_MS;
export const kmhToMs = (kmh: number): number => kmh / KMH_PER_MS;
export const msToMph = (ms: number): number => ms / MS_PER_MPH;
export const mphToMs = (mph: number): number => mph * MS_PER_MPH;
export const msToKnots = (ms: number): number => ms / MS_PER_KNOT;
export const knotsToMs = (kn: number): number => kn * MS_PER_KNOT;
export const cToF = (c: number): number => (c * 9) / 5 + 32;
export const fToC = (f: number): number => ((f - 32) * 5) / 9;

/** Usable hours as shown in words: rounded down to a tenth, so a day just short of the minimum never reads as meeting it. */
export function usableHoursShown(hours: number): number {
  return Math.floor(hours * 10 + 1e-9) / 10;
}

export type BeaufortName =
  | 'Calm'
  | 'Light air'
  | 'Light breeze'
  | 'Gentle breeze'
  | 'Moderate breeze'
  | 'Fresh breeze'
  | 'Strong breeze'
  | 'Near gale'
  | 'Gale'
  | 'Severe gale'
  | 'Storm'
  | 'Violent storm'
  | 'Hurricane';

export interface BeaufortBand {
  force: number;
  name: BeaufortName;
  /** Lower limit of the band as published, m/s (WMO, mean wind at 10 m). */
  minMs: number;
  /** Upper limit as published, m/s; `null` for force 12. */
  maxMs: number | null;
}

// WMO m/s column, the one canonical column: the knots, mph and km/h columns are
// rounded separately and disagree at the edges (see the package README).
const BANDS: readonly BeaufortBand[] = [
  { force: 0, name: 'Calm', minMs: 0, maxMs: 0.2 },
  { force: 1, name: 'Light air', minMs: 0.3, maxMs: 1.5 },
  { force: 2, name: 'Light breeze', minMs: 1.6, maxMs: 3.3 },
  { force: 3, name: 'Gentle breeze', minMs: 3.4, maxMs: 5.4 },
  { force: 4, name: 'Moderate breeze', minMs: 5.5, maxMs: 7.9 },
  { force: 5, name: 'Fresh breeze', minMs: 8.0, maxMs: 10.7 },
  { force: 6, name: 'Strong breeze', minMs: 10.8, maxMs: 13.8 },
  { force: 7, name: 'Near gale', minMs: 13.9, maxMs: 17.1 },
  { force: 8, name: 'Gale', minMs: 17.2, maxMs: 20.7 },
  { force: 9, name: 'Severe gale', minMs: 20.8, maxMs: 24.4 },
  { force: 10, name: 'Storm', minMs: 24.5, maxMs: 28.4 },
  { force: 11, name: 'Violent storm', minMs: 28.5, maxMs: 32.6 },
  { force: 12, name: 'Hurricane', minMs: 32.7, maxMs: null },
];

// The table is given to 0.1 m/s, so an unrounded speed belongs to the band it rounds
// into: each edge sits half-way between one band's top and the next band's bottom.
const EDGES: readonly number[] = BANDS.slice(1).map((b) => Math.round((b.minMs - 0.05) * 100) / 100);

export const beaufortBands: readonly BeaufortBand[] = BANDS;

/** Beaufort force (0–12) of a mean wind speed in m/s, with the band's published limits. */
export function beaufortForce(ms: number): BeaufortBand {
  if (!Number.isFinite(ms) || ms < 0) throw new RangeError(`wind speed must be a finite number ≥ 0 m/s, got ${ms}`);
  let f = 0;
  while (f < EDGES.length && ms >= (EDGES[f] as number)) f++;
  return BANDS[f] as BeaufortBand;
}
