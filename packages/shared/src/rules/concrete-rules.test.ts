import { describe, expect, it } from 'vitest';
import { assessDay, type DayAssessment } from './assess-day.js';
import { DAY, hourlyForecast, inWindow, WINDOW, type HourValues } from './fixtures/forecast-builder.js';
import { defaultRuleSettings, resolveRuleSettings, type RuleSettings } from './settings.js';
import { fToC } from './units.js';

function pour(at: (h: number) => Partial<HourValues>, settings: RuleSettings = defaultRuleSettings): DayAssessment {
  return assessDay({ activities: ['concrete'], forecast: hourlyForecast(DAY, 72, at), window: WINDOW, settings });
}
const find = (d: DayAssessment, id: string) => d.activities[0]?.reasons.find((r) => r.ruleId === id);

describe('concrete in cold weather', () => {
  it.each([
    [5, 'none'], // Source: BS 8500-2 / BS EN 206, at least 5 °C at discharge (hanson.co.uk)
    [4.99, 'caution'], // Source: BS 8500-2 / BS EN 206, at least 5 °C at discharge (hanson.co.uk)
  ] as const)('air of %f °C in the window → UK discharge rule %s', (t, expected) => {
    const r = find(pour((h) => (inWindow(h) ? { tempC: t } : {})), 'cold.concrete.uk-discharge');
    if (expected === 'none') expect(r).toBeUndefined();
    else expect(r).toMatchObject({ verdict: 'caution', threshold: 5, observed: t });
  });

  it.each([
    [fToC(40) + 0.01, 'none'], // Source: ACI 306R (concrete.org) — fallen to, or expected below, 40 °F
    [fToC(40), 'caution'], // Source: ACI 306R (concrete.org) — fallen to 40 °F
    [fToC(40) - 0.01, 'caution'], // Source: ACI 306R (concrete.org) — below 40 °F
  ])('a night at %f °C within the protection period → ACI 306R cold weather %s', (t, expected) => {
    const r = find(pour((h) => (h === 30 ? { tempC: t } : {})), 'cold.concrete.aci306');
    if (expected === 'none') expect(r).toBeUndefined();
    else expect(r).toMatchObject({ verdict: 'caution', at: '2026-03-03T06:00:00.000Z' });
  });

  it('judges ACI 306R cold weather under US practice too, without the UK discharge rule', () => {
    const day = pour((h) => (h === 30 ? { tempC: 2 } : inWindow(h) ? { tempC: 4 } : {}), resolveRuleSettings({ practice: 'us' }));
    expect(find(day, 'cold.concrete.aci306')).toBeDefined();
    expect(find(day, 'cold.concrete.uk-discharge')).toBeUndefined();
  });

  it.each([
    [0.01, 'go'], // Source: common practice, no source — no pour into freezing air
    [0, 'stop'], // Source: common practice, no source — no pour into freezing air
    [-0.01, 'stop'], // Source: common practice, no source — no pour into freezing air
  ] as const)('air of %f °C all day → pour %s', (t, expected) => {
    const day = pour((h) => (inWindow(h) ? { tempC: t } : {}), resolveRuleSettings({}));
    const r = find(day, 'cold.concrete.freezing');
    if (expected === 'go') expect(r).toBeUndefined();
    else {
      expect(r?.verdict).toBe('stop');
      expect(day.verdict).toBe('stop');
    }
  });
});
