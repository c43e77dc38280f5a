import {
  coldestAhead, fmt, HOUR, lookAheadCover, reportLookAheadCover, tempReason, windowExtreme, type AssessmentNote, type HourContext, type RuleReason,
} from './forecast.js';
import { SOURCES } from './sources.js';
import { cToF } from './units.js';

const DEFER = 'Follow the concrete supplier’s and the specifier’s guidance and local regulations, and check with the site’s competent person.';

export function checkConcreteFreezing(ctx: HourContext, blocked: Uint8Array, out: RuleReason[]): void {
  const s = ctx.settings;
  const cold = windowExtreme(ctx, (t) => t <= s.concreteFreezingStopC, { blocked });
  if (!cold) return;
  out.push(tempReason(ctx, cold, {
    ruleId: 'cold.concrete.freezing',
    verdict: 'stop',
    threshold: s.concreteFreezingStopC,
    message: `Air down to ${fmt(cold.tempC)} °C: do not pour onto frozen ground or into freezing air without a heated enclosure. ${DEFER}`,
    source: SOURCES.concreteFreezing,
  }));
}

export function checkUkConcreteDischarge(ctx: HourContext, out: RuleReason[]): void {
  const s = ctx.settings;
  const cold = windowExtreme(ctx, (t) => t < s.concreteMinDischargeC);
  if (!cold) return;
  out.push(tempReason(ctx, cold, {
    ruleId: 'cold.concrete.uk-discharge',
    verdict: 'caution',
    threshold: s.concreteMinDischargeC,
    message: `Air down to ${fmt(cold.tempC)} °C, below ${fmt(s.concreteMinDischargeC)} °C: the concrete must be at least ${fmt(s.concreteMinDischargeC, 0)} °C at discharge and kept there until it reaches 5 N/mm² (about 3 days for C16/20 at 5 °C). Ask for a heated or accelerated mix and insulate. ${DEFER}`,
    source: SOURCES.bs8500,
  }));
}

/** ACI 306R: cold weather if the air is at or expected below 40 °F at any time in the protection period. */
export function checkConcreteColdWeather(ctx: HourContext, out: RuleReason[], notes: AssessmentNote[]): void {
  const s = ctx.settings;
  const until = ctx.windowStart + s.concreteProtectionHours * HOUR;
  const cold = coldestAhead(ctx, until, s.concreteColdAtOrBelowC);
  if (cold) {
    out.push(tempReason(ctx, cold, {
      ruleId: 'cold.concrete.aci306',
      verdict: 'caution',
      threshold: s.concreteColdAtOrBelowC,
      message: `Air down to ${fmt(cToF(cold.tempC), 0)} °F (${fmt(cold.tempC)} °C) within ${s.concreteProtectionHours} h of placing: cold-weather concreting. Protect from freezing until about 500 psi (3.5 MPa), normally the first 24 h, with blankets or heated enclosures. ${DEFER}`,
      source: SOURCES.aci306,
    }));
  }
  const cover = lookAheadCover(ctx, until);
  if (cover) {
    reportLookAheadCover(ctx, cover, {
      ruleId: 'forecast.reach.concrete-protection',
      period: 'concrete protection period from the start of work',
      rule: 'concrete protection rule (ACI 306R)',
      inDays: false,
      risk: 'Cold weather then (air at or below 40 °F / 4.4 °C) is not ruled out: check the forecast again before then and keep blankets or an enclosure to hand.',
      defer: DEFER,
    }, out, notes);
  }
}
