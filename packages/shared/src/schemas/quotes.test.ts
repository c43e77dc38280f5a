import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  accessChargedWeeks,
  actualCostPence,
  breakdownLevels,
  clientLines,
  costingSettingsSchema,
  depositPence,
  materialCostPence,
  priceQuote,
  quoteContentSchema,
  quotedHireWeeks,
  quotePriceInput,
  travelPerDayPence,
} from './quotes.js';

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

describe('travelPerDayPence', () => {
  const bands = { travelMode: 'bands' as const, travelBands: [{ upToMiles: 10, perDayPence: 1_500 }, { upToMiles: 25, perDayPence: 3_000 }], travelPerMilePence: 45 };
  const perMile = { ...bands, travelMode: 'per-mile' as const };

  // Source: worked by hand from the bands — each covers distances up to and including its miles; the last covers anything further.
  it.each([
    [0, 0],
    [8, 1_500],
    [10, 1_500],
    [10.1, 3_000],
    [25, 3_000],
    [40, 3_000],
  ])('charges %f miles out at %i p a day by distance band', (miles, expected) => {
    expect(travelPerDayPence(bands, miles)).toBe(expected);
  });

  // Source: worked by hand — the return trip, miles × 2 × the rate, rounded half up to whole pence.
  it.each([
    [0, 45, 0],
    [8, 45, 720], // 8 × 2 × 45
    [12.3, 45, 1_107], // 12.3 × 2 × 45 = 1,107 exactly
    [0.1, 33, 7], // 0.1 × 2 × 33 = 6.6 → 7
    [0.1, 32, 6], // 0.1 × 2 × 32 = 6.4 → 6
  ])('charges %f miles out at %i p a mile as %i p a day', (miles, rate, expected) => {
    expect(travelPerDayPence({ ...perMile, travelPerMilePence: rate }, miles)).toBe(expected);
  });

  it('prices the quote with the travel of its distance', () => {
    const far = quoteContentSchema.parse({ ...content, distanceMiles: 18 });
    expect(quotePriceInput(far, costingSettingsSchema.parse({ ...settings, ...bands })).travelPerDayPence).toBe(3_000);
  });
});

describe('accessChargedWeeks', () => {
  // Source: scaffold hire terms charge an included minimum period, then by the week (trade-rules §7:
  // londonscaffolds.co.uk/terms, secondary copy); the figures are worked by hand.
  it.each([
    [1, 2, 2],
    [2, 2, 2],
    [3, 2, 3],
    [2, 0, 2],
  ])('charges %i weeks with a %i-week minimum as %i weeks', (weeks, minimumWeeks, expected) => {
    expect(accessChargedWeeks({ weeks, minimumWeeks })).toBe(expected);
  });

  it('prices a hire line shorter than the minimum at the minimum weeks, passed through without margin', () => {
    const short = quoteContentSchema.parse({ ...content, accessHire: [{ description: 'Tower', weeks: 1, minimumWeeks: 2, weeklyRatePence: 9_000 }] });
    const priced = priceQuote(short, settings);
    // Source: worked by hand — 2 weeks × 9,000; the margin is 15 % of the cost lines only.
    expect(priced.lines.filter((l) => l.kind === 'access')).toEqual([{ kind: 'access', description: 'Tower, 2 weeks', pence: 18_000 }]);
    expect(priced.totals.netPence).toBe(priced.totals.costPence + priced.totals.marginPence + 18_000);
  });
});

describe('materialCostPence', () => {
  const registered = { vatRegistered: true, vatRatePct: 20 };
  const notRegistered = { vatRegistered: false, vatRatePct: 20 };

  it('costs a registered firm the price before VAT, which it reclaims', () => {
    // Source: HMRC, "What you can and can't reclaim VAT on" (hmrc.gov.uk/vat/managing/reclaiming/reclaim.htm):
    // VAT paid on goods bought for the business is input tax and can be reclaimed.
    expect(materialCostPence({ unitPricePence: 1_000, isVatable: true }, registered)).toBe(1_000);
  });

  it.each([
    [1_000, 20, 1_200], // 1,000 + 20 %
    [85, 20, 102], // 85 × 1.2 = 102 exactly
    [33, 20, 40], // 33 × 1.2 = 39.6 → 40
    [1_010, 5, 1_061], // 1,010 × 1.05 = 1,060.5 → 1,061 (half up)
  ])('costs a firm that is not registered %i p plus the VAT it cannot reclaim at %i %%: %i p', (price, ratePct, expected) => {
    // Source: only VAT-registered businesses can reclaim input VAT (sterlingandwells.com summary of HMRC
    // guidance, secondary copy); rates 20 % and 5 % (gov.uk/vat-rates, secondary copy); rounding to the nearer
    // penny is one of the methods VAT Notice 700 para 17.5 allows (gov.uk HMRC manual VATREC12010).
    expect(materialCostPence({ unitPricePence: price, isVatable: true }, { ...notRegistered, vatRatePct: ratePct })).toBe(expected);
  });

  it('adds nothing for an item without VAT, registered or not', () => {
    // Source: worked by hand — no VAT is charged on it, so there is none to bear or reclaim.
    expect(materialCostPence({ unitPricePence: 1_000, isVatable: false }, notRegistered)).toBe(1_000);
    expect(materialCostPence({ unitPricePence: 1_000, isVatable: false }, registered)).toBe(1_000);
  });
});

describe('clientLines', () => {
  const withTower = quoteContentSchema.parse({ ...content, accessHire: [{ description: 'Tower', weeks: 1, minimumWeeks: 1, weeklyRatePence: 9_000 }] });
  const breakdown = priceQuote(withTower, settings);

  it('shows the worked example at each level, every one adding up to the price before VAT', () => {
    // Source: worked by hand — cost 56,100 + 108,000 + 3,600 + 4,500 = 172,200; margin 15 % = 25,830;
    // tower 9,000 passed through: net 207,030. Running costs, travel and margin travel with the labour.
    expect(breakdown.totals.netPence).toBe(207_030);
    expect(clientLines(breakdown, 'total')).toEqual([{ description: 'The work described above', pence: 207_030 }]);
    expect(clientLines(breakdown, 'sections')).toEqual([
      { description: 'Materials', pence: 56_100 },
      { description: 'Labour, travel and site costs', pence: 108_000 + 3_600 + 4_500 + 25_830 },
      { description: 'Access equipment hire', pence: 9_000 },
    ]);
    expect(clientLines(breakdown, 'lines')).toEqual([
      { description: 'Facing brick', pence: 56_100 },
      { description: 'Bricklayer', pence: 66_000 },
      { description: 'Labourer', pence: 42_000 },
      { description: 'Travel, site running costs and overheads', pence: 3_600 + 4_500 + 25_830 },
      { description: 'Tower, 1 week', pence: 9_000 },
    ]);
  });

  const contentArb = fc.record({
    materials: fc.array(
      fc.record({
        description: fc.constant('Material'),
        unit: fc.constant('each'),
        quantity: fc.integer({ min: 1, max: 500_000 }).map((n) => n / 1000),
        unitPricePence: fc.integer({ min: 0, max: 50_000 }),
        wastePct: fc.integer({ min: 0, max: 2_000 }).map((n) => n / 100),
      }),
      { maxLength: 5 },
    ),
    labour: fc.array(
      fc.record({
        description: fc.constant('Labour'),
        people: fc.integer({ min: 1, max: 4 }),
        days: fc.integer({ min: 25, max: 2_000 }).map((n) => n / 100),
        dayRatePence: fc.integer({ min: 0, max: 40_000 }),
      }),
      { maxLength: 3 },
    ),
    jobDays: fc.integer({ min: 50, max: 3_000 }).map((n) => n / 100),
    travelDays: fc.option(fc.integer({ min: 0, max: 3_000 }).map((n) => n / 100)),
    distanceMiles: fc.integer({ min: 0, max: 600 }).map((n) => n / 10),
    accessHire: fc.array(
      fc.record({
        description: fc.constant('Hire'),
        weeks: fc.integer({ min: 1, max: 12 }),
        minimumWeeks: fc.integer({ min: 0, max: 8 }),
        weeklyRatePence: fc.integer({ min: 0, max: 40_000 }),
      }),
      { maxLength: 3 },
    ),
    marginPct: fc.integer({ min: 0, max: 6_000 }).map((n) => n / 100),
    vatRegistered: fc.boolean(),
  });

  it('adds up to the price before VAT at every level, whatever the quote, and never shows the margin', () => {
    // Source: the rule itself (every level must total the net price; margin, running costs and travel travel with the labour).
    fc.assert(
      fc.property(contentArb, ({ vatRegistered, ...lines }) => {
        const quote = quoteContentSchema.parse({ ...content, ...lines });
        const priced = priceQuote(quote, costingSettingsSchema.parse({ ...settings, vatRegistered }));
        for (const level of breakdownLevels) {
          const shown = clientLines(priced, level);
          expect(shown.reduce((t, l) => t + l.pence, 0)).toBe(priced.totals.netPence);
          expect(shown.some((l) => /margin/i.test(l.description))).toBe(false);
        }
      }),
    );
  });
});

describe('depositPence', () => {
  // Source: worked by hand — the deposit is a share of the price the client pays, VAT included, rounded half up.
  it.each([
    [242_405, 25, 60_601], // 60,601.25 → 60,601 (the API test's quote)
    [100_000, 33.33, 33_330],
    [5, 10, 1], // 0.5 p → 1 p
    [4, 10, 0], // 0.4 p → 0 p
    [242_405, 0, 0],
    [242_405, 100, 242_405],
  ])('takes %i p at %f %% as %i p', (gross, pct, expected) => {
    expect(depositPence(gross, pct)).toBe(expected);
  });
});
