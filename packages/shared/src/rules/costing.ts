import { z } from 'zod';

/**
 * Money is integer pence. Quantities, days and percentages are decimals with a fixed number
 * of places, so every line is an exact fraction: it is rounded once, half up, to whole pence,
 * and every total is the sum of its rounded lines.
 */
const pence = z.number().int().min(0).max(1_000_000_000_00);
const places = (dp: number) => (v: number) => Math.abs(Math.round(v * 10 ** dp) - v * 10 ** dp) < 1e-6;
const decimal = (dp: number, max: number) =>
  z.number().finite().min(0).max(max).refine(places(dp), { message: `use at most ${dp} decimal places` });

export const priceJobInputSchema = z.object({
  materials: z
    .array(
      z.object({
        description: z.string().min(1).max(200),
        quantity: decimal(3, 10_000_000),
        unitPricePence: pence,
        wastePct: decimal(2, 100),
      }),
    )
    .max(500),
  labour: z
    .array(
      z.object({
        description: z.string().min(1).max(200),
        people: z.number().int().min(1).max(50),
        days: decimal(2, 10_000),
        dayRatePence: pence,
      }),
    )
    .max(100),
  /** Working days on site: the running cost is charged per day, and travel too unless travelDays is given. */
  jobDays: decimal(2, 10_000),
  /** Days travelled to the site, when they differ from the days on site (a survey visit, deliveries, snagging). */
  travelDays: decimal(2, 10_000).optional(),
  runningCosts: z.object({
    monthly: z.array(z.object({ description: z.string().min(1).max(200), pence })).max(100),
    /** Working days a month the fixed costs are spread over. */
    workingDaysPerMonth: decimal(2, 31).refine((v) => v > 0, { message: 'must be more than 0' }),
  }),
  travelPerDayPence: pence,
  marginPct: decimal(2, 1000),
  accessHire: z.array(z.object({ description: z.string().min(1).max(200), pence })).max(50),
  vat: z.object({ registered: z.boolean(), ratePct: decimal(2, 100) }),
});

export type PriceJobInput = z.infer<typeof priceJobInputSchema>;

export type PriceLineKind = 'materials' | 'labour' | 'running-cost' | 'travel' | 'margin' | 'access' | 'vat';

export interface PriceLine {
  kind: PriceLineKind;
  description: string;
  pence: number;
}

export interface PriceTotals {
  /** Materials, labour, running cost and travel. */
  costPence: number;
  marginPence: number;
  accessPence: number;
  /** Cost + margin + access: the price before VAT. */
  netPence: number;
  vatPence: number;
  grossPence: number;
}

export interface PriceBreakdown {
  lines: PriceLine[];
  totals: PriceTotals;
}

export const defaultVatRatePct = 20;

function scaled(v: number, dp: number): bigint {
  return BigInt(Math.round(v * 10 ** dp));
}

/** num / den rounded half up; both non-negative. */
function roundHalfUp(num: bigint, den: bigint): number {
  return Number((num * 2n + den) / (den * 2n));
}

function pct(amount: number, ratePct: number): number {
  return roundHalfUp(BigInt(amount) * scaled(ratePct, 2), 10_000n);
}

const sum = (ls: readonly PriceLine[]): number => ls.reduce((t, l) => t + l.pence, 0);

/** Prices a job: cost lines, margin on them, access hire passed through, then VAT if registered. */
export function priceJob(input: PriceJobInput): PriceBreakdown {
  const parsed = priceJobInputSchema.safeParse(input);
  if (!parsed.success) {
    throw new RangeError(`price input: ${parsed.error.issues.map((i) => `${i.path.join('.')} ${i.message}`).join('; ')}`);
  }
  const v = parsed.data;
  const cost: PriceLine[] = [];
  for (const m of v.materials) {
    // quantity (3 dp) × unit price × (100 % + waste %, 2 dp)
    const num = scaled(m.quantity, 3) * BigInt(m.unitPricePence) * (10_000n + scaled(m.wastePct, 2));
    cost.push({ kind: 'materials', description: m.description, pence: roundHalfUp(num, 1000n * 10_000n) });
  }
  for (const l of v.labour) {
    const num = BigInt(l.people) * scaled(l.days, 2) * BigInt(l.dayRatePence);
    cost.push({ kind: 'labour', description: l.description, pence: roundHalfUp(num, 100n) });
  }
  const monthly = v.runningCosts.monthly.reduce((t, c) => t + c.pence, 0);
  if (monthly > 0 && v.jobDays > 0) {
    const num = BigInt(monthly) * scaled(v.jobDays, 2);
    const den = scaled(v.runningCosts.workingDaysPerMonth, 2);
    cost.push({ kind: 'running-cost', description: 'Running costs for the days on site', pence: roundHalfUp(num, den) });
  }
  const travelDays = v.travelDays ?? v.jobDays;
  if (v.travelPerDayPence > 0 && travelDays > 0) {
    cost.push({ kind: 'travel', description: 'Travel', pence: roundHalfUp(BigInt(v.travelPerDayPence) * scaled(travelDays, 2), 100n) });
  }
  const costPence = sum(cost);
  const margin: PriceLine = { kind: 'margin', description: `Margin ${v.marginPct} %`, pence: pct(costPence, v.marginPct) };
  const access: PriceLine[] = v.accessHire.map((a) => ({ kind: 'access', description: a.description, pence: a.pence }));
  const accessPence = sum(access);
  const netPence = costPence + margin.pence + accessPence;
  const lines: PriceLine[] = [...cost, margin, ...access];
  let vatPence = 0;
  if (v.vat.registered) {
    vatPence = pct(netPence, v.vat.ratePct);
    lines.push({ kind: 'vat', description: `VAT ${v.vat.ratePct} %`, pence: vatPence });
  }
  return {
    lines,
    totals: { costPence, marginPence: margin.pence, accessPence, netPence, vatPence, grossPence: netPence + vatPence },
  };
}
