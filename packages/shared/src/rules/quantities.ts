export type WallThickness = 'half-brick' | 'one-brick';

/** UK standard brick, work size and joint, mm (BS EN 771 size as a secondary copy of the standard gives it; not read in the original). */
export const standardBrick = { lengthMm: 215, widthMm: 102.5, heightMm: 65, jointMm: 10 } as const;

/** Bricks per m² of wall face, stretcher bond, 10 mm joints (1 / (0.225 × 0.075) = 59.3, rounded up in trade tables). */
export const bricksPerM2: Readonly<Record<WallThickness, number>> = { 'half-brick': 60, 'one-brick': 120 };

export interface BrickCount {
  /** To order: net plus waste, rounded up to whole bricks. */
  bricks: number;
  net: number;
  perM2: number;
}

export function bricksFor(areaM2: number, options: { wall: WallThickness; wastePct: number }): BrickCount {
  if (!Number.isFinite(areaM2) || areaM2 < 0) throw new RangeError(`wall area must be ≥ 0 m², got ${areaM2}`);
  const { wall, wastePct } = options;
  const perM2 = bricksPerM2[wall];
  if (perM2 === undefined) throw new RangeError(`wall must be 'half-brick' or 'one-brick', got ${JSON.stringify(wall)}`);
  if (!Number.isFinite(wastePct) || wastePct < 0 || wastePct > 100) throw new RangeError(`wastePct must be 0–100, got ${wastePct}`);
  // Integer arithmetic (area to 0.001 m², waste to 0.01 %) so 10 m² at 10 % is 660, not 661.
  const area = BigInt(Math.round(areaM2 * 1000));
  const waste = BigInt(Math.round(wastePct * 100));
  const per = BigInt(perM2);
  const netDen = 1000n;
  const net = Number((area * per + netDen - 1n) / netDen);
  const den = 1000n * 10_000n;
  const bricks = Number((area * per * (10_000n + waste) + den - 1n) / den);
  return { bricks, net, perM2 };
}

export interface MortarOptions {
  wall: WallThickness;
  jointMm?: number;
  frog?: 'none' | 'frog-up';
}

/**
 * Net mortar per 1000 solid bricks without frogs, m³: each brick's share of the wall (its co-ordinating face,
 * 225 × 75 mm at 10 mm joints, times its share of the wall's thickness) less the brick itself.
 * - Half-brick, one leaf in stretcher bond, 102.5 mm thick: bed and perpend joints, 0.297 m³.
 * - One-brick, 215 mm thick (two leaves tied by headers, so two bricks to each co-ordinating face): each brick
 *   has half the thickness, 107.5 mm, which takes in the 10 mm collar joint between the leaves: 0.382 m³.
 * Frogged bricks laid frog-up take about 0.5–0.6 m³ (common practice, no source, and not given by wall).
 */
export function mortarPerThousandBricks(options: MortarOptions): number {
  const j = options.jointMm ?? standardBrick.jointMm;
  if (!Number.isFinite(j) || j < 0 || j > 30) throw new RangeError(`jointMm must be 0–30, got ${j}`);
  const { lengthMm: l, widthMm: w, heightMm: h } = standardBrick;
  const shareOfThickness: Record<WallThickness, number> = { 'half-brick': w, 'one-brick': l / 2 };
  const share = shareOfThickness[options.wall];
  if (share === undefined) throw new RangeError(`wall must be 'half-brick' or 'one-brick', got ${JSON.stringify(options.wall)}`);
  if (options.frog === 'frog-up') {
    if (j !== standardBrick.jointMm) throw new RangeError('the frog-up figure is for 10 mm joints only');
    if (options.wall !== 'half-brick') throw new RangeError('the frog-up figure is for half-brick walls only');
    return FROG_UP_M3_PER_1000;
  }
  const perBrickMm3 = (l + j) * (h + j) * share - l * w * h;
  return (perBrickMm3 * 1000) / 1e9;
}

/** Midpoint of the 0.5–0.6 m³ trade estimating range for frogged bricks, frog up. */
export const FROG_UP_M3_PER_1000 = 0.55;

/** Wet mortar to mix for a number of bricks laid in this kind of wall, m³, with a waste allowance. */
export function mortarFor(bricks: number, options: MortarOptions & { wastePct: number }): number {
  if (!Number.isInteger(bricks) || bricks < 0) throw new RangeError(`bricks must be a whole number ≥ 0, got ${bricks}`);
  if (!Number.isFinite(options.wastePct) || options.wastePct < 0 || options.wastePct > 100) {
    throw new RangeError(`wastePct must be 0–100, got ${options.wastePct}`);
  }
  const per = mortarPerThousandBricks(options);
  return (per * bricks * (1 + options.wastePct / 100)) / 1000;
}
