import type { Activity } from './activities.js';
import { fmt, type ForecastHour, type HourContext, type RuleReason } from './forecast.js';
import type { RuleSettings } from './settings.js';
import { SOURCES } from './sources.js';
import { beaufortForce, msToMph } from './units.js';

export type WindStatistic = 'mean' | 'gust';

/** One wind limit: judged on the statistic its source names. */
export interface WindLimit {
  ruleId: string;
  stat: WindStatistic;
  /** At or above this the hour stops; `null` for a caution-only limit. */
  stopMs: number | null;
  cautionMs: number;
  /** HSE's "in excess of 23 mph" is strictly above; the stop limits read "at". */
  cautionStrictlyAbove: boolean;
  what: string;
  /** The way this wind hurts people, said in every reason the limit gives. */
  harm: string;
  stopAdvice: string;
  source: string;
  /** Reason text says the law sets no number. */
  lawNamesNoNumber: boolean;
}

const DEFER = 'Follow local regulations and the site’s competent person, who may stop work sooner.';

const HARM = {
  mewp: 'wind over the rating can overturn the machine, swing the basket and any load, and throw people from the platform',
  tower: 'a mobile tower can blow over in the wind, and people on it can fall',
  roof: 'wind can push roofers off balance and off the roof, and lift slates, tiles, felt and loose materials onto people below',
  roofBalance: 'wind this strong affects a person’s balance on a roof, risking a fall',
  sheet: 'a large sheet or board catches the wind like a sail: it can pull the person handling it off balance or off an edge, and it can be torn out of their hands',
  scaffoldUse: 'wind can push people off balance at edges and off the scaffold, and blow loose materials off the lifts onto people below',
  scaffoldEdge: 'wind this strong affects a person’s balance at an edge, risking a fall',
  scaffoldErection: 'wind can push scaffolders off balance, tear tubes and boards out of their hands, and load a part-built scaffold before its ties and bracing are in',
} as const;

function limit(
  ruleId: string,
  stat: WindStatistic,
  stopMs: number,
  ratio: number,
  what: string,
  harm: string,
  stopAdvice: string,
  source: string,
  lawNamesNoNumber = false,
): WindLimit {
  return { ruleId, stat, stopMs, cautionMs: stopMs * ratio, cautionStrictlyAbove: false, what, harm, stopAdvice, source, lawNamesNoNumber };
}

function balanceCaution(ruleId: string, cautionMs: number, what: string, harm: string, source: string, lawNamesNoNumber: boolean): WindLimit {
  return { ruleId, stat: 'mean', stopMs: null, cautionMs, cautionStrictlyAbove: true, what, harm, stopAdvice: '', source, lawNamesNoNumber };
}

export function windLimitsFor(activity: Activity, s: RuleSettings): readonly WindLimit[] {
  const r = s.windCautionRatio;
  switch (activity) {
    case 'mewp':
      return [limit('wind.mewp.gust', 'gust', s.mewpGustStopMs, r, 'the MEWP rated wind speed', HARM.mewp, 'Lower the platform and stop; check the rating on the machine plate', SOURCES.en280)];
    case 'tower':
      // Current PASMA guidance is to stop and dismantle; tying a tower against the wind is only for a
      // tower whose manufacturer's manual allows it, so the text does not offer it.
      return [limit('wind.tower.mean', 'mean', s.towerMeanStopMs, r, 'the mobile tower limit', HARM.tower, 'Stop work and dismantle the tower (current PASMA guidance), and do not use it above the tower manufacturer’s wind limit', SOURCES.pasmaTower)];
    case 'roof-work':
      return [
        limit('wind.roof.mean', 'mean', s.roofMeanStopMs, r, 'the roofing limit for slates, tiles and felt', HARM.roof, 'Stop laying, come off the roof and secure loose materials', SOURCES.nfrcRoof),
        limit('wind.roof.gust', 'gust', s.roofGustStopMs, r, 'the roofing gust limit for slates, tiles and felt', HARM.roof, 'Stop laying, come off the roof and secure loose materials', SOURCES.nfrcRoof),
        balanceCaution('wind.roof.balance', s.roofBalanceMeanCautionMs, 'the wind that affects a person’s balance on a roof', HARM.roofBalance, SOURCES.hseRoofBalance, false),
      ];
    case 'sheet-handling':
      return [
        limit('wind.sheet.mean', 'mean', s.sheetMeanStopMs, r, 'the limit for sheets over 5 m and large boards', HARM.sheet, 'Stop handling sheets and weigh down or tie stacks', SOURCES.nfrcSheets),
        limit('wind.sheet.gust', 'gust', s.sheetGustStopMs, r, 'the gust limit for sheets over 5 m and large boards', HARM.sheet, 'Stop handling sheets and weigh down or tie stacks', SOURCES.nfrcSheets),
      ];
    case 'work-at-height':
      return [
        limit('wind.scaffold-use.gust', 'gust', s.scaffoldUseGustStopMs, r, 'the firm’s limit for working from a scaffold or roof edge', HARM.scaffoldUse, 'Come down and clear loose materials from the lifts', SOURCES.scaffoldUse, true),
        balanceCaution('wind.scaffold-use.balance', s.scaffoldUseBalanceMeanCautionMs, 'the wind that affects a person’s balance at an edge', HARM.scaffoldEdge, SOURCES.scaffoldEdgeBalance, true),
      ];
    case 'scaffold-erection':
      return [
        limit('wind.scaffold-erection.mean', 'mean', s.scaffoldErectionMeanStopMs, r, 'the firm’s limit for erecting, altering or striking scaffold', HARM.scaffoldErection, 'Stop erecting and make the partly built scaffold safe as its design says', SOURCES.scaffoldErection, true),
        limit('wind.scaffold-erection.gust', 'gust', s.scaffoldErectionGustStopMs, r, 'the firm’s gust limit for erecting, altering or striking scaffold', HARM.scaffoldErection, 'Stop erecting and make the partly built scaffold safe as its design says', SOURCES.scaffoldErection, true),
      ];
    default:
      return [];
  }
}

function speedText(ms: number): string {
  return `${fmt(ms)} m/s (${fmt(msToMph(ms), 0)} mph)`;
}

/** Applies one wind limit across the window; marks stopped hours in `blocked`. */
export function checkWind(ctx: HourContext, w: WindLimit, blocked: Uint8Array, out: RuleReason[]): void {
  const f = ctx.forecast;
  const k = ctx.settings.windHeightFactor;
  const gust = w.stat === 'gust';
  const stop = w.stopMs ?? Infinity;
  const caution = w.cautionMs;
  let worst = -1;
  let worstAt = -1;
  let stopHours = 0;
  let cautionHours = 0;
  for (let i = ctx.i0; i < ctx.i1; i++) {
    const h = f[i] as ForecastHour;
    const v = (gust ? h.windGustMs : h.windMeanMs) * k;
    if (v >= stop) {
      blocked[i] = 1;
      stopHours += ctx.overlap[i] as number;
    } else if (w.cautionStrictlyAbove ? v > caution : v >= caution) {
      cautionHours += ctx.overlap[i] as number;
    } else continue;
    if (v > worst) {
      worst = v;
      worstAt = i;
    }
  }
  if (worstAt < 0) return;
  const isStop = stopHours > 0;
  const hour = f[worstAt] as ForecastHour;
  // The Beaufort scale describes the mean wind at 10 m, so the force comes from that hour's
  // forecast mean, never from a gust or a height-scaled figure; the gust is quoted beside it.
  const band = beaufortForce(hour.windMeanMs);
  const scaled = k !== 1 ? ` (forecast × ${fmt(k, 2)} for working height)` : '';
  const force = `force ${band.force} ${band.name.toLowerCase()}`;
  const mean10 = `forecast mean wind at 10 m ${speedText(hour.windMeanMs)}, ${force}`;
  const observedText = gust
    ? `Gusts of ${speedText(worst)}${scaled} (${mean10})`
    : `Mean wind of ${speedText(worst)}${scaled} (${k !== 1 ? `${mean10}` : force}; gusts ${speedText(hour.windGustMs)})`;
  const verb = isStop ? (gust ? 'reach' : 'reaches') : gust ? 'are near or over' : 'is near or over';
  const law = w.lawNamesNoNumber ? ' The law names no wind speed (WAHR 2005 reg 4; 29 CFR 1926.451(f)(12)); this is the firm’s threshold.' : '';
  const threshold = isStop ? stop : caution;
  const message = isStop
    ? `${observedText} ${verb} ${w.what} of ${speedText(stop)}: ${w.harm}. ${w.stopAdvice}.${law} ${DEFER}`
    : `${observedText} ${verb} ${w.what} of ${speedText(caution)}: ${w.harm}. Take care at edges and secure loose materials.${law} ${DEFER}`;
  out.push({
    ruleId: w.ruleId,
    verdict: isStop ? 'stop' : 'caution',
    threshold,
    unit: 'm/s',
    observed: worst,
    at: hour.time,
    hours: isStop ? stopHours : cautionHours,
    message,
    source: w.source,
    beaufort: { force: band.force, name: band.name },
  });
}
