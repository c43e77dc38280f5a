import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { beaufortBands, beaufortForce, cToF, fToC, kmhToMs, knotsToMs, mphToMs, msToKmh, msToKnots, msToMph } from './units.js';

describe('speed and temperature conversions', () => {
  it.each([
    [1, msToKmh, 3.6], // Source: NOAA AOML hurricane FAQ A14, 1 m/s = 3.6 km/h
    [1, mphToMs, 0.44704], // Source: NIST SP 811, 1 mile = 1609.344 m exactly (AOML rounds to 0.4470) — from memory for NIST
    [1, knotsToMs, 0.514444], // Source: NOAA AOML FAQ A14, 1 kn = 0.514444 m/s
    [1, (kn: number) => msToKmh(knotsToMs(kn)), 1.852], // Source: NOAA AOML FAQ A14, 1 kn = 1.852 km/h
    [12.5, msToMph, 27.96], // Source: IPAF FAQ 5848 via trade-rules §1b, 12.5 m/s = 28 mph
    [12.5, msToKmh, 45.0], // Source: IPAF FAQ 5848 via trade-rules §1b, 12.5 m/s = 45.0 km/h
    [12.5, msToKnots, 24.3], // Source: IPAF FAQ 5848 via trade-rules §1b, 12.5 m/s = 24.3 kn
    [17, mphToMs, 7.6], // Source: PASMA FAQ, 17 mph (7.6 m/s)
    [23, mphToMs, 10.3], // Source: HSE roof-work FAQ via trade-rules §1b, 23 mph = 10.3 m/s
    [35, mphToMs, 15.6], // Source: NFRC windy-conditions guidance via trade-rules §1b, 35 mph = 15.6 m/s
    [26, mphToMs, 11.6], // Source: NFRC windy-conditions guidance via trade-rules §1b, 26 mph = 11.6 m/s
    [40, (mph: number) => msToKmh(mphToMs(mph)), 64.4], // Source: OSHA note to the "high wind" definition, 40 mph (64.4 km/h) — secondary copy (spectrumsafetytraining.com); the section, 29 CFR 1926.968 / 1910.269(x), from memory
    [30, (mph: number) => msToKmh(mphToMs(mph)), 48.3], // Source: same OSHA note, 30 mph (48.3 km/h) when handling material — secondary copy; section from memory
  ])('converts %d to the published figure (%#)', (input, convert, expected) => {
    const digits = String(expected).split('.')[1]?.length ?? 0;
    expect(convert(input)).toBeCloseTo(expected, Math.min(digits, 5));
  });

  it.each([
    [0, 32], // Source: °F = °C × 9/5 + 32 (norpolar.tripod.com; NIST SP 811 from memory)
    [100, 212], // Source: same formula; convert-units README example 100 → 212
    [-40, -40], // Source: same formula, the scales cross at −40
    [4.444444, 40], // Source: trade-rules §3, 40 °F = 4.44 °C
    [-6.666667, 20], // Source: trade-rules §3, 20 °F = −6.67 °C
    [32.222222, 90], // Source: trade-rules §3, 90 °F = 32.22 °C
    [37.777778, 100], // Source: trade-rules §3, 100 °F = 37.78 °C
    [48.888889, 120], // Source: trade-rules §3, 120 °F = 48.89 °C
  ])('reads %d °C as %d °F', (c, f) => {
    expect(cToF(c)).toBeCloseTo(f, 4);
    expect(fToC(f)).toBeCloseTo(c, 4);
  });

  it('round-trips every speed conversion', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 200, noNaN: true }), (v) => {
        expect(kmhToMs(msToKmh(v))).toBeCloseTo(v, 9);
        expect(mphToMs(msToMph(v))).toBeCloseTo(v, 9);
        expect(knotsToMs(msToKnots(v))).toBeCloseTo(v, 9);
      }),
    );
  });

  it('round-trips temperatures', () => {
    fc.assert(
      fc.property(fc.double({ min: -90, max: 60, noNaN: true }), (c) => {
        expect(fToC(cToF(c))).toBeCloseTo(c, 9);
      }),
    );
  });
});

describe('beaufortForce', () => {
  it.each([
    [0.2, 0], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 0
    [0.24, 0], // Source: WMO Beaufort m/s table; just below the 0.3 edge rounds to force 0
    [0.3, 1], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 1
    [0.35, 1], // Source: WMO Beaufort m/s table, just above the bottom of force 1
    [1.5, 1], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 1
    [1.54, 1], // Source: WMO Beaufort m/s table; just below the 1.6 edge rounds to force 1
    [1.6, 2], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 2
    [1.65, 2], // Source: WMO Beaufort m/s table, just above the bottom of force 2
    [3.3, 2], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 2
    [3.34, 2], // Source: WMO Beaufort m/s table; just below the 3.4 edge rounds to force 2
    [3.4, 3], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 3
    [3.45, 3], // Source: WMO Beaufort m/s table, just above the bottom of force 3
    [5.4, 3], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 3
    [5.44, 3], // Source: WMO Beaufort m/s table; just below the 5.5 edge rounds to force 3
    [5.5, 4], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 4
    [5.55, 4], // Source: WMO Beaufort m/s table, just above the bottom of force 4
    [7.9, 4], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 4
    [7.94, 4], // Source: WMO Beaufort m/s table; just below the 8.0 edge rounds to force 4
    [8.0, 5], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 5
    [8.05, 5], // Source: WMO Beaufort m/s table, just above the bottom of force 5
    [10.7, 5], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 5
    [10.74, 5], // Source: WMO Beaufort m/s table; just below the 10.8 edge rounds to force 5
    [10.8, 6], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 6
    [10.85, 6], // Source: WMO Beaufort m/s table, just above the bottom of force 6
    [13.8, 6], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 6
    [13.84, 6], // Source: WMO Beaufort m/s table; just below the 13.9 edge rounds to force 6
    [13.9, 7], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 7
    [13.95, 7], // Source: WMO Beaufort m/s table, just above the bottom of force 7
    [17.1, 7], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 7
    [17.14, 7], // Source: WMO Beaufort m/s table; just below the 17.2 edge rounds to force 7
    [17.2, 8], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 8
    [17.25, 8], // Source: WMO Beaufort m/s table, just above the bottom of force 8
    [20.7, 8], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 8
    [20.74, 8], // Source: WMO Beaufort m/s table; just below the 20.8 edge rounds to force 8
    [20.8, 9], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 9
    [20.85, 9], // Source: WMO Beaufort m/s table, just above the bottom of force 9
    [24.4, 9], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 9
    [24.44, 9], // Source: WMO Beaufort m/s table; just below the 24.5 edge rounds to force 9
    [24.5, 10], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 10
    [24.55, 10], // Source: WMO Beaufort m/s table, just above the bottom of force 10
    [28.4, 10], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 10
    [28.44, 10], // Source: WMO Beaufort m/s table; just below the 28.5 edge rounds to force 10
    [28.5, 11], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 11
    [28.55, 11], // Source: WMO Beaufort m/s table, just above the bottom of force 11
    [32.6, 11], // Source: WMO Beaufort m/s table (secondary copy, meteothes.gr), top of force 11
    [32.64, 11], // Source: WMO Beaufort m/s table; just below the 32.7 edge rounds to force 11
    [32.7, 12], // Source: WMO Beaufort m/s table (secondary copy), bottom of force 12
    [32.75, 12], // Source: WMO Beaufort m/s table, just above the bottom of force 12
  ])('puts %d m/s in force %d', (ms, force) => {
    expect(beaufortForce(ms).force).toBe(force);
  });

  // The table is given to 0.1 m/s, so each edge sits half-way between one band's top and the next one's
  // bottom: at the edge is the upper band, a hair below it the lower one. This tells half-way edges apart
  // from edges at the published bottom (0.3, 1.6 …) or top (0.2, 1.5 …) of a band.
  it.each([
    [0.25, 1], [1.55, 2], [3.35, 3], [5.45, 4], [7.95, 5], [10.75, 6],
    [13.85, 7], [17.15, 8], [20.75, 9], [24.45, 10], [28.45, 11], [32.65, 12],
  ])('puts the half-way edge %d m/s in force %d and a hair below it in the force below', (edge, force) => {
    // Source: WMO Beaufort m/s column (secondary copy, meteothes.gr), given to 0.1 m/s; reading a speed by the band it rounds into is a Hodboard rule (README)
    expect(beaufortForce(edge).force).toBe(force);
    expect(beaufortForce(edge - 0.0001).force).toBe(force - 1);
  });

  it.each([
    [0, 'Calm', 0, 0.2], // Source: WMO Beaufort m/s table (secondary copy)
    [4, 'Moderate breeze', 5.5, 7.9], // Source: WMO Beaufort m/s table; Met Office Fact Sheet 6 names
    [9, 'Severe gale', 20.8, 24.4], // Source: Met Office Fact Sheet 6 calls force 9 "Severe gale"
    [12, 'Hurricane', 32.7, null], // Source: WMO Beaufort m/s table, ≥ 32.7 m/s
  ])('gives force %d its name and published limits', (force, name, minMs, maxMs) => {
    const band = beaufortBands[force];
    expect(band).toEqual({ force, name, minMs, maxMs });
    expect(beaufortForce(minMs)).toEqual(band);
  });

  it('never falls as the wind rises', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 80, noNaN: true }), fc.double({ min: 0, max: 20, noNaN: true }), (v, dv) => {
        expect(beaufortForce(v + dv).force).toBeGreaterThanOrEqual(beaufortForce(v).force);
      }),
    );
  });

  it('refuses a negative or missing speed', () => {
    expect(() => beaufortForce(-1)).toThrow(RangeError);
    expect(() => beaufortForce(Number.NaN)).toThrow(/finite/);
  });
});
