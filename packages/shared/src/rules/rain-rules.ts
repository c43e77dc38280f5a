import { fmt, type ForecastHour, type HourContext, type RuleReason } from './forecast.js';
import { SOURCES } from './sources.js';

const DEFER = 'Follow the manufacturer’s and the specifier’s guidance, and check with the site’s competent person.';

/** Fresh mortar, render and concrete: stop in likely rain, caution in possible rain. */
export function checkRainOnFreshWork(ctx: HourContext, blocked: Uint8Array, out: RuleReason[]): void {
  const s = ctx.settings;
  const f = ctx.forecast;
  let worstMm = -1;
  let worstP = -1;
  let at = -1;
  let stopHours = 0;
  let cautionHours = 0;
  for (let i = ctx.i0; i < ctx.i1; i++) {
    const h = f[i] as ForecastHour;
    const stop = h.precipMm >= s.rainStopMmPerHour && h.precipProbability >= s.rainStopProbability;
    if (stop) {
      blocked[i] = 1;
      stopHours += ctx.overlap[i] as number;
    } else if (h.precipMm >= s.rainCautionMmPerHour || h.precipProbability >= s.rainCautionProbability) {
      cautionHours += ctx.overlap[i] as number;
    } else continue;
    if (h.precipMm > worstMm || (h.precipMm === worstMm && h.precipProbability > worstP)) {
      worstMm = h.precipMm;
      worstP = h.precipProbability;
      at = i;
    }
  }
  if (at < 0) return;
  const isStop = stopHours > 0;
  const pct = fmt(worstP * 100, 0);
  out.push({
    ruleId: 'rain.fresh-work',
    verdict: isStop ? 'stop' : 'caution',
    threshold: isStop ? s.rainStopMmPerHour : s.rainCautionMmPerHour,
    unit: 'mm/h',
    observed: worstMm,
    at: (f[at] as ForecastHour).time,
    hours: isStop ? stopHours : cautionHours,
    message: isStop
      ? `Rain of ${fmt(worstMm)} mm/h (${pct} % likely) washes out fresh mortar, render and concrete surfaces: stop, and cover the work whenever it stops. ${DEFER}`
      : `Rain possible (${fmt(worstMm)} mm/h, ${pct} % likely): keep covers ready and cover the work whenever it stops. ${DEFER}`,
    source: SOURCES.rainFresh,
  });
}

export function checkHeavyRain(ctx: HourContext, out: RuleReason[]): void {
  const s = ctx.settings;
  const f = ctx.forecast;
  let worst = -1;
  let at = -1;
  let hours = 0;
  for (let i = ctx.i0; i < ctx.i1; i++) {
    const mm = (f[i] as ForecastHour).precipMm;
    if (mm < s.groundworksHeavyRainMmPerHour) continue;
    hours += ctx.overlap[i] as number;
    if (mm > worst) {
      worst = mm;
      at = i;
    }
  }
  if (at < 0) return;
  out.push({
    ruleId: 'rain.groundworks',
    verdict: 'caution',
    threshold: s.groundworksHeavyRainMmPerHour,
    unit: 'mm/h',
    observed: worst,
    at: (f[at] as ForecastHour).time,
    hours,
    message: `Heavy rain, ${fmt(worst)} mm/h: trenches and excavations can flood and sides can collapse. Keep people out of unsupported trenches and check them before re-entry, as a competent person and local regulations require.`,
    source: SOURCES.rainHeavy,
  });
}
