import { describe, expect, it } from 'vitest';
import type { Activity } from './activities.js';
import { assessDay, type DayAssessment } from './assess-day.js';
import { DAY, hourlyForecast, inWindow, WINDOW } from './fixtures/forecast-builder.js';

function wet(activity: Activity, precipMm: number, precipProbability: number): DayAssessment {
  const forecast = hourlyForecast(DAY, 72, (h) => (inWindow(h) ? { precipMm, precipProbability } : {}));
  return assessDay({ activities: [activity], forecast, window: WINDOW });
}
const find = (d: DayAssessment, id: string) => d.activities[0]?.reasons.find((r) => r.ruleId === id);

describe('rain on fresh work', () => {
  it.each([
    [0.5, 0.5, 'stop'], // Source: common practice, no source — 0.5 mm/h at 50 % stops fresh mortar work
    [0.51, 0.51, 'stop'], // Source: common practice, no source
    [0.49, 0.9, 'caution'], // Source: common practice, no source — below the amount
    [2, 0.49, 'caution'], // Source: common practice, no source — below the probability
    [0.1, 0, 'caution'], // Source: common practice, no source — any measurable rain, cover the work
    [0.09, 0.29, 'none'], // Source: common practice, no source — below both caution thresholds
    [0, 0.3, 'caution'], // Source: common practice, no source — 30 % chance, keep covers ready
  ] as const)('%f mm/h at %f probability → %s', (mm, p, expected) => {
    for (const a of ['bricklaying', 'pointing', 'rendering', 'concrete'] as const) {
      const r = find(wet(a, mm, p), 'rain.fresh-work');
      if (expected === 'none') expect(r).toBeUndefined();
      else {
        expect(r?.verdict).toBe(expected);
        expect(r?.message).toMatch(/cover the work whenever it stops/);
      }
    }
  });

  it('stops the day when rain covers the whole window', () => {
    const day = wet('rendering', 1.2, 0.8);
    expect(day.verdict).toBe('stop');
    expect(day.activities[0]?.usableHours).toBe(0);
  });

  it('does not hold up dry trades', () => {
    expect(wet('mewp', 3, 1).verdict).toBe('go');
  });
});

describe('heavy rain on groundworks', () => {
  it.each([
    [3.99, 'go'], // Source: Met Office heavy rain above 4 mm/h — from memory
    [4, 'caution'], // Source: Met Office heavy rain above 4 mm/h — from memory; at 4 counted (common practice)
    [4.01, 'caution'], // Source: Met Office heavy rain above 4 mm/h — from memory
  ] as const)('%f mm/h → %s', (mm, expected) => {
    const day = wet('groundworks', mm, 1);
    expect(day.verdict).toBe(expected);
    if (expected === 'caution') expect(find(day, 'rain.groundworks')?.message).toMatch(/competent person/);
  });
});
