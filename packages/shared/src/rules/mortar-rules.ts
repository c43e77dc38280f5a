import type { MortarKind } from './activities.js';
import {
  coldestAhead, fmt, HOUR, indexAtOrAfter, lookAheadCover, reportLookAheadCover, tempAt, tempReason, timeAt, windowExtreme,
  type AssessmentNote, type ForecastHour, type HourContext, type LookAheadSpec, type RuleReason,
} from './forecast.js';
import { SOURCES } from './sources.js';
import { cToF, msToMph } from './units.js';

const DEFER = 'Follow the mortar manufacturer’s and the specifier’s guidance and local regulations, and check with the site’s competent person.';

/**
 * Direction of the thermometer through hour `i`: towards the next reading, or from the
 * previous one at the end of the data. +1 rising, -1 falling, 0 steady or unknown.
 */
export function trendAt(f: readonly ForecastHour[], i: number): -1 | 0 | 1 {
  const t = (f[i] as ForecastHour).tempC;
  const next = f[i + 1];
  const prev = f[i - 1];
  const d = next !== undefined ? next.tempC - t : prev !== undefined ? t - prev.tempC : 0;
  return d > 0 ? 1 : d < 0 ? -1 : 0;
}

/**
 * UK rule for laying and pointing: allowed above the falling-stop temperature, or at or
 * above the resume temperature while it is rising; blocked otherwise (NBS F10/185 reads
 * "at or below 3 °C and falling … unless at least 1 °C and rising"; NHBC 2023 says "below").
 */
export function canLayInCold(tempC: number, trend: -1 | 0 | 1, fallingStopC: number, risingResumeC: number): boolean {
  return tempC > fallingStopC || (tempC >= risingResumeC && trend === 1);
}

export function checkUkMortarCold(ctx: HourContext, mortar: MortarKind, blocked: Uint8Array, out: RuleReason[]): void {
  const s = ctx.settings;
  const f = ctx.forecast;
  const lime = mortar === 'hydraulic-lime';
  const stopC = lime ? s.limeFallingStopC : s.cementFallingStopC;
  const resumeC = lime ? s.limeRisingResumeC : s.cementRisingResumeC;
  const cold = windowExtreme(ctx, (t, i) => t <= stopC && !canLayInCold(t, trendAt(f, i), stopC, resumeC), { blocked });
  if (!cold) return;
  const kind = lime ? 'hydraulic lime mortar' : 'cement-gauged mortar';
  out.push(tempReason(ctx, cold, {
    ruleId: lime ? 'cold.mortar.lime' : 'cold.mortar.cement',
    verdict: 'stop',
    threshold: stopC,
    message: `Air down to ${fmt(cold.tempC)} °C: no laying or pointing in ${kind} at or below ${fmt(stopC)} °C and falling; resume at ${fmt(resumeC)} °C and rising. Keep new work above freezing until the mortar has set. ${DEFER}`,
    source: lime ? SOURCES.nbsF10Lime : SOURCES.nbsF10,
  }));
}

/** Fresh mortar needs frost protection for days after laying: look ahead through the forecast. */
export function checkFrostProtection(ctx: HourContext, out: RuleReason[], notes: AssessmentNote[]): void {
  const s = ctx.settings;
  if (s.frostProtectionDays <= 0) return;
  const until = ctx.windowStart + s.frostProtectionDays * 24 * HOUR;
  const frost = coldestAhead(ctx, until, s.frostAtOrBelowC);
  if (frost) {
    const horizonH = Math.max(0, Math.min(until, timeAt(ctx, frost.stop - 1) + HOUR) - ctx.windowStart) / HOUR;
    out.push(tempReason(ctx, frost, {
      ruleId: 'cold.mortar.frost-protection',
      verdict: 'caution',
      threshold: s.frostAtOrBelowC,
      message: `Frost to ${fmt(frost.tempC)} °C forecast within ${fmt(horizonH, 0)} h of laying: protect the work with insulated covers, polythene with an air gap, for up to ${s.frostProtectionDays} days. ${DEFER}`,
      source: SOURCES.nhbcFrost,
    }));
  }
  const cover = lookAheadCover(ctx, until);
  if (cover) {
    reportLookAheadCover(ctx, cover, {
      ruleId: 'forecast.reach.frost-protection',
      period: `frost-protection period (${s.frostProtectionDays} days) from the start of work`,
      rule: 'frost-protection rule',
      inDays: true,
      risk: 'Frost then is not ruled out: check the forecast again before then and keep frost protection for the new work to hand.',
      defer: DEFER,
    }, out, notes);
  }
}

export function checkUkMortarHeat(ctx: HourContext, out: RuleReason[]): void {
  const s = ctx.settings;
  const heat = windowExtreme(ctx, (t) => t > s.ukHeatCautionAboveC, { hottest: true });
  if (!heat) return;
  out.push(tempReason(ctx, heat, {
    ruleId: 'heat.mortar.uk',
    verdict: 'caution',
    threshold: s.ukHeatCautionAboveC,
    message: `Air up to ${fmt(heat.tempC)} °C, above ${fmt(s.ukHeatCautionAboveC)} °C: mortar loses water and plasticity fast. Shade materials, wet absorbent units, mix small batches and cover new work. Watch the crew for heat illness. ${DEFER}`,
    source: SOURCES.nhbcHeat,
  }));
}

export interface UsColdBand {
  band: 1 | 2 | 3 | 4;
  /** Inclusive lower and exclusive upper limits, °F, as the TMS 602 table gives them. */
  fromF: number;
  belowF: number;
  construction: string;
}

// Cumulative: each band adds to the measures of the bands above it.
export const usColdBands: readonly UsColdBand[] = [
  { band: 1, fromF: 32, belowF: 40, construction: 'heat sand or mixing water so mortar is 40–120 °F' },
  { band: 2, fromF: 25, belowF: 32, construction: 'heat sand and water; keep mortar above freezing until used; heat grout materials' },
  { band: 3, fromF: 20, belowF: 25, construction: 'heat surfaces under construction to 40 °F; windbreaks or enclosure when wind exceeds 15 mph; heat masonry to 40 °F before grouting' },
  { band: 4, fromF: -Infinity, belowF: 20, construction: 'enclose and heat to keep the air above 32 °F' },
];

/** Preparation before laying in any cold-weather band; set by the units and surfaces, not the air. */
export const usColdPreparation: readonly string[] = [
  'do not lay units that have frozen moisture, visible ice or snow on them',
  'heat units colder than 20 °F to at least 40 °F before laying',
  'heat any surface that will take mortar and has ice or snow on it until it is above freezing: brushing the ice or snow off is not enough',
];

export function usColdBandFor(tempC: number, coldBelowC: number): UsColdBand | null {
  if (tempC >= coldBelowC) return null;
  const f = cToF(tempC);
  for (const b of usColdBands) if (f >= b.fromF) return b;
  return usColdBands[3] as UsColdBand;
}

function usProtection(meanF: number): string {
  if (meanF < 20) return 'keep the masonry above 32 °F for 24 h with heated enclosures, electric blankets or lamps';
  if (meanF < 25) return 'cover with insulating blankets for 24 h (BIA Technical Note 1: 48 h)';
  return 'cover completely with a weather-resistive membrane for 24 h (BIA Technical Note 1: 48 h)';
}

const US_PROTECTION_REACH: LookAheadSpec = {
  ruleId: 'forecast.reach.us-protection',
  period: 'from the start of work that set the protection by mean daily temperature',
  rule: 'US mortar protection rule',
  inDays: false,
  risk: 'The mean daily temperature is worked out from the hours forecast only: check the forecast again and be ready to protect the new work.',
  defer: DEFER,
};

export function checkUsMortarCold(ctx: HourContext, out: RuleReason[], notes: AssessmentNote[]): void {
  const s = ctx.settings;
  const f = ctx.forecast;
  const cold = windowExtreme(ctx, (t) => t < s.usColdBelowC);
  if (cold) {
    const band = usColdBandFor(cold.tempC, s.usColdBelowC) as UsColdBand;
    const measures = usColdBands.filter((b) => b.band <= band.band).map((b) => b.construction).join('; ');
    out.push(tempReason(ctx, cold, {
      ruleId: 'cold.mortar.us-construction',
      verdict: 'caution',
      threshold: s.usColdBelowC,
      message: `Air down to ${fmt(cToF(cold.tempC), 0)} °F (${fmt(cold.tempC)} °C), cold-weather band ${band.band}. Before laying: ${usColdPreparation.join('; ')}. While laying: ${measures}. ${DEFER}`,
      source: SOURCES.tms602Cold,
    }));
  }
  // Protection is set by the mean daily temperature, (high + low) / 2, over the day laid.
  let hi = -Infinity;
  let lo = Infinity;
  const until = ctx.windowStart + 24 * HOUR;
  const stop = indexAtOrAfter(ctx, until, ctx.i0);
  for (let i = ctx.i0; i < stop; i++) {
    const t = tempAt(f, i);
    if (t > hi) hi = t;
    if (t < lo) lo = t;
  }
  const cover = lookAheadCover(ctx, until);
  if (cover) reportLookAheadCover(ctx, cover, US_PROTECTION_REACH, out, notes);
  if (lo === Infinity) return;
  const mean = (hi + lo) / 2;
  if (mean >= s.usColdBelowC) return;
  const meanF = cToF(mean);
  out.push({
    ruleId: 'cold.mortar.us-protection',
    verdict: 'caution',
    threshold: s.usColdBelowC,
    unit: '°C',
    observed: mean,
    at: null,
    hours: 0,
    message: `Mean daily temperature ${fmt(meanF, 0)} °F (${fmt(mean)} °C): protect new masonry, ${usProtection(meanF)}. ${DEFER}`,
    source: SOURCES.tms602Protection,
  });
}

export function checkUsMortarHeat(ctx: HourContext, out: RuleReason[]): void {
  const s = ctx.settings;
  const f = ctx.forecast;
  let worst = -Infinity;
  let at = -1;
  let hours = 0;
  let extreme = false;
  for (let i = ctx.i0; i < ctx.i1; i++) {
    const h = f[i] as ForecastHour;
    const windy = h.windMeanMs > s.usHotWindAboveMs;
    if (!(h.tempC > s.usHotAboveC || (windy && h.tempC > s.usHotWindyAboveC))) continue;
    hours += ctx.overlap[i] as number;
    if (h.tempC > s.usHotExtremeAboveC || (windy && h.tempC > s.usHotExtremeWindyAboveC)) extreme = true;
    if (h.tempC > worst) {
      worst = h.tempC;
      at = i;
    }
  }
  if (at < 0) return;
  const h = f[at] as ForecastHour;
  const windy = h.windMeanMs > s.usHotWindAboveMs;
  out.push({
    ruleId: 'heat.mortar.us',
    verdict: 'caution',
    threshold: windy ? s.usHotWindyAboveC : s.usHotAboveC,
    unit: '°C',
    observed: worst,
    at: h.time,
    hours,
    message: `Air up to ${fmt(cToF(worst), 0)} °F (${fmt(worst)} °C)${windy ? ` with wind over ${fmt(msToMph(s.usHotWindAboveMs), 0)} mph` : ''}: hot-weather provisions apply; keep mortar and grout at or below 120 °F, fog-spray new masonry 3 times a day for 3 days, cover wall tops 2 ft down at day end${extreme ? '; shade materials and the mixer' : ''}. Watch the crew for heat illness. ${DEFER}`,
    source: SOURCES.tms602Hot,
  });
}
