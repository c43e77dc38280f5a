import { describe, expect, it } from 'vitest';
import { actualCostPence, costingSettingsSchema, priceQuote, quoteContentSchema, quotedHireWeeks } from './quotes.js';

// An invented firm and garden-wall job; every figure below is worked by hand from these.
const settings = costingSettingsSchema.parse({
  runningCosts: [{ description: 'Insurance, van and phones', monthlyPence: 25_200 }],
  workingDaysPerMonth: 21,
  travelMode: 'bands',
  travelBands: [{ upToMiles: 10, perDayPence: 1_500 }],
  travelPerMilePence: 45,
  labourRates: [],
  defaultMarginPct: 15,
  vatRegistered: true,
  vatRatePct: 20,
  quoteValidityDays: 30,
  paymentTerms: 'Balance on completion.',
  depositPct: 0,
  defaultWastePct: 0,
  defaultExclusions: null,
});
const content = quoteContentSchema.parse({
  scope: 'Rebuild the front garden wall.',
  exclusions: null,
  materials: [{ description: 'Facing brick', unit: 'brick', quantity: 660, unitPricePence: 85, wastePct: 0 }],
  labour: [
    { description: 'Bricklayer', people: 1, days: 3, dayRatePence: 22_000 },
    { description: 'Labourer', people: 1, days: 3, dayRatePence: 14_000 },
  ],
  jobDays: 3,
  distanceMiles: 8,
  accessHire: [{ description: 'Tower', weeks: 1, minimumWeeks: 1, weeklyRatePence: 9_000 }],
  marginPct: 15,
});

describe('actualCostPence', () => {
  // Source: worked by hand — materials 56,100; labour 3 × (22,000 + 14,000) = 108,000; running costs
  // 25,200 / 21 = 1,200 a day; travel 1,500 a day; tower 9,000.
  it('costs a job done as quoted at the quoted cost plus the hire', () => {
    const quoted = priceQuote(content, settings);
    expect(quoted.totals.costPence).toBe(56_100 + 108_000 + 3 * 1_200 + 3 * 1_500);
    expect(actualCostPence(content, settings, { days: 3, weatherDaysLost: 0, extraAccessPence: 0, extraMaterialsPence: 0 }))
      .toBe(quoted.totals.costPence + 9_000);
  });

  // Running costs and travel accrue on a rained-off day; the labour does not (common practice, no source).
  it('adds a day of running costs and travel for each day lost to weather, and no labour', () => {
    const base = actualCostPence(content, settings, { days: 3, weatherDaysLost: 0, extraAccessPence: 0, extraMaterialsPence: 0 });
    expect(actualCostPence(content, settings, { days: 3, weatherDaysLost: 2, extraAccessPence: 0, extraMaterialsPence: 0 }))
      .toBe(base + 2 * (1_200 + 1_500));
  });

  it('scales the labour to the days worked and adds extra hire and materials as they are', () => {
    // Source: worked by hand — 4 days: labour 144,000, running costs 4,800, travel 6,000; + 56,100 + 9,000.
    expect(actualCostPence(content, settings, { days: 4, weatherDaysLost: 0, extraAccessPence: 9_000, extraMaterialsPence: 5_000 }))
      .toBe(56_100 + 144_000 + 4_800 + 6_000 + 9_000 + 9_000 + 5_000);
  });
});

describe('travel days', () => {
  it('charges one trip a day on site when the quote gives no travel days', () => {
    expect(content.travelDays).toBeNull();
    // Source: worked by hand — 3 days on site × 1,500 a day.
    expect(priceQuote(content, settings).lines.find((l) => l.kind === 'travel')?.pence).toBe(4_500);
  });

  it('charges the travel days the quote gives, and keeps the running costs on the days on site', () => {
    // Source: worked by hand — a survey visit and a delivery run on top of 3 days on site: 5 × 1,500 = 7,500;
    // running costs 3 × 1,200 = 3,600 as before.
    const withTrips = quoteContentSchema.parse({ ...content, travelDays: 5 });
    const lines = priceQuote(withTrips, settings).lines;
    expect(lines.find((l) => l.kind === 'travel')?.pence).toBe(7_500);
    expect(lines.find((l) => l.kind === 'running-cost')?.pence).toBe(3_600);
  });

  it('carries the extra trips into the actual cost, and a lost day still costs its trip', () => {
    const withTrips = quoteContentSchema.parse({ ...content, travelDays: 5 });
    const plain = actualCostPence(content, settings, { days: 3, weatherDaysLost: 1, extraAccessPence: 0, extraMaterialsPence: 0 });
    // Source: worked by hand — the same job with two more trips (2 × 1,500) priced: 3 days + 1 lost + 2 trips = 6 trips.
    expect(actualCostPence(withTrips, settings, { days: 3, weatherDaysLost: 1, extraAccessPence: 0, extraMaterialsPence: 0 })).toBe(plain + 3_000);
  });

  it('refuses negative travel days or more than two decimal places', () => {
    expect(quoteContentSchema.safeParse({ ...content, travelDays: -1 }).success).toBe(false);
    expect(quoteContentSchema.safeParse({ ...content, travelDays: 1.234 }).success).toBe(false);
  });
});

describe('quotedHireWeeks', () => {
  const hire = quoteContentSchema.parse({
    ...content,
    accessHire: [
      { description: 'Tower, front', accessType: 'tower', weeks: 1, minimumWeeks: 2, weeklyRatePence: 9_000 },
      { description: 'Tower, back', accessType: 'tower', weeks: 3, minimumWeeks: 1, weeklyRatePence: 9_000 },
      { description: 'Scaffold', accessType: 'scaffold', weeks: 4, minimumWeeks: 1, weeklyRatePence: 20_000 },
      { description: 'Skip', weeks: 1, minimumWeeks: 1, weeklyRatePence: 6_000 },
    ],
  });

  // Source: worked by hand — each line is charged max(weeks, minimum): towers 2 + 3, scaffold 4.
  it.each([
    ['tower', 5],
    ['scaffold', 4],
    ['mewp', null],
  ] as const)('sums the charged weeks of the %s lines: %s', (accessType, expected) => {
    expect(quotedHireWeeks(hire, accessType)).toBe(expected);
  });

  it('treats a line without a kind as no kind of access', () => {
    expect(hire.accessHire[3]!.accessType).toBeNull();
    expect(quotedHireWeeks({ accessHire: [{ description: 'Old line', weeks: 2, minimumWeeks: 1, weeklyRatePence: 1 } as never] }, 'scaffold')).toBeNull();
  });
});
