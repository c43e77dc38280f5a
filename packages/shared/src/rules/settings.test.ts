import { describe, expect, it } from 'vitest';
import { defaultRuleSettings, resolveRuleSettings, ruleSettingsOverrideSchema, ruleSettingsSchema } from './settings.js';
import { msToMph } from './units.js';

const speedDefaults = [
  ['mewpGustStopMs', 12.5, 'm/s'], // Source: BS EN 280:2001+A2:2009 rated wind speed (IPAF FAQ 5848, secondary copy)
  ['towerMeanStopMs', 17, 'mph'], // Source: PASMA FAQ (pasma.co.uk/faqs/safety), average 17 mph
  ['roofBalanceMeanCautionMs', 23, 'mph'], // Source: HSE roof-work FAQ, 23 mph (force 5) affects balance (secondary copy)
  ['roofMeanStopMs', 23, 'mph'], // Source: NFRC windy-conditions guidance, slates/tiles/felt mean 23 mph (secondary copy)
  ['roofGustStopMs', 35, 'mph'], // Source: NFRC windy-conditions guidance, gusting 35 mph (secondary copy)
  ['sheetMeanStopMs', 17, 'mph'], // Source: NFRC windy-conditions guidance, sheets over 5 m mean 17 mph (secondary copy)
  ['sheetGustStopMs', 26, 'mph'], // Source: NFRC windy-conditions guidance, sheets over 5 m gusting 26 mph (secondary copy)
  ['scaffoldUseGustStopMs', 18, 'm/s'], // Source: scaffold designer blog "usual maximum" 18 m/s (weak secondary copy)
  ['scaffoldUseBalanceMeanCautionMs', 23, 'mph'], // Source: common practice, no source — HSE roof-work 23 mph figure applied to scaffold edges
  ['scaffoldErectionMeanStopMs', 23, 'mph'], // Source: common practice, no source
  ['scaffoldErectionGustStopMs', 35, 'mph'], // Source: common practice, no source
] as const;

const numberDefaults = [
  ['cementFallingStopC', 3], // Source: NBS F10/185 (secondary copy); NHBC Standards 2023 §3.2.5
  ['cementRisingResumeC', 1], // Source: NBS F10/185 (secondary copy); NHBC Standards 2023 §3.2.5
  ['limeFallingStopC', 5], // Source: NBS F10/185, hydraulic lime (secondary copy)
  ['limeRisingResumeC', 3], // Source: NBS F10/185, hydraulic lime (secondary copy)
  ['frostProtectionDays', 6], // Source: NHBC Standards 2023 §3.2.5, "up to six days"
  ['ukHeatCautionAboveC', 30], // Source: NHBC Standards 2022 §6.1.20
  ['usColdBelowC', 4.444], // Source: TMS 602 / ACI 530.1, 40 °F (secondary copy)
  ['usHotAboveC', 37.778], // Source: TMS 602, 100 °F (secondary copy)
  ['usHotWindyAboveC', 32.222], // Source: TMS 602, 90 °F (secondary copy)
  ['usHotWindAboveMs', 3.576], // Source: TMS 602, 8 mph (secondary copy)
  ['concreteColdAtOrBelowC', 4.444], // Source: ACI 306R, 40 °F (concrete.org)
  ['concreteMinDischargeC', 5], // Source: BS 8500 / BS EN 206 (hanson.co.uk)
  ['concreteProtectionHours', 72], // Source: ACI 306R protection period table, exposed, 3 days — from memory
  ['usHotExtremeAboveC', 46.111], // Source: TMS 602 hot weather, shade above 115 °F (secondary copy: masoncontractors.org)
  ['usHotExtremeWindyAboveC', 40.556], // Source: TMS 602 hot weather, shade above 105 °F with wind over 8 mph (secondary copy)
  ['frostAtOrBelowC', 0], // Source: NHBC Standards 2023 §3.2.5, protect new work from frost
  ['concreteFreezingStopC', 0], // Source: common practice, no source — no pour into freezing air
  ['windCautionRatio', 0.8], // Source: common practice, no source — caution from 80 % of each wind stop limit
  ['windHeightFactor', 1], // Source: Hodboard rule — wind as forecast at 10 m unless the firm scales it (IPAF: up to 50 % more at 20 m, secondary copy)
  ['rainStopMmPerHour', 0.5], // Source: common practice, no source
  ['rainStopProbability', 0.5], // Source: common practice, no source
  ['rainCautionMmPerHour', 0.1], // Source: common practice, no source
  ['rainCautionProbability', 0.3], // Source: common practice, no source
  ['groundworksHeavyRainMmPerHour', 4], // Source: Met Office "heavy rain" above 4 mm/h — from memory
  ['minUsableHours', 2], // Source: common practice, no source — a day with fewer usable hours is not worth starting
] as const;

describe('default thresholds', () => {
  it.each(speedDefaults)('%s defaults to %d %s', (key, value, unit) => {
    const v = defaultRuleSettings[key];
    expect(unit === 'mph' ? msToMph(v) : v).toBeCloseTo(value, 9);
  });

  it.each(numberDefaults)('%s defaults to %d', (key, value) => {
    expect(defaultRuleSettings[key]).toBeCloseTo(value, 3);
  });

  it('uses UK practice unless the firm chooses US practice', () => {
    // Source: Hodboard rule — default region England & Wales (NBS/NHBC, BS 8500)
    expect(defaultRuleSettings.practice).toBe('uk');
  });

  it('pins every default to a literal value', () => {
    const pinned = ['practice', ...speedDefaults.map((r) => r[0]), ...numberDefaults.map((r) => r[0])];
    expect(pinned.sort()).toEqual(Object.keys(defaultRuleSettings).sort());
  });

  it('passes its own schema', () => {
    expect(ruleSettingsSchema.parse(defaultRuleSettings)).toEqual(defaultRuleSettings);
  });
});

describe('firm overrides', () => {
  it('lets a firm override any one threshold and keeps the rest', () => {
    const s = resolveRuleSettings({ mewpGustStopMs: 10, practice: 'us' });
    expect(s.mewpGustStopMs).toBe(10);
    expect(s.practice).toBe('us');
    expect(s.towerMeanStopMs).toBe(defaultRuleSettings.towerMeanStopMs);
  });

  it.each([
    [{ mewpGustStopMs: -1 }, 'mewpGustStopMs'],
    [{ rainStopProbability: 1.5 }, 'rainStopProbability'],
    [{ practice: 'eu' }, 'practice'],
    [{ windHeightFactor: 0.5 }, 'windHeightFactor'],
    [{ cementRisingResumeC: 4 }, 'cementRisingResumeC'],
    [{ rainCautionMmPerHour: 0.6 }, 'rainCautionMmPerHour'],
    [{ rainCautionProbability: 0.6 }, 'rainCautionProbability'],
    [{ usHotWindyAboveC: 40 }, 'usHotWindyAboveC'],
    [{ usHotAboveC: 47 }, 'usHotExtremeAboveC'],
    [{ gustiness: 3 }, ''],
  ])('rejects %j, naming %s', (patch, path) => {
    const r = ruleSettingsSchema.safeParse({ ...defaultRuleSettings, ...patch });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path.join('.') ?? '').toBe(path);
  });

  it('accepts a partial override object and rejects unknown keys in it', () => {
    expect(ruleSettingsOverrideSchema.safeParse({ towerMeanStopMs: 7 }).success).toBe(true);
    expect(ruleSettingsOverrideSchema.safeParse({ towerLimit: 7 }).success).toBe(false);
  });
});
