import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { afterEach, describe, expect, it } from 'vitest';
import type { MaterialDto, WallThickness } from '@hodboard/shared';
import QuoteBrickCalculator, { type BrickCalcResult } from './QuoteBrickCalculator.vue';

function mounted(wall: WallThickness, areaM2 = 10) {
  return mount(QuoteBrickCalculator, {
    props: {
      materials: [] as MaterialDto[],
      defaultWastePct: 0,
      initial: { areaM2, wall, wastePct: 0 },
      costOf: (material: MaterialDto) => material.unitPricePence,
    },
    global: { plugins: [PrimeVue] },
    attachTo: document.body,
  });
}

async function added(wrapper: ReturnType<typeof mounted>): Promise<BrickCalcResult> {
  const button = wrapper.findAll('button').find((b) => b.text().includes('Add bricks and mortar'));
  if (!button) throw new Error('no add button');
  await button.trigger('click');
  const events = wrapper.emitted('add') as BrickCalcResult[][] | undefined;
  if (!events?.[0]?.[0]) throw new Error('the calculator added nothing');
  return events[0][0];
}

describe('QuoteBrickCalculator', () => {
  afterEach(() => {
    document.body.innerHTML = '';
  });

  it.each([
    // Source: worked calculation — 10 m² × 60 = 600 bricks × 0.29725 m³ per 1000 = 0.17835, rounded up to 0.179 m³.
    ['half-brick', 600, 0.179, 'Stretcher bond'],
    // Source: worked calculation — 10 m² × 120 = 1,200 bricks × 0.381625 m³ per 1000 (collar joint included) = 0.45795 → 0.458 m³.
    ['one-brick', 1_200, 0.458, 'headers'],
  ] as const)('works out a %s wall: %i bricks and %f m³ of mortar', async (wall, bricks, mortarM3, hint) => {
    const wrapper = mounted(wall);
    const answer = wrapper.get('[data-testid="calc-answer"]').text();
    expect(answer).toContain(`${bricks.toLocaleString('en-GB')} bricks`);
    expect(answer).toContain(`${mortarM3} m³ of mortar`);
    expect(wrapper.text()).toContain(hint);
    const result = await added(wrapper);
    expect(result.calc).toEqual({ areaM2: 10, wall, wastePct: 0 });
    expect(result.bricks.quantity).toBe(bricks);
    expect(result.mortar.quantity).toBe(mortarM3);
  });
});
