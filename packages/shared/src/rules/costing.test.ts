import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { defaultVatRatePct, priceJob, priceJobInputSchema, type PriceJobInput } from './costing.js';

// An invented garden-wall job for an invented firm, worked by hand below.
const wallJob: PriceJobInput = {
  materials: [
    { description: 'Facing bricks', quantity: 660, unitPricePence: 85, wastePct: 0 },
    { description: 'Building sand (t)', quantity: 1.25, unitPricePence: 4_650, wastePct: 5 },
    { description: 'Cement, 25 kg bags', quantity: 9, unitPricePence: 725, wastePct: 12.5 },
  ],
  labour: [
    { description: 'Bricklayers', people: 2, days: 3.5, dayRatePence: 20_000 },
    { description: 'Labourer', people: 1, days: 3.5, dayRatePence: 14_000 },
  ],
  jobDays: 3.5,
  runningCosts: {
    monthly: [
      { description: 'Public liability insurance', pence: 18_500 },
      { description: 'Vehicle tax', pence: 2_600 },
      { description: 'Vehicle insurance', pence: 12_900 },
    ],
    workingDaysPerMonth: 21,
  },
  travelPerDayPence: 1_850,
  marginPct: 15,
  accessHire: [{ description: 'Scaffold, 2 weeks', pence: 48_000 }],
  vat: { registered: true, ratePct: 20 },
};

describe('priceJob', () => {
  it('prices the worked example to the penny', () => {
    // Source: worked by hand for this test (rounding half up once per line)
    const p = priceJob(wallJob);
    expect(p.lines.map((l) => [l.kind, l.pence])).toEqual([
      ['materials', 56_100], // 660 × 85
      ['materials', 6_103], // 1.25 × 4650 × 1.05 = 6103.125
      ['materials', 7_341], // 9 × 725 × 1.125 = 7340.625
      ['labour', 140_000], // 2 × 3.5 × 20000
      ['labour', 49_000], // 1 × 3.5 × 14000
      ['running-cost', 5_667], // 34000 × 3.5 / 21 = 5666.67
      ['travel', 6_475], // 1850 × 3.5
      ['margin', 40_603], // 15 % of 270686 = 40602.9
      ['access', 48_000], // passed through, no margin
      ['vat', 71_858], // 20 % of 359289 = 71857.8
    ]);
    expect(p.totals).toEqual({
      costPence: 270_686,
      marginPence: 40_603,
      accessPence: 48_000,
      netPence: 359_289,
      vatPence: 71_858,
      grossPence: 431_147,
    });
  });

  it('charges travel on its own days when given, and the running costs still on the days on site', () => {
    // Source: worked by hand — travel 1850 × 5 = 9250 in place of 1850 × 3.5 = 6475; running costs stay 5667.
    const p = priceJob({ ...wallJob, travelDays: 5 });
    const line = (kind: string) => p.lines.find((l) => l.kind === kind)?.pence;
    expect(line('travel')).toBe(9_250);
    expect(line('running-cost')).toBe(5_667);
    expect(p.totals.costPence).toBe(270_686 - 6_475 + 9_250);
    expect(priceJob({ ...wallJob, travelDays: 0 }).lines.some((l) => l.kind === 'travel')).toBe(false);
    expect(priceJob({ ...wallJob, travelDays: 3.5 })).toEqual(priceJob(wallJob));
  });

  // Source: GOV.UK, "VAT rates" (gov.uk/vat-rates): the standard rate is 20 %, in force since 4 January 2011.
  it('starts a new firm on the UK standard rate of VAT', () => {
    expect(defaultVatRatePct).toBe(20);
  });

  it('charges no VAT when the firm is not registered', () => {
    const p = priceJob({ ...wallJob, vat: { registered: false, ratePct: 20 } });
    expect(p.totals.vatPence).toBe(0);
    expect(p.totals.grossPence).toBe(359_289);
    expect(p.lines.some((l) => l.kind === 'vat')).toBe(false);
  });

  it.each([
    [1, 1, 50, 2], // Source: rounding rule — 1.5 p rounds half up to 2 p
    [1, 1, 49.99, 1], // Source: rounding rule — 1.4999 p rounds to 1 p
    [0.001, 500, 0, 1], // Source: rounding rule — 0.5 p rounds half up to 1 p
    [3, 333, 0, 999], // Source: exact, no rounding
  ])('rounds %f × %i p with %f %% waste half up to %i p', (quantity, unitPricePence, wastePct, expected) => {
    const p = priceJob({ ...wallJob, materials: [{ description: 'x', quantity, unitPricePence, wastePct }] });
    expect(p.lines[0]?.pence).toBe(expected);
  });

  it('refuses floating-point money and unknown shapes with a clear error', () => {
    expect(() => priceJob({ ...wallJob, travelPerDayPence: 18.5 })).toThrow(/travelPerDayPence/);
    expect(() => priceJob({ ...wallJob, marginPct: 12.345 })).toThrow(/decimal places/);
    expect(() => priceJob({ ...wallJob, runningCosts: { ...wallJob.runningCosts, workingDaysPerMonth: 0 } })).toThrow(/more than 0/);
  });

  const jobArb = fc.record({
    materials: fc.array(
      fc.record({
        description: fc.constant('m'),
        quantity: fc.integer({ min: 0, max: 5_000_000 }).map((n) => n / 1000),
        unitPricePence: fc.integer({ min: 0, max: 100_000 }),
        wastePct: fc.integer({ min: 0, max: 3_000 }).map((n) => n / 100),
      }),
      { maxLength: 6 },
    ),
    labour: fc.array(
      fc.record({
        description: fc.constant('l'),
        people: fc.integer({ min: 1, max: 6 }),
        days: fc.integer({ min: 0, max: 6_000 }).map((n) => n / 100),
        dayRatePence: fc.integer({ min: 0, max: 60_000 }),
      }),
      { maxLength: 4 },
    ),
    jobDays: fc.integer({ min: 0, max: 6_000 }).map((n) => n / 100),
    runningCosts: fc.record({
      monthly: fc.array(fc.record({ description: fc.constant('r'), pence: fc.integer({ min: 0, max: 500_000 }) }), { maxLength: 5 }),
      workingDaysPerMonth: fc.integer({ min: 100, max: 2_300 }).map((n) => n / 100),
    }),
    travelPerDayPence: fc.integer({ min: 0, max: 10_000 }),
    marginPct: fc.integer({ min: 0, max: 5_000 }).map((n) => n / 100),
    accessHire: fc.array(fc.record({ description: fc.constant('a'), pence: fc.integer({ min: 0, max: 500_000 }) }), { maxLength: 3 }),
    vat: fc.record({ registered: fc.boolean(), ratePct: fc.constantFrom(0, 5, 20) }),
  });

  it('makes every total the sum of its lines', () => {
    fc.assert(
      fc.property(jobArb, (job) => {
        expect(priceJobInputSchema.safeParse(job).success).toBe(true);
        const p = priceJob(job);
        const by = (k: string) => p.lines.filter((l) => l.kind === k).reduce((t, l) => t + l.pence, 0);
        for (const l of p.lines) expect(Number.isInteger(l.pence)).toBe(true);
        expect(p.totals.grossPence).toBe(p.lines.reduce((t, l) => t + l.pence, 0));
        expect(p.totals.costPence).toBe(by('materials') + by('labour') + by('running-cost') + by('travel'));
        expect(p.totals.marginPence).toBe(by('margin'));
        expect(p.totals.accessPence).toBe(by('access'));
        expect(p.totals.vatPence).toBe(by('vat'));
        expect(p.totals.netPence).toBe(p.totals.costPence + p.totals.marginPence + p.totals.accessPence);
      }),
    );
  });

  it('never prices a longer job lower', () => {
    fc.assert(
      fc.property(jobArb, fc.integer({ min: 1, max: 2_000 }).map((n) => n / 100), (job, extra) => {
        const longer: PriceJobInput = {
          ...job,
          jobDays: Math.round((job.jobDays + extra) * 100) / 100,
          labour: job.labour.map((l) => ({ ...l, days: Math.round((l.days + extra) * 100) / 100 })),
        };
        expect(priceJob(longer).totals.grossPence).toBeGreaterThanOrEqual(priceJob(job).totals.grossPence);
      }),
    );
  });
});
