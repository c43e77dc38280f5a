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
  it('is 0.297 m³ net for solid standard bricks in a half-brick wall with 10 mm joints', () => {
    // Source: derived — (225 × 75 − 215 × 65) × 102.5 mm³ per brick; brick 215 × 102.5 × 65 (BS EN 771, secondary copy)
    expect(mortarPerThousandBricks({ wall: 'half-brick' })).toBeCloseTo(0.29725, 6);
  });

  it('is 0.382 m³ net in a one-brick wall, collar joint included', () => {
    // Source: worked calculation from standard UK brick geometry; no published one-brick figure was found.
    // Brick 215 × 102.5 × 65 mm (BS EN 771, secondary copy), 10 mm joints. The wall is 215 mm thick (two
    // 102.5 mm leaves and a 10 mm collar joint), two bricks to each 225 × 75 mm of face, so each brick's share
    // is 225 × 75 × 107.5 = 1,814,062.5 mm³; less the brick, 1,432,437.5 mm³, leaves 381,625 mm³ of mortar.
    expect(mortarPerThousandBricks({ wall: 'one-brick' })).toBeCloseTo(0.381625, 6);
  });

  it('comes to 0.0452 m³ per m² of one-brick wall face', () => {
    // Source: worked calculation — 0.215 m³ of wall per m² less 1 / (0.225 × 0.075) × 2 = 118.52 bricks of
    // 0.0014324375 m³ (0.16977 m³) = 0.04523 m³, the same as 118.52 × 0.381625 / 1000.
    const bricksPerM2 = 2 / (0.225 * 0.075);
    expect((mortarPerThousandBricks({ wall: 'one-brick' }) * bricksPerM2) / 1000).toBeCloseTo(0.215 - bricksPerM2 * 0.215 * 0.1025 * 0.065, 9);
    expect((mortarPerThousandBricks({ wall: 'one-brick' }) * bricksPerM2) / 1000).toBeCloseTo(0.04523, 5);
  });

  it('sits below the published per-m² rules of thumb, which allow for frogged bricks', () => {
    // Source: tradecalculator.co.uk/answers/how-much-mortar-for-wall (secondary, rule of thumb; frogs and waste
    // not stated): about 0.03 m³/m² half-brick and 0.06 m³/m² one-brick, i.e. 0.5 m³ per 1000 bricks at 60 and
    // 120 a m² — the frogged-brick range. Net figures for solid bricks must come in under it, one-brick above half-brick.
    const half = mortarPerThousandBricks({ wall: 'half-brick' });
    const one = mortarPerThousandBricks({ wall: 'one-brick' });
    expect(one).toBeGreaterThan(half);
    expect(one).toBeLessThan(0.06 / 120 * 1000);
    expect((one * 2) / (0.225 * 0.075) / 1000).toBeLessThan(0.06);
    expect(half / (0.225 * 0.075) / 1000).toBeLessThan(0.03);
  });

  it('is about 0.55 m³ for frogged bricks laid frog up in a half-brick wall', () => {
    // Source: common practice, no source — 0.5–0.6 m³ per 1000 frogged bricks
    expect(mortarPerThousandBricks({ wall: 'half-brick', frog: 'frog-up' })).toBe(0.55);
    expect(() => mortarPerThousandBricks({ wall: 'one-brick', frog: 'frog-up' })).toThrow(/half-brick/);
  });

  it('grows with the joint', () => {
    expect(mortarPerThousandBricks({ wall: 'half-brick', jointMm: 12 })).toBeGreaterThan(mortarPerThousandBricks({ wall: 'half-brick', jointMm: 10 }));
    expect(mortarPerThousandBricks({ wall: 'one-brick', jointMm: 12 })).toBeGreaterThan(mortarPerThousandBricks({ wall: 'one-brick', jointMm: 10 }));
    expect(mortarPerThousandBricks({ wall: 'half-brick', jointMm: 0 })).toBe(0);
  });

  it('scales to a job with waste, by the kind of wall', () => {
    expect(mortarFor(660, { wall: 'half-brick', wastePct: 10 })).toBeCloseTo(0.29725 * 0.66 * 1.1, 9);
    // Source: worked calculation — 1,200 bricks (10 m² of one-brick wall) × 0.381625 / 1000 = 0.45795 m³.
    expect(mortarFor(1_200, { wall: 'one-brick', wastePct: 0 })).toBeCloseTo(0.45795, 9);
  });

  it('refuses a wall it has no figure for', () => {
    expect(() => mortarFor(100, { wall: 'brick-and-a-half' as never, wastePct: 0 })).toThrow(/wall must be/);
  });
});
