import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import {
  costingSettingsSchema,
  formatPence,
  priceJob,
  quoteContentSchema,
  quotePriceInput,
  type CostingSettings,
  type QuoteContentInput,
} from '@hodboard/shared';
import QuoteBreakdown from './QuoteBreakdown.vue';

const settings: CostingSettings = costingSettingsSchema.parse({
  runningCosts: [
    { description: 'Public liability insurance', monthlyPence: 9_000 },
    { description: 'Van insurance and tax', monthlyPence: 12_000 },
    { description: 'Phones and software', monthlyPence: 4_200 },
  ],
  workingDaysPerMonth: 21,
  travelMode: 'bands',
  travelBands: [{ upToMiles: 10, perDayPence: 1_500 }, { upToMiles: 25, perDayPence: 3_000 }],
  travelPerMilePence: 45,
  labourRates: [],
  defaultMarginPct: 15,
  vatRegistered: true,
  vatRatePct: 20,
  quoteValidityDays: 30,
  paymentTerms: 'Balance within 14 days of completion.',
  depositPct: 25,
  defaultWastePct: 5,
  defaultExclusions: null,
});

const content: QuoteContentInput = {
  scope: 'Rebuild the front garden wall.',
  materials: [
    { description: 'Reclaimed red facing brick', unit: 'brick', quantity: 660, unitPricePence: 85, wastePct: 0 },
    { description: 'Mortar, 1:5 ready-mixed', unit: 'm³', quantity: 0.216, unitPricePence: 16_000, wastePct: 0 },
  ],
  labour: [
    { description: 'Bricklayer', people: 1, days: 3, dayRatePence: 22_000 },
    { description: 'Labourer', people: 1, days: 3, dayRatePence: 14_000 },
  ],
  jobDays: 3,
  distanceMiles: 8,
  accessHire: [],
  marginPct: 15,
};

function shown(wrapper: ReturnType<typeof mount>, id: string): string {
  return wrapper.get(`[data-testid="${id}"]`).text();
}

describe('QuoteBreakdown', () => {
  it('shows the totals the server saves: the same priceJob over the same input', () => {
    const wrapper = mount(QuoteBreakdown, { props: { content, settings } });
    const server = priceJob(quotePriceInput(quoteContentSchema.parse(content), settings));
    expect(shown(wrapper, 'net')).toBe(formatPence(server.totals.netPence));
    expect(shown(wrapper, 'vat')).toBe(formatPence(server.totals.vatPence));
    expect(shown(wrapper, 'gross')).toBe(formatPence(server.totals.grossPence));
    // The API test saves 242,405 p for this job (worked by hand there); the screen must say the same.
    expect(shown(wrapper, 'gross')).toBe('£2,424.05');
    expect(shown(wrapper, 'deposit')).toBe('£606.01');
  });

  it.each([
    // 175,656 × 15 % = 26,348.4 → 26,348 (down); VAT on 202,004 × 20 % = 40,400.8 → 40,401 (up).
    [15, '£2,020.04', '£404.01'],
    // 175,656 × 12.5 % = 21,957 exactly; net 197,613 × 20 % = 39,522.6 → 39,523.
    [12.5, '£1,976.13', '£395.23'],
    // 175,656 × 0.01 % = 17.5656 → 18; net 175,674 × 20 % = 35,134.8 → 35,135.
    [0.01, '£1,756.74', '£351.35'],
  ])('rounds the margin and VAT half up to whole pence at %s %% margin', (marginPct, net, vat) => {
    const wrapper = mount(QuoteBreakdown, { props: { content: { ...content, marginPct }, settings } });
    expect(shown(wrapper, 'net')).toBe(net);
    expect(shown(wrapper, 'vat')).toBe(vat);
  });

  it('prices travel on the travel days when the quote gives them, as the server does', () => {
    const withTrips = { ...content, travelDays: 5 };
    const wrapper = mount(QuoteBreakdown, { props: { content: withTrips, settings } });
    const server = priceJob(quotePriceInput(quoteContentSchema.parse(withTrips), settings));
    expect(shown(wrapper, 'gross')).toBe(formatPence(server.totals.grossPence));
    // Worked by hand: two more trips at 1,500 → cost 178,656, margin 26,798.4 → 26,798, net 205,454.
    expect(wrapper.get('[data-kind="travel"]').text()).toContain('£75.00');
    expect(shown(wrapper, 'net')).toBe('£2,054.54');
    expect(wrapper.text()).toContain('over 5 travel days');
  });

  it('adds no VAT for a firm that is not VAT registered', () => {
    const wrapper = mount(QuoteBreakdown, { props: { content, settings: { ...settings, vatRegistered: false } } });
    expect(wrapper.find('[data-testid="vat"]').exists()).toBe(false);
    expect(shown(wrapper, 'gross')).toBe(shown(wrapper, 'net'));
    expect(wrapper.text()).toContain('No VAT: the firm is not VAT registered.');
  });

  it('says what is missing instead of a price while a line is incomplete', () => {
    const wrapper = mount(QuoteBreakdown, {
      props: { content: { ...content, materials: [{ description: '', unit: 'brick', quantity: 10, unitPricePence: 85, wastePct: 0 }] }, settings },
    });
    expect(wrapper.find('[data-testid="gross"]').exists()).toBe(false);
    expect(wrapper.text()).toContain('Description is required');
  });
});
