import { describe, expect, it } from 'vitest';
import { bricksFor, mortarFor, mortarPerThousandBricks } from './quantities.js';

describe('bricksFor', () => {
  it.each([
    [1, 'half-brick', 0, 60], // Source: diydata.com brick calculator, 60 bricks/m² half-brick wall (secondary copy)
    [1, 'one-brick', 0, 120], // Source: diydata.com brick calculator, 120 bricks/m² one-brick wall (secondary copy)
    [10, 'half-brick', 10, 660], // Source: diydata.com, add 10 % waste — 600 + 60, exact, not 661
    [2.5, 'half-brick', 5, 158], // Source: 150 net + 7.5 waste rounded up to whole bricks
    [0.01, 'one-brick', 0, 2], // Source: 1.2 bricks rounds up to 2
  ] as const)('%f m² of %s wall with %f %% waste needs %d bricks', (area, wall, waste, expected) => {
    expect(bricksFor(area, { wall, wastePct: waste }).bricks).toBe(expected);
  });

  it('reports the net count before waste', () => {
    expect(bricksFor(10, { wall: 'half-brick', wastePct: 10 })).toEqual({ bricks: 660, net: 600, perM2: 60 });
  });

  it('refuses a negative area or waste over 100 %', () => {
    expect(() => bricksFor(-1, { wall: 'half-brick', wastePct: 0 })).toThrow(/area/);
    expect(() => bricksFor(1, { wall: 'half-brick', wastePct: 101 })).toThrow(/wastePct/);
  });
});

describe('mortar per 1000 bricks', () => {
  it('is 0.297 m³ net for solid standard bricks with 10 mm joints', () => {
    // Source: derived — (225 × 75 − 215 × 65) × 102.5 mm³ per brick; brick 215 × 102.5 × 65 (BS EN 771, secondary copy)
    expect(mortarPerThousandBricks()).toBeCloseTo(0.29725, 6);
  });

  it('is about 0.55 m³ for frogged bricks laid frog up', () => {
    // Source: common practice, no source — 0.5–0.6 m³ per 1000 frogged bricks
    expect(mortarPerThousandBricks({ frog: 'frog-up' })).toBe(0.55);
  });

  it('grows with the joint', () => {
    expect(mortarPerThousandBricks({ jointMm: 12 })).toBeGreaterThan(mortarPerThousandBricks({ jointMm: 10 }));
    expect(mortarPerThousandBricks({ jointMm: 0 })).toBe(0);
  });

  it('scales to a job with waste', () => {
    expect(mortarFor(660, { wastePct: 10 })).toBeCloseTo(0.29725 * 0.66 * 1.1, 9);
  });
});
