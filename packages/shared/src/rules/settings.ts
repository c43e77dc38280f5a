import { z } from 'zod';
import { fToC, mphToMs } from './units.js';

/** UK practice (NBS/NHBC, BS 8500) or US practice (TMS 602 / ACI 530.1, ACI 306R) for mortar and concrete. */
export type WeatherPractice = 'uk' | 'us';

/**
 * A firm's thresholds. SI units throughout (°C, m/s, mm per hour, probability 0–1, hours)
 * so one comparison serves every firm; the UI converts for display.
 */
export interface RuleSettings {
  practice: WeatherPractice;
  /** Forecast wind is for 10 m; multiply it for working height (IPAF: up to 50 % more at 20 m). */
  windHeightFactor: number;
  /** A wind limit turns to caution from this fraction of its stop value. */
  windCautionRatio: number;
  mewpGustStopMs: number;
  towerMeanStopMs: number;
  roofBalanceMeanCautionMs: number;
  roofMeanStopMs: number;
  roofGustStopMs: number;
  sheetMeanStopMs: number;
  sheetGustStopMs: number;
  scaffoldUseGustStopMs: number;
  scaffoldUseBalanceMeanCautionMs: number;
  scaffoldErectionMeanStopMs: number;
  scaffoldErectionGustStopMs: number;
  cementFallingStopC: number;
  cementRisingResumeC: number;
  limeFallingStopC: number;
  limeRisingResumeC: number;
  frostProtectionDays: number;
  frostAtOrBelowC: number;
  ukHeatCautionAboveC: number;
  usColdBelowC: number;
  usHotAboveC: number;
  usHotWindyAboveC: number;
  usHotWindAboveMs: number;
  usHotExtremeAboveC: number;
  usHotExtremeWindyAboveC: number;
  concreteColdAtOrBelowC: number;
  concreteProtectionHours: number;
  concreteMinDischargeC: number;
  concreteFreezingStopC: number;
  rainStopMmPerHour: number;
  rainStopProbability: number;
  rainCautionMmPerHour: number;
  rainCautionProbability: number;
  groundworksHeavyRainMmPerHour: number;
  minUsableHours: number;
}

export const defaultRuleSettings: Readonly<RuleSettings> = Object.freeze({
  practice: 'uk',
  windHeightFactor: 1,
  windCautionRatio: 0.8,
  mewpGustStopMs: 12.5,
  towerMeanStopMs: mphToMs(17),
  roofBalanceMeanCautionMs: mphToMs(23),
  roofMeanStopMs: mphToMs(23),
  roofGustStopMs: mphToMs(35),
  sheetMeanStopMs: mphToMs(17),
  sheetGustStopMs: mphToMs(26),
  scaffoldUseGustStopMs: 18,
  scaffoldUseBalanceMeanCautionMs: mphToMs(23),
  scaffoldErectionMeanStopMs: mphToMs(23),
  scaffoldErectionGustStopMs: mphToMs(35),
  cementFallingStopC: 3,
  cementRisingResumeC: 1,
  limeFallingStopC: 5,
  limeRisingResumeC: 3,
  frostProtectionDays: 6,
  frostAtOrBelowC: 0,
  ukHeatCautionAboveC: 30,
  usColdBelowC: fToC(40),
  usHotAboveC: fToC(100),
  usHotWindyAboveC: fToC(90),
  usHotWindAboveMs: mphToMs(8),
  usHotExtremeAboveC: fToC(115),
  usHotExtremeWindyAboveC: fToC(105),
  concreteColdAtOrBelowC: fToC(40),
  concreteProtectionHours: 72,
  concreteMinDischargeC: 5,
  concreteFreezingStopC: 0,
  rainStopMmPerHour: 0.5,
  rainStopProbability: 0.5,
  rainCautionMmPerHour: 0.1,
  rainCautionProbability: 0.3,
  groundworksHeavyRainMmPerHour: 4,
  minUsableHours: 2,
});

const ms = z.number().finite().min(0).max(100);
const celsius = z.number().finite().min(-60).max(60);
const probability = z.number().finite().min(0).max(1);
const mmPerHour = z.number().finite().min(0).max(500);

const ruleSettingsObject = z
  .object({
    practice: z.enum(['uk', 'us']),
    windHeightFactor: z.number().finite().min(1).max(3),
    windCautionRatio: z.number().finite().gt(0).max(1),
    mewpGustStopMs: ms,
    towerMeanStopMs: ms,
    roofBalanceMeanCautionMs: ms,
    roofMeanStopMs: ms,
    roofGustStopMs: ms,
    sheetMeanStopMs: ms,
    sheetGustStopMs: ms,
    scaffoldUseGustStopMs: ms,
    scaffoldUseBalanceMeanCautionMs: ms,
    scaffoldErectionMeanStopMs: ms,
    scaffoldErectionGustStopMs: ms,
    cementFallingStopC: celsius,
    cementRisingResumeC: celsius,
    limeFallingStopC: celsius,
    limeRisingResumeC: celsius,
    frostProtectionDays: z.number().int().min(0).max(28),
    frostAtOrBelowC: celsius,
    ukHeatCautionAboveC: celsius,
    usColdBelowC: celsius,
    usHotAboveC: celsius,
    usHotWindyAboveC: celsius,
    usHotWindAboveMs: ms,
    usHotExtremeAboveC: celsius,
    usHotExtremeWindyAboveC: celsius,
    concreteColdAtOrBelowC: celsius,
    concreteProtectionHours: z.number().int().min(0).max(24 * 28),
    concreteMinDischargeC: celsius,
    concreteFreezingStopC: celsius,
    rainStopMmPerHour: mmPerHour,
    rainStopProbability: probability,
    rainCautionMmPerHour: mmPerHour,
    rainCautionProbability: probability,
    groundworksHeavyRainMmPerHour: mmPerHour,
    minUsableHours: z.number().finite().min(0).max(24),
  })
  .strict();

export const ruleSettingsSchema = ruleSettingsObject
  .refine((s) => s.cementRisingResumeC <= s.cementFallingStopC, {
    message: 'cement: the rising resume temperature cannot be above the falling stop temperature',
    path: ['cementRisingResumeC'],
  })
  .refine((s) => s.limeRisingResumeC <= s.limeFallingStopC, {
    message: 'hydraulic lime: the rising resume temperature cannot be above the falling stop temperature',
    path: ['limeRisingResumeC'],
  })
  .refine((s) => s.rainCautionMmPerHour <= s.rainStopMmPerHour, {
    message: 'rain: the caution amount cannot be above the stop amount',
    path: ['rainCautionMmPerHour'],
  })
  .refine((s) => s.rainCautionProbability <= s.rainStopProbability, {
    message: 'rain: the caution chance cannot be above the stop chance',
    path: ['rainCautionProbability'],
  })
  .refine((s) => s.usHotWindyAboveC <= s.usHotAboveC && s.usHotExtremeWindyAboveC <= s.usHotExtremeAboveC, {
    message: 'US hot weather: the figure with wind cannot be above the figure without it',
    path: ['usHotWindyAboveC'],
  })
  .refine((s) => s.usHotExtremeAboveC >= s.usHotAboveC && s.usHotExtremeWindyAboveC >= s.usHotWindyAboveC, {
    message: 'US hot weather: shading starts at or above the hot-weather figure',
    path: ['usHotExtremeAboveC'],
  });

/** A firm's stored overrides: any subset of the thresholds. */
export const ruleSettingsOverrideSchema = ruleSettingsObject.partial().strict();

export type RuleSettingsOverride = Partial<RuleSettings>;

/** Defaults with a firm's overrides on top, validated; throws a ZodError naming each bad key. */
export function resolveRuleSettings(overrides: RuleSettingsOverride = {}): RuleSettings {
  return ruleSettingsSchema.parse({ ...defaultRuleSettings, ...overrides });
}
