import type { EntityManager } from 'typeorm';
import { queriesOf } from '../lib/queries-of.js';
import {
  addDays,
  isWorkingDay,
  isoWeekday,
  publicHolidays,
  ruleDates,
  type HolidayRegion,
  type WorkCalendar,
} from '@hodboard/shared';
import { CrewMember, Firm, TimeOff, User, Membership } from '../entities/index.js';
import { FirmScope } from './firm-scope.js';

const REGIONS: Record<Firm['holidayRegion'], HolidayRegion> = {
  // England and Wales share their bank holidays.
  'GB-ENG': { country: 'GB', state: 'ENG' },
  'GB-SCT': { country: 'GB', state: 'SCT' },
  'GB-NIR': { country: 'GB', state: 'NIR' },
};

export interface MemberAbsenceRule {
  memberId: string;
  name: string;
  label: string;
  rule: string;
}

/** A firm's working-day calendars, loaded once per request: the firm's own and one per crew. */
export class FirmCalendars {
  private readonly crewCache = new Map<string, WorkCalendar>();

  constructor(
    readonly firm: Firm,
    readonly firmCalendar: WorkCalendar,
    private readonly firmEntries: TimeOff[],
    private readonly crewEntries: TimeOff[],
    readonly memberRules: MemberAbsenceRule[],
    readonly crewMembers: Map<string, string[]>,
  ) {}

  get timeZone(): string {
    return this.firm.timeZone;
  }

  forCrew(crewId: string): WorkCalendar {
    let calendar = this.crewCache.get(crewId);
    if (!calendar) {
      const leave = this.crewEntries.filter((entry) => entry.crewId === crewId).map((entry) => entry.rule);
      calendar = { ...this.firmCalendar, leave: [...(this.firmCalendar.leave ?? []), ...leave] };
      this.crewCache.set(crewId, calendar);
    }
    return calendar;
  }

  /** Why the firm does not work a day, in words; null on a working day. */
  offReason(date: string): string | null {
    if (isWorkingDay(date, this.firmCalendar)) return null;
    const region = this.firmCalendar.region;
    const holiday = region ? publicHolidays(Number(date.slice(0, 4)), region).find((h) => h.date === date) : undefined;
    if (holiday) return holiday.name;
    const closure = this.firmEntries.find((entry) => ruleDates(entry.rule, date, date, this.timeZone).length > 0);
    if (closure) return closure.label;
    if (this.firm.closures.includes(date)) return 'Closed';
    return isoWeekday(date) >= 6 ? 'Weekend' : 'Not a working day';
  }

  /** Days in range the whole crew is off while the firm works. */
  crewLeave(crewId: string, from: string, to: string): Array<{ date: string; label: string }> {
    const days: Array<{ date: string; label: string }> = [];
    for (const entry of this.crewEntries.filter((e) => e.crewId === crewId)) {
      for (const date of ruleDates(entry.rule, from, to, this.timeZone)) {
        if (isWorkingDay(date, this.firmCalendar)) days.push({ date, label: entry.label });
      }
    }
    return days.sort((a, b) => a.date.localeCompare(b.date));
  }

  /** Days in range one of the crew's people is off while the crew itself works. */
  memberLeave(crewId: string, from: string, to: string): Array<{ date: string; memberId: string; name: string; label: string }> {
    const members = new Set(this.crewMembers.get(crewId) ?? []);
    const calendar = this.forCrew(crewId);
    const days: Array<{ date: string; memberId: string; name: string; label: string }> = [];
    for (const entry of this.memberRules.filter((rule) => members.has(rule.memberId))) {
      for (const date of ruleDates(entry.rule, from, to, this.timeZone)) {
        if (isWorkingDay(date, calendar)) days.push({ date, memberId: entry.memberId, name: entry.name, label: entry.label });
      }
    }
    return days.sort((a, b) => a.date.localeCompare(b.date));
  }
}

export async function loadCalendars(manager: EntityManager, firmId: string): Promise<FirmCalendars> {
  const scope = new FirmScope(manager, firmId);
  const [firm, entries, crewMembers, people] = await queriesOf(manager, [
    () => manager.findOneByOrFail(Firm, { id: firmId }),
    () => scope.find(TimeOff, {}),
    () => scope.find(CrewMember, {}),
    () =>
      scope
        .query(Membership, 'm')
        .innerJoin(User, 'u', 'u.id = m.user_id')
        .select(['m.id AS id', 'u.name AS name'])
        .getRawMany<{ id: string; name: string }>(),
  ] as const);
  const names = new Map(people.map((p) => [p.id, p.name]));
  const firmEntries = entries.filter((e) => e.scope === 'firm');
  const firmCalendar: WorkCalendar = {
    weekdays: firm.workingWeekdays,
    region: REGIONS[firm.holidayRegion],
    closures: firm.closures,
    leave: firmEntries.map((e) => e.rule),
    timeZone: firm.timeZone,
  };
  const membersByCrew = new Map<string, string[]>();
  for (const row of crewMembers) membersByCrew.set(row.crewId, [...(membersByCrew.get(row.crewId) ?? []), row.memberId]);
  return new FirmCalendars(
    firm,
    firmCalendar,
    firmEntries,
    entries.filter((e) => e.scope === 'crew'),
    entries
      .filter((e) => e.scope === 'member' && e.memberId)
      .map((e) => ({ memberId: e.memberId!, name: names.get(e.memberId!) ?? 'A crew member', label: e.label, rule: e.rule })),
    membersByCrew,
  );
}

export function datesBetween(from: string, to: string): string[] {
  const dates: string[] = [];
  for (let date = from; date <= to; date = addDays(date, 1)) dates.push(date);
  return dates;
}
