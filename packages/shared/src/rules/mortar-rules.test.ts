import { describe, expect, it } from 'vitest';
import type { Activity, MortarKind } from './activities.js';
import { assessDay, type DayAssessment } from './assess-day.js';
import { DAY, DAY_AND_48H, FULL_HOURS, hourlyForecast, inWindow, TO_HORIZON, WINDOW, type HourValues } from './fixtures/forecast-builder.js';
import type { AssessmentNote, RuleReason } from './forecast.js';
import { canLayInCold, usColdBandFor } from './mortar-rules.js';
import { defaultRuleSettings, resolveRuleSettings, type RuleSettings } from './settings.js';
import { SOURCES } from './sources.js';
import { fToC, mphToMs } from './units.js';

const ONE_HOUR = { start: '2026-03-02T08:00:00Z', end: '2026-03-02T09:00:00Z' };
const us = resolveRuleSettings({ practice: 'us' });

/** One working hour at 08:00 with `first`; the 09:00 reading sets the trend. */
function hourAt(activity: Activity, mortar: MortarKind, first: Partial<HourValues>, next: Partial<HourValues>, settings: RuleSettings = defaultRuleSettings): DayAssessment {
  const forecast = hourlyForecast(DAY, FULL_HOURS, (h) => (h === 8 ? first : h === 9 ? next : {}));
  return assessDay({ activities: [{ activity, mortar }], forecast, window: ONE_HOUR, settings });
}

function dayWith(activity: Activity, at: (h: number) => Partial<HourValues>, settings: RuleSettings = defaultRuleSettings, hours = FULL_HOURS): DayAssessment {
  return assessDay({ activities: [activity], forecast: hourlyForecast(DAY, hours, at), window: WINDOW, settings });
}

const find = (d: DayAssessment, id: string): RuleReason | undefined => d.activities[0]?.reasons.find((r) => r.ruleId === id);
const note = (d: DayAssessment, id: string): AssessmentNote | undefined => d.activities[0]?.notes.find((n) => n.ruleId === id);

describe('UK cold weather for mortar', () => {
  it.each([
    ['cement', 3.01, -0.5, 'go'], // Source: NBS F10/185 "at or below 3 °C and falling" (secondary copy)
    ['cement', 3, -0.5, 'stop'], // Source: NBS F10/185 "at or below 3 °C and falling" (secondary copy)
    ['cement', 2.99, -0.5, 'stop'], // Source: NBS F10/185 "at or below 3 °C and falling" (secondary copy)
    ['cement', 3, 0.5, 'go'], // Source: NBS F10/185 "unless at least 1 °C and rising"
    ['cement', 1.01, 0.5, 'go'], // Source: NBS F10/185; NHBC 2023 §3.2.5 "resume at 1 °C and rising"
    ['cement', 1, 0.5, 'go'], // Source: NBS F10/185; NHBC 2023 §3.2.5 "resume at 1 °C and rising"
    ['cement', 0.99, 0.5, 'stop'], // Source: NBS F10/185; NHBC 2023 §3.2.5 "resume at 1 °C and rising"
    ['cement', 2, 0, 'stop'], // Source: NBS F10/185, a steady 2 °C is neither above 3 °C nor rising
    ['cement', 3.01, 0, 'go'], // Source: NBS F10/185, above 3 °C
    ['hydraulic-lime', 5.01, -0.5, 'go'], // Source: NBS F10/185, hydraulic lime: 5 °C falling (secondary copy)
    ['hydraulic-lime', 5, -0.5, 'stop'], // Source: NBS F10/185, hydraulic lime: 5 °C falling (secondary copy)
    ['hydraulic-lime', 4.99, -0.5, 'stop'], // Source: NBS F10/185, hydraulic lime: 5 °C falling (secondary copy)
    ['hydraulic-lime', 3.01, 0.5, 'go'], // Source: NBS F10/185, hydraulic lime: 3 °C rising (secondary copy)
    ['hydraulic-lime', 3, 0.5, 'go'], // Source: NBS F10/185, hydraulic lime: 3 °C rising (secondary copy)
    ['hydraulic-lime', 2.99, 0.5, 'stop'], // Source: NBS F10/185, hydraulic lime: 3 °C rising (secondary copy)
  ] as const)('%s mortar at %f °C, next hour %f °C → %s', (mortar, t, change, expected) => {
    const day = hourAt('bricklaying', mortar, { tempC: t }, { tempC: t + change });
    const rule = mortar === 'cement' ? 'cold.mortar.cement' : 'cold.mortar.lime';
    expect(day.verdict).toBe(expected);
    if (expected === 'stop') expect(find(day, rule)).toMatchObject({ verdict: 'stop', observed: t, at: '2026-03-02T08:00:00.000Z' });
    else expect(find(day, rule)).toBeUndefined();
  });

  it('applies to pointing and rendering as well as bricklaying', () => {
    // Source: NBS F10/185 covers bedding and pointing; rendering in cement-gauged mortar by the same rule (common practice)
    for (const a of ['pointing', 'rendering'] as const) {
      expect(hourAt(a, 'cement', { tempC: 2 }, { tempC: 1.5 }).verdict).toBe('stop');
    }
  });

  it('reads the trend at the end of the data from the hour before', () => {
    expect(canLayInCold(2, 1, 3, 1)).toBe(true);
    expect(canLayInCold(2, -1, 3, 1)).toBe(false);
    const forecast = hourlyForecast(DAY, 10, (h) => (h === 8 ? { tempC: 1 } : h === 9 ? { tempC: 2 } : {}));
    // Frost look-ahead off: ten hours of forecast leave most of the next 48 h out, and that caution is not the point here.
    const settings = resolveRuleSettings({ frostProtectionDays: 0 });
    const day = assessDay({ activities: ['bricklaying'], forecast, window: { start: '2026-03-02T09:00:00Z', end: '2026-03-02T10:00:00Z' }, settings });
    expect(find(day, 'cold.mortar.cement')).toBeUndefined();
    expect(day.verdict).toBe('go');
  });

  it.each([
    [0.01, 'none'], // Source: NHBC Standards 2023 §3.2.5, frost protection for up to six days
    [0, 'caution'], // Source: NHBC Standards 2023 §3.2.5, a forecast at or below 0 °C in that period
    [-0.01, 'caution'], // Source: NHBC Standards 2023 §3.2.5
  ] as const)('frost of %f °C two nights after laying → %s with "protect the work"', (t, expected) => {
    const day = dayWith('bricklaying', (h) => (h === 50 ? { tempC: t } : {}));
    const r = find(day, 'cold.mortar.frost-protection');
    if (expected === 'none') expect(r).toBeUndefined();
    else {
      expect(r).toMatchObject({ verdict: 'caution', observed: t, at: '2026-03-04T02:00:00.000Z' });
      expect(r?.message).toMatch(/protect the work/);
      expect(day.verdict).toBe('caution');
    }
  });

  it('looks no further ahead than the six days', () => {
    // Source: NHBC Standards 2023 §3.2.5, "up to six days"
    const within = dayWith('pointing', (h) => (h === 8 + 6 * 24 - 1 ? { tempC: -2 } : {}), defaultRuleSettings, 8 * 24);
    const beyond = dayWith('pointing', (h) => (h === 8 + 6 * 24 ? { tempC: -2 } : {}), defaultRuleSettings, 8 * 24);
    expect(find(within, 'cold.mortar.frost-protection')).toBeDefined();
    expect(find(beyond, 'cold.mortar.frost-protection')).toBeUndefined();
  });

  it('notes the part of the six days past the day and the next 48 h, without lowering the verdict', () => {
    // Source: NHBC Standards 2023 §3.2.5, frost protection for up to six days (144 h from the 08:00 start);
    // the standard 72 h forecast from midnight reaches 64 h of them. Hodboard rule: the part past the day and the next 48 h is a note, not a caution
    const day = dayWith('bricklaying', () => ({}), defaultRuleSettings, DAY_AND_48H);
    expect(find(day, 'cold.mortar.frost-protection')).toBeUndefined();
    expect(find(day, 'forecast.reach.frost-protection')).toBeUndefined();
    expect(day.activities[0]?.reasons).toEqual([]);
    expect(day.verdict).toBe('go');
    const n = note(day, 'forecast.reach.frost-protection');
    expect(n).toEqual({
      ruleId: 'forecast.reach.frost-protection',
      message: 'The forecast reaches 2 days 16 h of the 6 days the frost-protection rule looks ahead (none yet for 2026-03-05 00:00 UTC to 2026-03-08 08:00 UTC); check it again nearer the day.',
      source: SOURCES.forecastBeyond,
      uncovered: [{ from: '2026-03-05T00:00:00.000Z', to: '2026-03-08T08:00:00.000Z' }],
    });
  });

  it.each([
    // Source: Hodboard rule — the standard input is the day and the next 48 h, counted from the 17:00 end of the window (2026-03-04 17:00 UTC); NHBC Standards 2023 §3.2.5, six days
    [TO_HORIZON, 'go', null, '2026-03-04T17:00:00.000Z'],
    // Source: Hodboard rule — one hour short of the horizon (16:00–17:00 on 4 March) is missing data, a caution; NHBC Standards 2023 §3.2.5, six days
    [TO_HORIZON - 1, 'caution', { from: '2026-03-04T16:00:00.000Z', to: '2026-03-04T17:00:00.000Z' }, '2026-03-04T17:00:00.000Z'],
  ] as const)('with %d forecast hours from midnight the frost look-ahead is %s', (hours, verdict, gap, noteFrom) => {
    const day = dayWith('pointing', () => ({}), defaultRuleSettings, hours);
    expect(day.verdict).toBe(verdict);
    const r = find(day, 'forecast.reach.frost-protection');
    if (gap === null) expect(r).toBeUndefined();
    else {
      // 57 h from the 08:00 start to the horizon, of which 56 h are forecast.
      expect(r).toMatchObject({ verdict: 'caution', threshold: 57, observed: 56, unit: 'h', at: null, source: SOURCES.forecastReach, uncovered: [gap] });
      expect(r?.message).toMatch(/covers only 56 h of the first 57 h of the 144 h frost-protection period \(6 days\) from the start of work, as far as the forecast should reach \(48 h after the working window ends\)/);
      expect(r?.message).toMatch(/56–57 h after the working window starts \(2026-03-04 16:00 UTC to 2026-03-04 17:00 UTC\)/);
    }
    expect(note(day, 'forecast.reach.frost-protection')?.uncovered).toEqual([{ from: noteFrom, to: '2026-03-08T08:00:00.000Z' }]);
  });

  it.each([
    [8 + 144, 'none'], // Source: NHBC Standards 2023 §3.2.5, six days; the forecast's last hour ends exactly 144 h after the 08:00 start
    [8 + 143, 'note'], // Source: NHBC Standards 2023 §3.2.5, six days; one hour short (143–144 h) is noted (Hodboard rule)
  ])('with %d forecast hours from midnight the end of the six-day frost period gives %s', (hours, expected) => {
    const day = dayWith('pointing', () => ({}), defaultRuleSettings, hours);
    expect(find(day, 'forecast.reach.frost-protection')).toBeUndefined();
    expect(day.verdict).toBe('go');
    const n = note(day, 'forecast.reach.frost-protection');
    if (expected === 'none') expect(n).toBeUndefined();
    else {
      expect(n?.uncovered).toEqual([{ from: '2026-03-08T07:00:00.000Z', to: '2026-03-08T08:00:00.000Z' }]);
      expect(n?.message).toMatch(/reaches 5 days 23 h of the 6 days/);
    }
  });

  it('gives a caution for hours missing within the day and the next 48 h', () => {
    // Source: NHBC Standards 2023 §3.2.5, six days of frost protection; Hodboard rule: missing hours within the standard input are reported, never passed over
    const forecast = hourlyForecast(DAY, FULL_HOURS).filter((_, h) => h !== 40 && h !== 41);
    const day = assessDay({ activities: ['bricklaying'], forecast, window: WINDOW });
    expect(find(day, 'forecast.reach.frost-protection')).toMatchObject({
      verdict: 'caution',
      threshold: 57,
      observed: 55,
      uncovered: [{ from: '2026-03-03T16:00:00.000Z', to: '2026-03-03T18:00:00.000Z' }],
    });
    expect(day.activities[0]?.notes).toEqual([]);
    expect(day.verdict).toBe('caution');
  });

  it('only notes hours missing after the day and the next 48 h', () => {
    // Source: NHBC Standards 2023 §3.2.5, six days of frost protection; Hodboard rule: past the standard input a gap is a note
    const forecast = hourlyForecast(DAY, FULL_HOURS).filter((_, h) => h !== 100 && h !== 101);
    const day = assessDay({ activities: ['bricklaying'], forecast, window: WINDOW });
    expect(find(day, 'forecast.reach.frost-protection')).toBeUndefined();
    expect(day.verdict).toBe('go');
    const n = note(day, 'forecast.reach.frost-protection');
    expect(n?.uncovered).toEqual([{ from: '2026-03-06T04:00:00.000Z', to: '2026-03-06T06:00:00.000Z' }]);
    expect(n?.message).toMatch(/reaches 5 days 22 h of the 6 days .*\(none yet for 2026-03-06 04:00 UTC to 2026-03-06 06:00 UTC\)/);
  });

  it('splits a gap that runs across the horizon into a caution before it and a note after it', () => {
    // Source: NHBC Standards 2023 §3.2.5, six days; Hodboard rule: the standard input ends 48 h after the window (2026-03-04 17:00 UTC)
    const day = dayWith('bricklaying', () => ({}), defaultRuleSettings, 60);
    expect(find(day, 'forecast.reach.frost-protection')).toMatchObject({
      threshold: 57,
      observed: 52,
      uncovered: [{ from: '2026-03-04T12:00:00.000Z', to: '2026-03-04T17:00:00.000Z' }],
    });
    expect(note(day, 'forecast.reach.frost-protection')).toMatchObject({
      uncovered: [{ from: '2026-03-04T17:00:00.000Z', to: '2026-03-08T08:00:00.000Z' }],
      message: expect.stringMatching(/^The forecast reaches 2 days 4 h of the 6 days/),
    });
    expect(day.verdict).toBe('caution');
  });

  it('still warns of frost it can see when the standard forecast ends before the six days do', () => {
    // Source: NHBC Standards 2023 §3.2.5 — a forecast at or below 0 °C in the period; the part not forecast is noted beside it (Hodboard rule)
    const day = dayWith('bricklaying', (h) => (h === 50 ? { tempC: -1 } : {}), defaultRuleSettings, DAY_AND_48H);
    expect(find(day, 'cold.mortar.frost-protection')?.verdict).toBe('caution');
    expect(find(day, 'forecast.reach.frost-protection')).toBeUndefined();
    expect(note(day, 'forecast.reach.frost-protection')?.uncovered).toEqual([{ from: '2026-03-05T00:00:00.000Z', to: '2026-03-08T08:00:00.000Z' }]);
  });

  it('looks ahead only as the firm sets it: no frost look-ahead, no note', () => {
    // Source: NHBC Standards 2023 §3.2.5 "up to six days"; a firm setting of 0 days turns the look-ahead off (Hodboard rule)
    const day = dayWith('bricklaying', () => ({}), resolveRuleSettings({ frostProtectionDays: 0 }), DAY_AND_48H);
    expect(day.activities[0]?.notes).toEqual([]);
    expect(day.notes).toEqual([]);
  });

  it.each([
    [29.99, 'none'], // Source: NHBC Standards 2022 §6.1.20, concern above 30 °C
    [30, 'none'], // Source: NHBC Standards 2022 §6.1.20, concern above 30 °C
    [30.01, 'caution'], // Source: NHBC Standards 2022 §6.1.20, concern above 30 °C
  ] as const)('hot weather at %f °C → %s', (t, expected) => {
    const r = find(dayWith('bricklaying', (h) => (inWindow(h) ? { tempC: t } : {})), 'heat.mortar.uk');
    if (expected === 'none') expect(r).toBeUndefined();
    else expect(r?.verdict).toBe('caution');
  });
});

describe('mortar reason wording', () => {
  const defer = /Follow the mortar manufacturer’s and the specifier’s guidance and local regulations, and check with the site’s competent person\.$/;

  it.each([
    ['cold.mortar.cement', (h: number) => (inWindow(h) ? { tempC: 2 } : {}), defaultRuleSettings], // Source: NBS F10/185 (secondary copy); NHBC Standards 2023 §3.2.5
    ['cold.mortar.frost-protection', (h: number) => (h === 30 ? { tempC: -2 } : {}), defaultRuleSettings], // Source: NHBC Standards 2023 §3.2.5, frost protection up to six days
    ['heat.mortar.uk', (h: number) => (inWindow(h) ? { tempC: 31 } : {}), defaultRuleSettings], // Source: NHBC Standards 2022 §6.1.20, above 30 °C
    ['cold.mortar.us-construction', (h: number) => (inWindow(h) ? { tempC: fToC(30) } : {}), us], // Source: TMS 602 cold-weather table (secondary copy)
    ['cold.mortar.us-protection', () => ({ tempC: fToC(30) }), us], // Source: TMS 602 protection by mean daily temperature (secondary copy)
    ['heat.mortar.us', (h: number) => (inWindow(h) ? { tempC: fToC(101) } : {}), us], // Source: TMS 602 hot weather, above 100 °F (secondary copy)
  ] as const)('%s defers to the manufacturer, the specifier and the competent person', (ruleId, at, settings) => {
    const r = find(dayWith('bricklaying', at, settings), ruleId);
    expect(r).toBeDefined();
    expect(r?.message).toMatch(defer);
  });

  it('says so too when the forecast misses hours of the frost period within the day and the next 48 h', () => {
    // Source: NHBC Standards 2023 §3.2.5, six days; Hodboard rule for the look-ahead that runs past the forecast
    expect(find(dayWith('pointing', () => ({}), defaultRuleSettings, 60), 'forecast.reach.frost-protection')?.message).toMatch(defer);
  });

  it('gives the same deferral in the rain rule and the standing advice for fresh work', () => {
    // Source: NBS F10/185 cover the work during rain (secondary copy); the rain thresholds are common practice, no source
    const day = dayWith('rendering', (h) => (inWindow(h) ? { precipMm: 1, precipProbability: 0.9 } : {}));
    expect(find(day, 'rain.fresh-work')?.message).toMatch(/manufacturer’s and the specifier’s guidance, and check with the site’s competent person/);
    expect(day.activities[0]?.advice[0]).toMatch(/mortar manufacturer’s and the specifier’s guidance, and the site’s competent person/);
  });
});

describe('US cold weather for mortar (TMS 602 / ACI 530.1)', () => {
  it.each([
    [40, null], // Source: TMS 602 — cold-weather provisions below 40 °F (Masonry Magazine Sept 2004, Table 2)
    [39.99, 1], // Source: TMS 602 band 40–32 °F
    [32, 1], // Source: TMS 602 band 40–32 °F
    [31.99, 2], // Source: TMS 602 band 32–25 °F
    [25, 2], // Source: TMS 602 band 32–25 °F
    [24.99, 3], // Source: TMS 602 band 25–20 °F
    [20, 3], // Source: TMS 602 band 25–20 °F
    [19.99, 4], // Source: TMS 602 band below 20 °F
  ])('puts %f °F in band %s', (f, band) => {
    expect(usColdBandFor(fToC(f), us.usColdBelowC)?.band ?? null).toBe(band);
  });

  it('lists the measures of its band and all the warmer bands', () => {
    // Source: TMS 602 cold-weather table, the rows are cumulative
    const r = find(dayWith('bricklaying', (h) => (inWindow(h) ? { tempC: fToC(22) } : {}), us), 'cold.mortar.us-construction');
    expect(r?.verdict).toBe('caution');
    expect(r?.message).toMatch(/band 3/);
    expect(r?.message).toMatch(/heat sand or mixing water/);
    expect(r?.message).toMatch(/windbreaks/);
    expect(r?.message).not.toMatch(/enclose and heat/);
  });

  it.each([
    [39, 1], // Source: TMS 602 / ACI 530.1 preparation, for any cold-weather band (secondary copies: masoncontractors.org, masonryconstruction.com)
    [30, 2], // Source: TMS 602 / ACI 530.1 preparation, for any cold-weather band (secondary copies)
    [22, 3], // Source: TMS 602 / ACI 530.1 preparation, for any cold-weather band (secondary copies)
    [15, 4], // Source: TMS 602 / ACI 530.1 preparation, for any cold-weather band (secondary copies)
  ])('at %f °F (band %d) lists the preparation before laying, apart from the construction measures', (f, band) => {
    const r = find(dayWith('bricklaying', (h) => (inWindow(h) ? { tempC: fToC(f) } : {}), us), 'cold.mortar.us-construction');
    expect(r?.message).toMatch(new RegExp(`band ${band}\\. Before laying: `));
    expect(r?.message).toMatch(/do not lay units that have frozen moisture, visible ice or snow on them/);
    expect(r?.message).toMatch(/heat units colder than 20 °F to at least 40 °F before laying/);
    expect(r?.message).toMatch(/heat any surface that will take mortar and has ice or snow on it until it is above freezing: brushing the ice or snow off is not enough/);
    expect(r?.message).toMatch(/While laying: heat sand or mixing water so mortar is 40–120 °F/);
    expect(r?.source).toMatch(/preparation of units and iced surfaces/);
  });

  it.each([
    [40, 'none'], // Source: TMS 602 protection by mean daily temperature, 40–25 °F cover for 24 h
    [39.99, 'membrane'], // Source: TMS 602 protection 40–25 °F, weather-resistive membrane 24 h
    [25.01, 'membrane'], // Source: TMS 602 protection 40–25 °F, weather-resistive membrane 24 h
    [25, 'membrane'], // Source: TMS 602 protection 40–25 °F (25 °F is in that band), weather-resistive membrane 24 h
    [24.99, 'insulating blankets'], // Source: TMS 602 protection 25–20 °F, insulating blankets 24 h
    [20.01, 'insulating blankets'], // Source: TMS 602 protection 25–20 °F, insulating blankets 24 h
    [20, 'insulating blankets'], // Source: TMS 602 protection 25–20 °F (20 °F is in that band), insulating blankets 24 h
    [19.99, 'heated enclosures'], // Source: below 20 °F row — from memory
  ])('protects new work by a mean daily temperature of %f °F: %s', (f, words) => {
    const r = find(dayWith('bricklaying', () => ({ tempC: fToC(f) }), us), 'cold.mortar.us-protection');
    if (words === 'none') expect(r).toBeUndefined();
    else expect(r?.message).toMatch(new RegExp(words));
  });

  it('says when the forecast does not cover the 24 h that set the protection', () => {
    // Source: TMS 602 protection by mean daily temperature (secondary copy); a 20 h forecast from midnight covers 12 h of the 24 h from 08:00 (Hodboard rule)
    const r = find(dayWith('bricklaying', () => ({}), us, 20), 'forecast.reach.us-protection');
    expect(r).toMatchObject({ verdict: 'caution', threshold: 24, observed: 12, uncovered: [{ from: '2026-03-02T20:00:00.000Z', to: '2026-03-03T08:00:00.000Z' }] });
    expect(r?.message).toMatch(/covers only 12 h of the 24 h from the start of work that set the protection/);
    expect(find(dayWith('bricklaying', () => ({}), us), 'forecast.reach.us-protection')).toBeUndefined();
  });

  it('needs no more than the standard forecast for the 24 h that set the protection, so it never only notes them', () => {
    // Source: TMS 602 protection by mean daily temperature (secondary copy); the 24 h from 08:00 end inside the day and the next 48 h (Hodboard rule)
    const day = dayWith('bricklaying', () => ({}), us, DAY_AND_48H);
    expect(find(day, 'forecast.reach.us-protection')).toBeUndefined();
    expect(day.activities[0]?.notes).toEqual([]);
    expect(day.verdict).toBe('go');
  });

  it.each([
    [100, 0, 'none'], // Source: TMS 602 hot weather, ambient above 100 °F
    [100.01, 0, 'caution'], // Source: TMS 602 hot weather, ambient above 100 °F
    [90.01, 8, 'none'], // Source: TMS 602 hot weather, above 90 °F with wind over 8 mph
    [90, 8.01, 'none'], // Source: TMS 602 hot weather, above 90 °F with wind over 8 mph
    [90.01, 8.01, 'caution'], // Source: TMS 602 hot weather, above 90 °F with wind over 8 mph
  ])('hot weather at %f °F with %f mph wind → %s', (f, mph, expected) => {
    const r = find(dayWith('bricklaying', (h) => (inWindow(h) ? { tempC: fToC(f), windMeanMs: mphToMs(mph), windGustMs: mphToMs(mph) } : {}), us), 'heat.mortar.us');
    if (expected === 'none') expect(r).toBeUndefined();
    else expect(r?.verdict).toBe('caution');
  });

  it.each([
    [115, 0, false], // Source: TMS 602 hot weather, above 115 °F shade materials and mixer (secondary copy: masoncontractors.org)
    [115.01, 0, true], // Source: TMS 602 hot weather, above 115 °F shade materials and mixer (secondary copy)
    [116, 0, true], // Source: TMS 602 hot weather, above 115 °F shade materials and mixer (secondary copy)
    [105, 8.01, false], // Source: TMS 602 hot weather, above 105 °F with wind over 8 mph shade (secondary copy)
    [105.01, 8.01, true], // Source: TMS 602 hot weather, above 105 °F with wind over 8 mph shade (secondary copy)
    [105.01, 8, false], // Source: TMS 602 hot weather, above 105 °F with wind over 8 mph; 8 mph is not over 8 (secondary copy)
  ])('at %f °F with %f mph wind asks for shade: %s', (f, mph, shade) => {
    const r = find(dayWith('bricklaying', (h) => (inWindow(h) ? { tempC: fToC(f), windMeanMs: mphToMs(mph), windGustMs: mphToMs(mph) } : {}), us), 'heat.mortar.us');
    expect(r?.verdict).toBe('caution');
    if (shade) expect(r?.message).toMatch(/shade materials and the mixer/);
    else expect(r?.message).not.toMatch(/shade/);
  });
});
