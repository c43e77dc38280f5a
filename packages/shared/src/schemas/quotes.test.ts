import { describe, expect, it } from 'vitest';
import { actualCostPence, costingSettingsSchema, priceQuote, quoteContentSchema } from './quotes.js';

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
