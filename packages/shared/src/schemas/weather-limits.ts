import { z } from 'zod';
import { defaultRuleSettings, ruleSettingsSchema, type RuleSettings, type WeatherPractice } from '../rules/settings.js';
import { SOURCES } from '../rules/sources.js';

type NumericLimit = Exclude<keyof RuleSettings, 'practice'>;

export type WeatherLimitGroup = 'wind' | 'mortar' | 'us-mortar' | 'concrete' | 'rain' | 'day';
/** The stored unit; `%` fields are stored as a fraction 0–1 and shown as a percentage. */
export type WeatherLimitUnit = 'm/s' | '°C' | 'mm/h' | '%' | 'h' | 'days' | '×';

export interface WeatherLimitField {
  group: WeatherLimitGroup;
  label: string;
  unit: WeatherLimitUnit;
  /** Sane bounds for a firm's own value, in the stored unit. */
  min: number;
  max: number;
  isInteger?: boolean;
  source: string;
}

export const weatherLimitGroupLabels: Record<WeatherLimitGroup, string> = {
  wind: 'Wind',
  mortar: 'Mortar in cold and heat (UK practice)',
  'us-mortar': 'Mortar in cold and heat (US practice)',
  concrete: 'Concrete',
  rain: 'Rain',
  day: 'The working day',
};

const wind = (label: string, source: string): WeatherLimitField => ({ group: 'wind', label, unit: 'm/s', min: 1, max: 40, source });

/**
 * Every threshold a firm may set, with the bounds the API accepts and the source of the default.
 * Field names carry their unit (…Ms, …C, …MmPerHour, …Probability, …Hours, …Days).
 */
export const weatherLimitFields: Record<NumericLimit, WeatherLimitField> = {
  mewpGustStopMs: wind('Powered access platform (MEWP): stop at gusts of', SOURCES.en280),
  towerMeanStopMs: wind('Mobile tower: stop and dismantle at a mean wind of', SOURCES.pasmaTower),
  roofMeanStopMs: wind('Roof work (slates, tiles, felt): stop at a mean wind of', SOURCES.nfrcRoof),
  roofGustStopMs: wind('Roof work (slates, tiles, felt): stop at gusts of', SOURCES.nfrcRoof),
  roofBalanceMeanCautionMs: wind('Roof work: take care above a mean wind of', SOURCES.hseRoofBalance),
  sheetMeanStopMs: wind('Sheets over 5 m and large boards: stop at a mean wind of', SOURCES.nfrcSheets),
  sheetGustStopMs: wind('Sheets over 5 m and large boards: stop at gusts of', SOURCES.nfrcSheets),
  scaffoldUseGustStopMs: wind('Working from a scaffold or roof edge: stop at gusts of', SOURCES.scaffoldUse),
  scaffoldUseBalanceMeanCautionMs: wind('Working at an edge: take care above a mean wind of', SOURCES.scaffoldEdgeBalance),
  scaffoldErectionMeanStopMs: wind('Putting up or striking scaffold: stop at a mean wind of', SOURCES.scaffoldErection),
  scaffoldErectionGustStopMs: wind('Putting up or striking scaffold: stop at gusts of', SOURCES.scaffoldErection),
  windCautionRatio: { group: 'wind', label: 'Take care from this share of each wind stop limit', unit: '%', min: 0.5, max: 1, source: 'Common practice, no source' },
  windHeightFactor: {
    group: 'wind', label: 'Wind at working height: the 10 m forecast times', unit: '×', min: 1, max: 3,
    source: 'IPAF: wind may be 50 % greater at 20 m than at ground level (secondary copy); forecasts are for 10 m',
  },
  cementFallingStopC: { group: 'mortar', label: 'Cement mortar: no laying at or below, and falling', unit: '°C', min: -5, max: 10, source: SOURCES.nbsF10 },
  cementRisingResumeC: { group: 'mortar', label: 'Cement mortar: resume at, and rising', unit: '°C', min: -5, max: 10, source: SOURCES.nbsF10 },
  limeFallingStopC: { group: 'mortar', label: 'Hydraulic lime mortar: no laying at or below, and falling', unit: '°C', min: -5, max: 12, source: SOURCES.nbsF10Lime },
  limeRisingResumeC: { group: 'mortar', label: 'Hydraulic lime mortar: resume at, and rising', unit: '°C', min: -5, max: 12, source: SOURCES.nbsF10Lime },
  frostAtOrBelowC: { group: 'mortar', label: 'Frost: protect new work when the air is at or below', unit: '°C', min: -10, max: 5, source: SOURCES.nhbcFrost },
  frostProtectionDays: { group: 'mortar', label: 'Frost: look ahead for', unit: 'days', min: 0, max: 14, isInteger: true, source: SOURCES.nhbcFrost },
  ukHeatCautionAboveC: { group: 'mortar', label: 'Hot weather: take care above', unit: '°C', min: 20, max: 45, source: SOURCES.nhbcHeat },
  usColdBelowC: { group: 'us-mortar', label: 'Cold-weather provisions below', unit: '°C', min: -10, max: 15, source: SOURCES.tms602Cold },
  usHotAboveC: { group: 'us-mortar', label: 'Hot-weather provisions above', unit: '°C', min: 20, max: 55, source: SOURCES.tms602Hot },
  usHotWindyAboveC: { group: 'us-mortar', label: 'Hot-weather provisions in wind above', unit: '°C', min: 20, max: 55, source: SOURCES.tms602Hot },
  usHotWindAboveMs: { group: 'us-mortar', label: 'Wind that counts as windy in hot weather: above', unit: 'm/s', min: 0.5, max: 20, source: SOURCES.tms602Hot },
  usHotExtremeAboveC: { group: 'us-mortar', label: 'Shade materials and mixer above', unit: '°C', min: 20, max: 55, source: SOURCES.tms602Hot },
  usHotExtremeWindyAboveC: { group: 'us-mortar', label: 'Shade materials and mixer in wind above', unit: '°C', min: 20, max: 55, source: SOURCES.tms602Hot },
  concreteFreezingStopC: { group: 'concrete', label: 'No pour at or below', unit: '°C', min: -10, max: 5, source: SOURCES.concreteFreezing },
  concreteMinDischargeC: { group: 'concrete', label: 'Take care when the air is below (concrete at discharge)', unit: '°C', min: 0, max: 15, source: SOURCES.bs8500 },
  concreteColdAtOrBelowC: { group: 'concrete', label: 'Cold-weather concreting when the air is at or below', unit: '°C', min: -10, max: 15, source: SOURCES.aci306 },
  concreteProtectionHours: { group: 'concrete', label: 'Cold-weather concreting: look ahead for', unit: 'h', min: 0, max: 336, isInteger: true, source: SOURCES.aci306 },
  rainStopMmPerHour: { group: 'rain', label: 'Fresh mortar, render, concrete: stop at rain of', unit: 'mm/h', min: 0.1, max: 20, source: SOURCES.rainFresh },
  rainStopProbability: { group: 'rain', label: '… and at least this likely', unit: '%', min: 0.05, max: 1, source: SOURCES.rainFresh },
  rainCautionMmPerHour: { group: 'rain', label: 'Fresh work: keep covers ready from rain of', unit: 'mm/h', min: 0, max: 20, source: SOURCES.rainFresh },
  rainCautionProbability: { group: 'rain', label: '… or from this chance of rain', unit: '%', min: 0, max: 1, source: SOURCES.rainFresh },
  groundworksHeavyRainMmPerHour: { group: 'rain', label: 'Groundworks: take care in heavy rain from', unit: 'mm/h', min: 0.5, max: 50, source: SOURCES.rainHeavy },
  minUsableHours: { group: 'day', label: 'Fewest usable hours worth starting a day for', unit: 'h', min: 0.5, max: 12, source: SOURCES.usableHours },
};

export const weatherPracticeLabels: Record<WeatherPractice, string> = {
  uk: 'UK practice (NBS, NHBC, BS 8500)',
  us: 'US practice (TMS 602 / ACI 530.1, ACI 306R)',
};
export const weatherPracticeSource = 'Which published practice the mortar and concrete rules follow; the default is UK practice';

const numericLimitKeys = Object.keys(weatherLimitFields) as NumericLimit[];

function fieldSchema(key: NumericLimit): z.ZodNumber {
  const f = weatherLimitFields[key];
  const shown = (v: number) => (f.unit === '%' ? `${Math.round(v * 1000) / 10} %` : `${v} ${f.unit}`);
  let schema = z
    .number({ error: 'Enter a number' })
    .finite()
    .min(f.min, { error: `At least ${shown(f.min)}` })
    .max(f.max, { error: `At most ${shown(f.max)}` });
  if (f.isInteger) schema = schema.int({ error: 'Enter a whole number' });
  return schema;
}

const overrideShape = Object.fromEntries(numericLimitKeys.map((key) => [key, fieldSchema(key).optional()])) as {
  [K in NumericLimit]: z.ZodOptional<z.ZodNumber>;
};

/**
 * A firm's own thresholds: any subset of `RuleSettings`, each within sane bounds, and consistent with the
 * defaults of the keys left out (e.g. a resume temperature never above its stop temperature).
 */
export const weatherLimitOverridesSchema = z
  .strictObject({ practice: z.enum(['uk', 'us']).optional(), ...overrideShape })
  .superRefine((overrides, ctx) => {
    const merged = ruleSettingsSchema.safeParse({ ...defaultRuleSettings, ...overrides });
    if (merged.success) return;
    for (const issue of merged.error.issues) ctx.addIssue({ code: 'custom', message: issue.message, path: issue.path });
  });
export type WeatherLimitOverrides = Partial<RuleSettings>;

export const weatherLimitsInputSchema = z.object({
  overrides: weatherLimitOverridesSchema,
  /** The version read; 0 when the firm has never saved its own limits. */
  version: z.number().int().min(0),
});
export type WeatherLimitsInput = z.input<typeof weatherLimitsInputSchema>;

export interface WeatherLimitsDto {
  /** Only what the firm changed; every other threshold is the default. */
  overrides: WeatherLimitOverrides;
  /** The thresholds verdicts are worked out with: the defaults with the firm's overrides on top. */
  effective: RuleSettings;
  /** Stored values no longer accepted (bounds tightened since they were saved); the default is used instead. */
  ignored: string[];
  version: number;
  updatedAt: string | null;
}

/**
 * The settings to assess with from a firm's stored overrides. A stored value that no longer passes (a bound
 * tightened since it was saved) falls back to its default on its own, never taking the firm's other limits with it.
 */
export function firmRuleSettings(stored: unknown): { settings: RuleSettings; overrides: WeatherLimitOverrides; ignored: string[] } {
  const source = stored && typeof stored === 'object' && !Array.isArray(stored) ? (stored as Record<string, unknown>) : {};
  const overrides: Record<string, unknown> = {};
  const ignored: string[] = [];
  for (const [key, value] of Object.entries(source)) {
    const schema = key === 'practice' ? z.enum(['uk', 'us']) : key in weatherLimitFields ? fieldSchema(key as NumericLimit) : null;
    if (schema?.safeParse(value).success) overrides[key] = value;
    else ignored.push(key);
  }
  for (;;) {
    const merged = ruleSettingsSchema.safeParse({ ...defaultRuleSettings, ...overrides });
    if (merged.success) return { settings: merged.data, overrides: overrides as WeatherLimitOverrides, ignored };
    const bad = merged.error.issues.map((issue) => String(issue.path[0] ?? '')).filter((key) => key in overrides);
    if (bad.length === 0) return { settings: { ...defaultRuleSettings }, overrides: {}, ignored: [...ignored, ...Object.keys(overrides)] };
    for (const key of bad) {
      delete overrides[key];
      ignored.push(key);
    }
  }
}

export const WEATHER_LIMITS_SAFETY_NOTE =
  'These are your firm\'s own planning limits for the board\'s weather verdicts. They never replace the limits of the manufacturer or supplier of the equipment (a platform\'s rated wind speed is on its plate), local regulations, or the judgement of the competent person on site, who may stop work sooner.';
