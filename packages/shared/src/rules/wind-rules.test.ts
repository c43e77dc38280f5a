import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { activities, type Activity } from './activities.js';
import { assessDay, type DayAssessment } from './assess-day.js';
import { DAY, hourlyForecast, inWindow, WINDOW } from './fixtures/forecast-builder.js';
import type { ForecastHour, RuleReason } from './forecast.js';
import { defaultRuleSettings, resolveRuleSettings, type RuleSettings } from './settings.js';
import { mphToMs } from './units.js';

const d = defaultRuleSettings;

function windDay(activity: Activity, meanMs: number, gustMs: number, settings: RuleSettings = d): DayAssessment {
  const forecast = hourlyForecast(DAY, 72, (h) => (inWindow(h) ? { windMeanMs: meanMs, windGustMs: gustMs } : {}));
  return assessDay({ activities: [activity], forecast, window: WINDOW, settings });
}

function reason(day: DayAssessment, ruleId: string): RuleReason | undefined {
  return day.activities[0]?.reasons.find((r) => r.ruleId === ruleId);
}

type Edge = 'caution' | 'stop';
type Row = [Activity, string, 'mean' | 'gust', number, Edge, number, 'none' | Edge];

// Every limit, just below / at / just above its caution edge and its stop edge.
// Caution edges are the stop value × the caution ratio (0.8, common practice, no source).
const rows: Row[] = [
  ['mewp', 'wind.mewp.gust', 'gust', d.mewpGustStopMs, 'caution', -0.01, 'none'], // Source: BS EN 280 12.5 m/s, caution band common practice, no source
  ['mewp', 'wind.mewp.gust', 'gust', d.mewpGustStopMs, 'caution', 0, 'caution'], // Source: BS EN 280 12.5 m/s, caution band common practice, no source
  ['mewp', 'wind.mewp.gust', 'gust', d.mewpGustStopMs, 'caution', 0.01, 'caution'], // Source: BS EN 280 12.5 m/s, caution band common practice, no source
  ['mewp', 'wind.mewp.gust', 'gust', d.mewpGustStopMs, 'stop', -0.01, 'caution'], // Source: BS EN 280:2001+A2:2009 rated 12.5 m/s (IPAF FAQ 5848, secondary copy)
  ['mewp', 'wind.mewp.gust', 'gust', d.mewpGustStopMs, 'stop', 0, 'stop'], // Source: BS EN 280:2001+A2:2009 rated 12.5 m/s (IPAF FAQ 5848, secondary copy)
  ['mewp', 'wind.mewp.gust', 'gust', d.mewpGustStopMs, 'stop', 0.01, 'stop'], // Source: BS EN 280:2001+A2:2009 rated 12.5 m/s (IPAF FAQ 5848, secondary copy)
  ['tower', 'wind.tower.mean', 'mean', d.towerMeanStopMs, 'caution', -0.01, 'none'], // Source: PASMA FAQ 17 mph; caution band common practice, no source
  ['tower', 'wind.tower.mean', 'mean', d.towerMeanStopMs, 'caution', 0, 'caution'], // Source: PASMA FAQ 17 mph; caution band common practice, no source
  ['tower', 'wind.tower.mean', 'mean', d.towerMeanStopMs, 'caution', 0.01, 'caution'], // Source: PASMA FAQ 17 mph; caution band common practice, no source
  ['tower', 'wind.tower.mean', 'mean', d.towerMeanStopMs, 'stop', -0.01, 'caution'], // Source: PASMA FAQ (pasma.co.uk/faqs/safety), average 17 mph
  ['tower', 'wind.tower.mean', 'mean', d.towerMeanStopMs, 'stop', 0, 'stop'], // Source: PASMA FAQ (pasma.co.uk/faqs/safety), average 17 mph
  ['tower', 'wind.tower.mean', 'mean', d.towerMeanStopMs, 'stop', 0.01, 'stop'], // Source: PASMA FAQ (pasma.co.uk/faqs/safety), average 17 mph
  ['roof-work', 'wind.roof.mean', 'mean', d.roofMeanStopMs, 'caution', -0.01, 'none'], // Source: NFRC mean 23 mph; caution band common practice, no source
  ['roof-work', 'wind.roof.mean', 'mean', d.roofMeanStopMs, 'caution', 0, 'caution'], // Source: NFRC mean 23 mph; caution band common practice, no source
  ['roof-work', 'wind.roof.mean', 'mean', d.roofMeanStopMs, 'caution', 0.01, 'caution'], // Source: NFRC mean 23 mph; caution band common practice, no source
  ['roof-work', 'wind.roof.mean', 'mean', d.roofMeanStopMs, 'stop', -0.01, 'caution'], // Source: NFRC "Roofing and cladding in windy conditions", mean 23 mph (secondary copy)
  ['roof-work', 'wind.roof.mean', 'mean', d.roofMeanStopMs, 'stop', 0, 'stop'], // Source: NFRC "Roofing and cladding in windy conditions", mean 23 mph (secondary copy)
  ['roof-work', 'wind.roof.mean', 'mean', d.roofMeanStopMs, 'stop', 0.01, 'stop'], // Source: NFRC "Roofing and cladding in windy conditions", mean 23 mph (secondary copy)
  ['roof-work', 'wind.roof.gust', 'gust', d.roofGustStopMs, 'caution', -0.01, 'none'], // Source: NFRC gusts 35 mph; caution band common practice, no source
  ['roof-work', 'wind.roof.gust', 'gust', d.roofGustStopMs, 'caution', 0, 'caution'], // Source: NFRC gusts 35 mph; caution band common practice, no source
  ['roof-work', 'wind.roof.gust', 'gust', d.roofGustStopMs, 'caution', 0.01, 'caution'], // Source: NFRC gusts 35 mph; caution band common practice, no source
  ['roof-work', 'wind.roof.gust', 'gust', d.roofGustStopMs, 'stop', -0.01, 'caution'], // Source: NFRC windy-conditions guidance, gusting 35 mph (secondary copy)
  ['roof-work', 'wind.roof.gust', 'gust', d.roofGustStopMs, 'stop', 0, 'stop'], // Source: NFRC windy-conditions guidance, gusting 35 mph (secondary copy)
  ['roof-work', 'wind.roof.gust', 'gust', d.roofGustStopMs, 'stop', 0.01, 'stop'], // Source: NFRC windy-conditions guidance, gusting 35 mph (secondary copy)
  ['sheet-handling', 'wind.sheet.mean', 'mean', d.sheetMeanStopMs, 'caution', -0.01, 'none'], // Source: NFRC sheets mean 17 mph; caution band common practice, no source
  ['sheet-handling', 'wind.sheet.mean', 'mean', d.sheetMeanStopMs, 'caution', 0, 'caution'], // Source: NFRC sheets mean 17 mph; caution band common practice, no source
  ['sheet-handling', 'wind.sheet.mean', 'mean', d.sheetMeanStopMs, 'caution', 0.01, 'caution'], // Source: NFRC sheets mean 17 mph; caution band common practice, no source
  ['sheet-handling', 'wind.sheet.mean', 'mean', d.sheetMeanStopMs, 'stop', -0.01, 'caution'], // Source: NFRC windy-conditions guidance, sheets over 5 m, mean 17 mph (secondary copy)
  ['sheet-handling', 'wind.sheet.mean', 'mean', d.sheetMeanStopMs, 'stop', 0, 'stop'], // Source: NFRC windy-conditions guidance, sheets over 5 m, mean 17 mph (secondary copy)
  ['sheet-handling', 'wind.sheet.mean', 'mean', d.sheetMeanStopMs, 'stop', 0.01, 'stop'], // Source: NFRC windy-conditions guidance, sheets over 5 m, mean 17 mph (secondary copy)
  ['sheet-handling', 'wind.sheet.gust', 'gust', d.sheetGustStopMs, 'caution', -0.01, 'none'], // Source: NFRC sheets gusts 26 mph; caution band common practice, no source
  ['sheet-handling', 'wind.sheet.gust', 'gust', d.sheetGustStopMs, 'caution', 0, 'caution'], // Source: NFRC sheets gusts 26 mph; caution band common practice, no source
  ['sheet-handling', 'wind.sheet.gust', 'gust', d.sheetGustStopMs, 'caution', 0.01, 'caution'], // Source: NFRC sheets gusts 26 mph; caution band common practice, no source
  ['sheet-handling', 'wind.sheet.gust', 'gust', d.sheetGustStopMs, 'stop', -0.01, 'caution'], // Source: NFRC windy-conditions guidance, sheets over 5 m, gusting 26 mph (secondary copy)
  ['sheet-handling', 'wind.sheet.gust', 'gust', d.sheetGustStopMs, 'stop', 0, 'stop'], // Source: NFRC windy-conditions guidance, sheets over 5 m, gusting 26 mph (secondary copy)
  ['sheet-handling', 'wind.sheet.gust', 'gust', d.sheetGustStopMs, 'stop', 0.01, 'stop'], // Source: NFRC windy-conditions guidance, sheets over 5 m, gusting 26 mph (secondary copy)
  ['work-at-height', 'wind.scaffold-use.gust', 'gust', d.scaffoldUseGustStopMs, 'caution', -0.01, 'none'], // Source: 18 m/s weak secondary copy; caution band common practice, no source
  ['work-at-height', 'wind.scaffold-use.gust', 'gust', d.scaffoldUseGustStopMs, 'caution', 0, 'caution'], // Source: 18 m/s weak secondary copy; caution band common practice, no source
  ['work-at-height', 'wind.scaffold-use.gust', 'gust', d.scaffoldUseGustStopMs, 'caution', 0.01, 'caution'], // Source: 18 m/s weak secondary copy; caution band common practice, no source
  ['work-at-height', 'wind.scaffold-use.gust', 'gust', d.scaffoldUseGustStopMs, 'stop', -0.01, 'caution'], // Source: scaffold designer blog "usual maximum" 18 m/s (weak secondary copy; no NASC figure)
  ['work-at-height', 'wind.scaffold-use.gust', 'gust', d.scaffoldUseGustStopMs, 'stop', 0, 'stop'], // Source: scaffold designer blog "usual maximum" 18 m/s (weak secondary copy; no NASC figure)
  ['work-at-height', 'wind.scaffold-use.gust', 'gust', d.scaffoldUseGustStopMs, 'stop', 0.01, 'stop'], // Source: scaffold designer blog "usual maximum" 18 m/s (weak secondary copy; no NASC figure)
  ['scaffold-erection', 'wind.scaffold-erection.mean', 'mean', d.scaffoldErectionMeanStopMs, 'caution', -0.01, 'none'], // Source: common practice, no source
  ['scaffold-erection', 'wind.scaffold-erection.mean', 'mean', d.scaffoldErectionMeanStopMs, 'caution', 0, 'caution'], // Source: common practice, no source
  ['scaffold-erection', 'wind.scaffold-erection.mean', 'mean', d.scaffoldErectionMeanStopMs, 'caution', 0.01, 'caution'], // Source: common practice, no source
  ['scaffold-erection', 'wind.scaffold-erection.mean', 'mean', d.scaffoldErectionMeanStopMs, 'stop', -0.01, 'caution'], // Source: common practice, no source (HSE 23 mph balance figure applied)
  ['scaffold-erection', 'wind.scaffold-erection.mean', 'mean', d.scaffoldErectionMeanStopMs, 'stop', 0, 'stop'], // Source: common practice, no source (HSE 23 mph balance figure applied)
  ['scaffold-erection', 'wind.scaffold-erection.mean', 'mean', d.scaffoldErectionMeanStopMs, 'stop', 0.01, 'stop'], // Source: common practice, no source (HSE 23 mph balance figure applied)
  ['scaffold-erection', 'wind.scaffold-erection.gust', 'gust', d.scaffoldErectionGustStopMs, 'caution', -0.01, 'none'], // Source: common practice, no source
  ['scaffold-erection', 'wind.scaffold-erection.gust', 'gust', d.scaffoldErectionGustStopMs, 'caution', 0, 'caution'], // Source: common practice, no source
  ['scaffold-erection', 'wind.scaffold-erection.gust', 'gust', d.scaffoldErectionGustStopMs, 'caution', 0.01, 'caution'], // Source: common practice, no source
  ['scaffold-erection', 'wind.scaffold-erection.gust', 'gust', d.scaffoldErectionGustStopMs, 'stop', -0.01, 'caution'], // Source: common practice, no source (NFRC 35 mph gust applied)
  ['scaffold-erection', 'wind.scaffold-erection.gust', 'gust', d.scaffoldErectionGustStopMs, 'stop', 0, 'stop'], // Source: common practice, no source (NFRC 35 mph gust applied)
  ['scaffold-erection', 'wind.scaffold-erection.gust', 'gust', d.scaffoldErectionGustStopMs, 'stop', 0.01, 'stop'], // Source: common practice, no source (NFRC 35 mph gust applied)
];

describe('wind limits', () => {
  it.each(rows)('%s: %s %s at the %f limit, %s edge offset %f m/s → %s', (activity, ruleId, stat, stopMs, edge, offset, expected) => {
    const edgeMs = edge === 'stop' ? stopMs : stopMs * d.windCautionRatio;
    const v = edgeMs + offset;
    // The other statistic is kept low so only this limit is in play.
    const day = stat === 'mean' ? windDay(activity, v, v) : windDay(activity, 1, v);
    const r = reason(day, ruleId);
    if (expected === 'none') {
      expect(r).toBeUndefined();
      return;
    }
    expect(r?.verdict).toBe(expected);
    expect(r?.threshold).toBe(expected === 'stop' ? stopMs : stopMs * d.windCautionRatio);
    expect(r?.observed).toBeCloseTo(v, 9);
    expect(r?.hours).toBe(9);
    expect(r?.at).toBe('2026-03-02T08:00:00.000Z');
    if (expected === 'stop') {
      expect(day.activities[0]?.usableHours).toBe(0);
      expect(day.verdict).toBe('stop');
    }
  });

  it.each([
    ['roof-work', 'wind.roof.balance', 22.99, 'none'], // Source: HSE roof-work FAQ, "in excess of 23 mph (force 5)" affects balance
    ['roof-work', 'wind.roof.balance', 23, 'none'], // Source: HSE roof-work FAQ, "in excess of 23 mph (force 5)" affects balance
    ['roof-work', 'wind.roof.balance', 23.01, 'caution'], // Source: HSE roof-work FAQ, "in excess of 23 mph (force 5)" affects balance
    ['work-at-height', 'wind.scaffold-use.balance', 22.99, 'none'], // Source: common practice, no source — HSE's roof-work 23 mph figure applied to scaffold edges
    ['work-at-height', 'wind.scaffold-use.balance', 23, 'none'], // Source: common practice, no source — HSE's roof-work 23 mph figure applied to scaffold edges, strictly "in excess of"
    ['work-at-height', 'wind.scaffold-use.balance', 23.01, 'caution'], // Source: common practice, no source — HSE's roof-work 23 mph figure applied to scaffold edges
  ])('%s: the balance caution (%s) at a mean of %f mph → %s', (activity, ruleId, mph, expected) => {
    // Lift the NFRC stop so the HSE caution can be seen on its own.
    const s = resolveRuleSettings({ roofMeanStopMs: 20 });
    const r = reason(windDay(activity as Activity, mphToMs(mph), mphToMs(mph), s), ruleId);
    if (expected === 'none') expect(r).toBeUndefined();
    else expect(r?.verdict).toBe('caution');
  });

  it('labels the scaffold-edge balance caution as common practice, not as an HSE rule', () => {
    // Source: HSE construction FAQ gives the 23 mph balance figure for roof work only (secondary copy, trade-rules §1b); using it at scaffold edges is common practice, no source
    const s = resolveRuleSettings({ roofMeanStopMs: 20 });
    const edge = reason(windDay('work-at-height', mphToMs(24), mphToMs(24), s), 'wind.scaffold-use.balance');
    expect(edge?.source).toMatch(/^Common practice, no source: the HSE roof-work figure .* applied to scaffold and roof edges/);
    expect(edge?.source).not.toBe(reason(windDay('roof-work', mphToMs(24), mphToMs(24), s), 'wind.roof.balance')?.source);
    expect(reason(windDay('roof-work', mphToMs(24), mphToMs(24), s), 'wind.roof.balance')?.source).toMatch(/^HSE construction FAQ, roof work/);
  });

  it('judges each limit on its own statistic: a strong gust does not trip a mean limit', () => {
    // Source: PASMA FAQ uses the average; trade-rules §1c, judge each limit by the statistic its source names
    const day = windDay('tower', 3, 25);
    expect(reason(day, 'wind.tower.mean')).toBeUndefined();
    expect(day.verdict).toBe('go');
  });

  it('shows the Beaufort force on every wind reason', () => {
    // Source: Met Office Beaufort scale (National Meteorological Library Fact Sheet 6, secondary copy): force 6 strong breeze is 22–27 kn, and 13.0 m/s = 25.3 kn; WMO m/s column 10.8–13.8
    const day = windDay('mewp', 13, 13);
    const r = reason(day, 'wind.mewp.gust');
    expect(r?.beaufort).toEqual({ force: 6, name: 'Strong breeze' });
    expect(r?.message).toMatch(/force 6 strong breeze/);
  });

  it('takes the Beaufort force from the mean wind, not the gust, and quotes the gust on its own', () => {
    // Source: Met Office Beaufort scale (Fact Sheet 6, secondary copy): force 2 light breeze is 4–6 kn, and a 3.0 m/s mean = 5.8 kn (WMO m/s column 1.6–3.3);
    // the scale describes the mean wind, gusts are reported separately (trade-rules §1c, secondary copy). A 13 m/s gust alone would read force 6.
    const r = reason(windDay('mewp', 3, 13), 'wind.mewp.gust');
    expect(r).toMatchObject({ verdict: 'stop', observed: 13, beaufort: { force: 2, name: 'Light breeze' } });
    expect(r?.message).toMatch(/^Gusts of 13\.0 m\/s \(29 mph\) \(forecast mean wind at 10 m 3\.0 m\/s \(7 mph\), force 2 light breeze\) reach the MEWP rated wind speed/);
    expect(r?.message).not.toMatch(/force 6/);
  });

  it('takes the Beaufort force from the forecast at 10 m when the firm scales wind for height', () => {
    // Source: Met Office Beaufort scale (Fact Sheet 6, secondary copy): force 3 gentle breeze is 7–10 kn, and a 5.0 m/s mean = 9.7 kn (WMO m/s column 3.4–5.4);
    // the scale is defined for 10 m, so the × 1.5 working-height figure (13.5 m/s, force 6 if read on the scale) does not set it
    const r = reason(windDay('mewp', 5, 9, resolveRuleSettings({ windHeightFactor: 1.5 })), 'wind.mewp.gust');
    expect(r?.observed).toBeCloseTo(13.5, 9);
    expect(r?.beaufort).toEqual({ force: 3, name: 'Gentle breeze' });
    expect(r?.message).toMatch(/Gusts of 13\.5 m\/s \(30 mph\) \(forecast × 1\.50 for working height\) \(forecast mean wind at 10 m 5\.0 m\/s \(11 mph\), force 3 gentle breeze\)/);
  });

  it('quotes the gust beside the force on a mean-wind limit', () => {
    // Source: Met Office Beaufort scale (Fact Sheet 6, secondary copy): force 5 fresh breeze is 17–21 kn, and 9.0 m/s = 17.5 kn (WMO m/s column 8.0–10.7);
    // PASMA FAQ judges towers on the average wind (pasma.co.uk/faqs/safety)
    const r = reason(windDay('tower', 9, 14), 'wind.tower.mean');
    expect(r).toMatchObject({ verdict: 'stop', observed: 9, beaufort: { force: 5, name: 'Fresh breeze' } });
    expect(r?.message).toMatch(/^Mean wind of 9\.0 m\/s \(20 mph\) \(force 5 fresh breeze; gusts 14\.0 m\/s \(31 mph\)\) reaches the mobile tower limit of 7\.6 m\/s \(17 mph\)/);
  });

  it('says the law sets no number for work at height and scaffold erection, and defers to a competent person', () => {
    // Source: WAHR 2005 reg 4(3); 29 CFR 1926.451(f)(12) — no wind speed given
    for (const a of ['work-at-height', 'scaffold-erection'] as const) {
      const r = windDay(a, 12, 20).activities[0]?.reasons[0];
      expect(r?.message).toMatch(/law names no wind speed/);
      expect(r?.message).toMatch(/competent person/);
    }
  });

  it('scales wind for working height when the firm asks it to', () => {
    // Source: IPAF guide via trade-rules §1b — wind may be 50 % greater at 20 m
    expect(windDay('mewp', 5, 9).verdict).toBe('go');
    const high = resolveRuleSettings({ windHeightFactor: 1.5 });
    const r = reason(windDay('mewp', 5, 9, high), 'wind.mewp.gust');
    expect(r?.verdict).toBe('stop');
    expect(r?.observed).toBeCloseTo(13.5, 9);
  });

  it('stops the day when wind stops part of it, still counting the calm hours as usable', () => {
    // Source: BS EN 280:2001+A2:2009 rated wind speed 12.5 m/s (secondary copy: IPAF FAQ 5848); a stop reason stops the activity (Hodboard rule)
    const forecast = hourlyForecast(DAY, 72, (h) => (h >= 12 && h < 15 ? { windMeanMs: 6, windGustMs: 14 } : {}));
    const day = assessDay({ activities: ['mewp'], forecast, window: WINDOW });
    expect(day.activities[0]?.usableHours).toBe(6);
    expect(day.verdict).toBe('stop');
    expect(reason(day, 'wind.mewp.gust')).toMatchObject({ verdict: 'stop', hours: 3, at: '2026-03-02T12:00:00.000Z' });
  });
});

describe('wind reason wording', () => {
  it.each([
    // Source: BS EN 280 rated wind speed 12.5 m/s (IPAF FAQ 5848, secondary copy); the harm named is common practice, no source
    ['mewp', 'wind.mewp.gust', 1, 14, [/can overturn the machine/, /throw people from the platform/, /Lower the platform and stop/]],
    // Source: PASMA FAQ (pasma.co.uk/faqs/safety) — stop work and dismantle at an average of 17 mph; the harm named is common practice, no source
    ['tower', 'wind.tower.mean', 9, 9, [/can blow over in the wind, and people on it can fall/, /dismantle the tower \(current PASMA guidance\)/, /do not use it above the tower manufacturer’s wind limit/]],
    // Source: NFRC "Roofing and cladding in windy conditions", mean 23 mph (secondary copy); HSE roof-work FAQ, balance (secondary copy)
    ['roof-work', 'wind.roof.mean', 11, 11, [/push roofers off balance and off the roof/, /lift slates, tiles, felt and loose materials onto people below/]],
    // Source: NFRC windy-conditions guidance, sheets over 5 m gusting 26 mph (secondary copy); "like a sail" is common practice, no source
    ['sheet-handling', 'wind.sheet.gust', 1, 12, [/catches the wind like a sail/, /off balance or off an edge/, /torn out of their hands/]],
    // Source: scaffold designer blog "usual maximum" 18 m/s (weak secondary copy); the harm named is common practice, no source
    ['work-at-height', 'wind.scaffold-use.gust', 1, 19, [/off balance at edges and off the scaffold/, /blow loose materials off the lifts/]],
    // Source: common practice, no source (firm's scaffold-erection gust limit, NFRC 35 mph applied)
    ['scaffold-erection', 'wind.scaffold-erection.gust', 1, 16, [/tear tubes and boards out of their hands/, /part-built scaffold/]],
  ] as const)('%s: the %s stop names the harm and what to do', (activity, ruleId, meanMs, gustMs, parts) => {
    const r = reason(windDay(activity, meanMs, gustMs), ruleId);
    expect(r?.verdict).toBe('stop');
    for (const part of parts) expect(r?.message).toMatch(part);
    expect(r?.message).toMatch(/Follow local regulations and the site’s competent person, who may stop work sooner\.$/);
  });

  it('never tells a tower user to tie the tower instead of taking it down', () => {
    // Source: PASMA FAQ (pasma.co.uk/faqs/safety), current guidance: stop and dismantle; "tie if 25 mph likely" is older, superseded guidance (trade-rules §1b)
    for (const [mean, verdict] of [[6.5, 'caution'], [9, 'stop']] as const) {
      const r = reason(windDay('tower', mean, mean), 'wind.tower.mean');
      expect(r?.verdict).toBe(verdict);
      expect(r?.message).not.toMatch(/\btie\b|\btied\b|\btying\b/i);
      expect(r?.message).toMatch(/can blow over/);
    }
  });

  it('names the harm in a caution too', () => {
    // Source: HSE roof-work FAQ, winds over 23 mph (force 5) affect a person's balance (secondary copy)
    const r = reason(windDay('roof-work', mphToMs(24), mphToMs(24), resolveRuleSettings({ roofMeanStopMs: 20 })), 'wind.roof.balance');
    expect(r?.verdict).toBe('caution');
    expect(r?.message).toMatch(/affects a person’s balance on a roof, risking a fall/);
    expect(r?.message).toMatch(/competent person/);
  });
});

describe('more wind never improves a verdict', () => {
  const hourArb = fc.record({
    tempC: fc.double({ min: -10, max: 35, noNaN: true }),
    windMeanMs: fc.double({ min: 0, max: 25, noNaN: true }),
    gustExtra: fc.double({ min: 0, max: 15, noNaN: true }),
    precipMm: fc.double({ min: 0, max: 5, noNaN: true }),
    precipProbability: fc.double({ min: 0, max: 1, noNaN: true }),
  });
  const rank = { go: 0, caution: 1, stop: 2 } as const;

  it('holds for every activity, hour by hour and for the day', () => {
    fc.assert(
      fc.property(
        fc.array(hourArb, { minLength: 24, maxLength: 24 }),
        fc.array(fc.double({ min: 0, max: 10, noNaN: true }), { minLength: 24, maxLength: 24 }),
        fc.subarray([...activities], { minLength: 1 }),
        (hours, extra, planned) => {
          const build = (add: boolean): ForecastHour[] =>
            hours.map((h, i) => {
              const more = add ? (extra[i] as number) : 0;
              return {
                time: new Date(Date.parse(DAY) + i * 3_600_000).toISOString(),
                tempC: h.tempC,
                windMeanMs: h.windMeanMs + more,
                windGustMs: h.windMeanMs + h.gustExtra + more,
                precipMm: h.precipMm,
                precipProbability: h.precipProbability,
              };
            });
          const before = assessDay({ activities: planned, forecast: build(false), window: WINDOW });
          const after = assessDay({ activities: planned, forecast: build(true), window: WINDOW });
          expect(rank[after.verdict]).toBeGreaterThanOrEqual(rank[before.verdict]);
          before.activities.forEach((a, i) => {
            const b = after.activities[i];
            expect(rank[b?.verdict ?? 'go']).toBeGreaterThanOrEqual(rank[a.verdict]);
            expect(b?.usableHours ?? 0).toBeLessThanOrEqual(a.usableHours);
          });
        },
      ),
      { numRuns: 300 },
    );
  });
});
