import { describe, expect, it } from 'vitest';
import { assessDay, type DayAssessment } from './assess-day.js';
import { DAY, DAY_AND_48H, FULL_HOURS, hourlyForecast, inWindow, WINDOW, type HourValues } from './fixtures/forecast-builder.js';
import { defaultRuleSettings, resolveRuleSettings, type RuleSettings } from './settings.js';
import { SOURCES } from './sources.js';
import { fToC } from './units.js';

function pour(at: (h: number) => Partial<HourValues>, settings: RuleSettings = defaultRuleSettings, hours = FULL_HOURS): DayAssessment {
  return assessDay({ activities: ['concrete'], forecast: hourlyForecast(DAY, hours, at), window: WINDOW, settings });
}
const find = (d: DayAssessment, id: string) => d.activities[0]?.reasons.find((r) => r.ruleId === id);
const note = (d: DayAssessment, id: string) => d.activities[0]?.notes.find((n) => n.ruleId === id);

describe('concrete reason wording', () => {
  it.each([
    ['cold.concrete.freezing', (h: number) => (inWindow(h) ? { tempC: -1 } : {})], // Source: common practice, no source — no pour into freezing air
    ['cold.concrete.uk-discharge', (h: number) => (inWindow(h) ? { tempC: 4 } : {})], // Source: BS 8500 / BS EN 206, at least 5 °C at discharge (hanson.co.uk)
    ['cold.concrete.aci306', (h: number) => (h === 30 ? { tempC: 2 } : {})], // Source: ACI 306R (concrete.org), at or below 40 °F in the protection period
  ] as const)('%s defers to the supplier, the specifier and the competent person', (ruleId, at) => {
    const day = pour(at);
    expect(find(day, ruleId)?.message).toMatch(/Follow the concrete supplier’s and the specifier’s guidance and local regulations, and check with the site’s competent person\.$/);
    expect(day.activities[0]?.advice[0]).toMatch(/concrete supplier’s and the specifier’s guidance on curing and protection, and the site’s competent person/);
  });
});

describe('concrete in cold weather', () => {
  it.each([
    [5.01, 'none'], // Source: BS 8500 / BS EN 206, at least 5 °C at discharge (hanson.co.uk)
    [5, 'none'], // Source: BS 8500 / BS EN 206, at least 5 °C at discharge (hanson.co.uk)
    [4.99, 'caution'], // Source: BS 8500 / BS EN 206, at least 5 °C at discharge (hanson.co.uk)
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

  it.each([
    [8 + 71, 'caution'], // Source: ACI 306R (concrete.org) — expected below 40 °F during the protection period; 72 h period from memory: the hour 71–72 h after the 08:00 start is inside
    [8 + 72, 'none'], // Source: ACI 306R (concrete.org); 72 h period from memory: the hour starting 72 h after the start is outside
  ])('a cold hour at forecast hour %d, at the +72 h edge of the protection period → %s', (h, expected) => {
    const r = find(pour((i) => (i === h ? { tempC: 1 } : {})), 'cold.concrete.aci306');
    if (expected === 'none') expect(r).toBeUndefined();
    else expect(r).toMatchObject({ verdict: 'caution', observed: 1, at: '2026-03-05T07:00:00.000Z' });
  });

  it('notes the end of the 72 h protection period past the day and the next 48 h, without lowering the verdict', () => {
    // Source: ACI 306R (concrete.org); 72 h protection period from memory. The standard 72 h forecast from midnight stops 64 h after the 08:00 start,
    // past the horizon 48 h after the 17:00 end of the window (Hodboard rule: a note, not a caution)
    const day = pour(() => ({}), defaultRuleSettings, DAY_AND_48H);
    expect(find(day, 'cold.concrete.aci306')).toBeUndefined();
    expect(find(day, 'forecast.reach.concrete-protection')).toBeUndefined();
    expect(day.verdict).toBe('go');
    expect(note(day, 'forecast.reach.concrete-protection')).toEqual({
      ruleId: 'forecast.reach.concrete-protection',
      message: 'The forecast reaches 64 h of the 72 h the concrete protection rule (ACI 306R) looks ahead (none yet for 2026-03-05 00:00 UTC to 2026-03-05 08:00 UTC); check it again nearer the day.',
      source: SOURCES.forecastBeyond,
      uncovered: [{ from: '2026-03-05T00:00:00.000Z', to: '2026-03-05T08:00:00.000Z' }],
    });
    expect(note(pour(() => ({})), 'forecast.reach.concrete-protection')).toBeUndefined();
  });

  it('gives a caution when the forecast ends within the day and the next 48 h, and notes the rest of the period', () => {
    // Source: ACI 306R (concrete.org); 72 h period from memory. 60 h from midnight end at 12:00 on 4 March, 5 h before the horizon (Hodboard rule)
    const day = pour(() => ({}), defaultRuleSettings, 60);
    const r = find(day, 'forecast.reach.concrete-protection');
    expect(r).toMatchObject({ verdict: 'caution', threshold: 57, observed: 52, source: SOURCES.forecastReach, uncovered: [{ from: '2026-03-04T12:00:00.000Z', to: '2026-03-04T17:00:00.000Z' }] });
    expect(r?.message).toMatch(/52–57 h after the working window starts \(2026-03-04 12:00 UTC to 2026-03-04 17:00 UTC\)/);
    expect(r?.message).toMatch(/check with the site’s competent person\.$/);
    expect(note(day, 'forecast.reach.concrete-protection')?.uncovered).toEqual([{ from: '2026-03-04T17:00:00.000Z', to: '2026-03-05T08:00:00.000Z' }]);
    expect(day.verdict).toBe('caution');
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
