import { describe, expect, it } from 'vitest';
import { defaultRuleSettings, type RuleSettings } from '../rules/settings.js';
import { firmRuleSettings, weatherLimitFields, weatherLimitOverridesSchema, weatherLimitsInputSchema } from './weather-limits.js';

describe('weather limit fields', () => {
  it('describe every threshold of RuleSettings but the practice', () => {
    expect(Object.keys(weatherLimitFields).sort()).toEqual(Object.keys(defaultRuleSettings).filter((k) => k !== 'practice').sort());
  });

  it.each(Object.entries(weatherLimitFields))('%s: the default sits inside its bounds and the name carries its unit', (key, field) => {
    const value = defaultRuleSettings[key as keyof RuleSettings] as number;
    expect(value).toBeGreaterThanOrEqual(field.min);
    expect(value).toBeLessThanOrEqual(field.max);
    const suffix = { 'm/s': /Ms$/, '°C': /C$/, 'mm/h': /MmPerHour$/, '%': /(Probability|Ratio)$/, h: /Hours$/, days: /Days$/, '×': /Factor$/ }[field.unit];
    expect(key).toMatch(suffix);
    expect(field.source.length).toBeGreaterThan(10);
  });
});

describe('a firm\'s overrides', () => {
  it('accepts any subset within bounds', () => {
    expect(weatherLimitOverridesSchema.parse({ mewpGustStopMs: 10, practice: 'us' })).toEqual({ mewpGustStopMs: 10, practice: 'us' });
    expect(weatherLimitOverridesSchema.parse({})).toEqual({});
  });

  it.each([
    [{ mewpGustStopMs: 0 }, 'mewpGustStopMs', /At least 1 m\/s/],
    [{ mewpGustStopMs: 90 }, 'mewpGustStopMs', /At most 40 m\/s/],
    [{ rainStopProbability: 1.2 }, 'rainStopProbability', /At most 100 %/],
    [{ frostProtectionDays: 2.5 }, 'frostProtectionDays', /whole number/],
    [{ towerMeanStopMs: '7' }, 'towerMeanStopMs', /number/],
    [{ towerLimitMph: 17 }, '', /towerLimitMph/],
    [{ cementFallingStopC: 0 }, 'cementRisingResumeC', /resume temperature/],
    [{ rainCautionMmPerHour: 1 }, 'rainCautionMmPerHour', /caution amount/],
  ])('refuses %j, naming %s', (overrides, path, message) => {
    const result = weatherLimitsInputSchema.safeParse({ overrides, version: 0 });
    expect(result.success).toBe(false);
    const issue = result.error!.issues[0]!;
    expect(issue.path.slice(1).join('.')).toBe(path);
    expect(JSON.stringify(issue)).toMatch(message);
  });
});

describe('settings from stored overrides', () => {
  it('applies what is stored on top of the defaults', () => {
    const { settings, ignored } = firmRuleSettings({ scaffoldUseGustStopMs: 15 });
    expect(settings.scaffoldUseGustStopMs).toBe(15);
    expect(settings.mewpGustStopMs).toBe(defaultRuleSettings.mewpGustStopMs);
    expect(ignored).toEqual([]);
  });

  it('drops only a stored value that no longer passes, keeping the firm\'s other limits', () => {
    const { settings, overrides, ignored } = firmRuleSettings({ mewpGustStopMs: 500, towerMeanStopMs: 6, gustiness: 2, cementRisingResumeC: 5 });
    expect(settings.mewpGustStopMs).toBe(defaultRuleSettings.mewpGustStopMs);
    expect(settings.towerMeanStopMs).toBe(6);
    expect(settings.cementRisingResumeC).toBe(defaultRuleSettings.cementRisingResumeC);
    expect(overrides).toEqual({ towerMeanStopMs: 6 });
    expect(ignored.sort()).toEqual(['cementRisingResumeC', 'gustiness', 'mewpGustStopMs']);
  });

  it('reads nothing stored as the defaults', () => {
    expect(firmRuleSettings(null).settings).toEqual(defaultRuleSettings);
    expect(firmRuleSettings([1]).settings).toEqual(defaultRuleSettings);
  });
});
