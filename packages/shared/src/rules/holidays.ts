import Holidays from 'date-holidays';
import type { IsoDate } from './dates.js';

/** A region as `date-holidays` names it: ISO country, optional state/region code (GB: ENG, WLS, SCT, NIR). */
export interface HolidayRegion {
  country: string;
  state?: string;
  region?: string;
}

export interface PublicHoliday {
  date: IsoDate;
  name: string;
  substitute: boolean;
}

export const englandAndWales: HolidayRegion = { country: 'GB', state: 'ENG' };

const instances = new Map<string, Holidays>();
const byYear = new Map<string, readonly PublicHoliday[]>();

export function regionKey(region: HolidayRegion): string {
  return `${region.country}|${region.state ?? ''}|${region.region ?? ''}`;
}

function instanceFor(region: HolidayRegion): Holidays {
  const key = regionKey(region);
  let hd = instances.get(key);
  if (hd === undefined) {
    // Constructing an instance costs ~5 ms here, so one per region for the process.
    hd = new Holidays({ languages: ['en'], types: ['public', 'bank'] });
    const known = (names: object | undefined, code: string): boolean => names !== undefined && Object.hasOwn(names, code);
    if (!known(hd.getCountries('en'), region.country)) throw new RangeError(`unknown holiday country ${JSON.stringify(region.country)}`);
    if (region.state !== undefined && !known(hd.getStates(region.country, 'en'), region.state)) {
      throw new RangeError(`unknown holiday state ${JSON.stringify(region.state)} in ${region.country}`);
    }
    if (region.region !== undefined && (region.state === undefined || !known(hd.getRegions(region.country, region.state, 'en'), region.region))) {
      throw new RangeError(`unknown holiday region ${JSON.stringify(region.region)} in ${region.country}/${region.state ?? '?'}`);
    }
    if (region.region !== undefined && region.state !== undefined) hd.init(region.country, region.state, region.region);
    else if (region.state !== undefined) hd.init(region.country, region.state);
    else hd.init(region.country);
    instances.set(key, hd);
  }
  return hd;
}

/**
 * Public and bank holidays of a region for one year, as the days off they are.
 * `date-holidays` also returns observances (Mother's Day, Easter Sunday) and, where a
 * holiday moves off a weekend, the original weekend date as well as the substitute;
 * the official list (gov.uk/bank-holidays) has only the substitute, so both are dropped.
 */
export function publicHolidays(year: number, region: HolidayRegion = englandAndWales): readonly PublicHoliday[] {
  if (!Number.isInteger(year)) throw new RangeError(`year must be an integer, got ${year}`);
  const key = `${regionKey(region)}|${year}`;
  const cached = byYear.get(key);
  if (cached !== undefined) return cached;
  const raw = instanceFor(region).getHolidays(year, 'en');
  const kept = raw.filter((h) => h.type === 'public' || h.type === 'bank');
  const replaced = new Set<string>();
  for (const h of kept) {
    const rule = (h as { rule?: string }).rule;
    if (h.substitute === true && typeof rule === 'string' && rule.startsWith('substitutes ')) {
      const original = rule.slice('substitutes '.length).split(' ')[0];
      if (original !== undefined) replaced.add(original);
    }
  }
  const seen = new Set<string>();
  const out: PublicHoliday[] = [];
  for (const h of kept) {
    const rule = (h as { rule?: string }).rule;
    if (h.substitute !== true && typeof rule === 'string' && replaced.has(rule)) continue;
    const date = h.date.slice(0, 10);
    if (seen.has(date)) continue;
    seen.add(date);
    out.push({ date, name: h.name, substitute: h.substitute === true });
  }
  out.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0));
  const frozen = Object.freeze(out);
  byYear.set(key, frozen);
  return frozen;
}
