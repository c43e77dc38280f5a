import { TZDate } from '@date-fns/tz';
import ical from 'ical-generator';
import { In, IsNull, type DataSource } from 'typeorm';
import {
  CALENDAR_FEED_FUTURE_DAYS,
  CALENDAR_FEED_PAST_DAYS,
  addDays,
  can,
  holdReasonLabels,
  roleSchema,
  type CalendarFeedDto,
} from '@hodboard/shared';
import { Assignment, CalendarFeed, Crew, Firm, Job, Membership, WeatherHold } from '../entities/index.js';
import { errors } from '../errors.js';
import type { Clock } from '../lib/clock.js';
import { todayIn } from '../lib/today.js';
import { hashToken, newOpaqueToken } from '../lib/tokens.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { crewIdsOf } from './auth-service.js';
import { FirmScope } from './firm-scope.js';
import { zoneOffsetMs } from './photo-service.js';
import { formatAddress } from './site-service.js';

export class CalendarFeedService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly clock: Clock,
    private readonly appUrl: string,
  ) {}

  async list(actor: Actor): Promise<CalendarFeedDto[]> {
    requirePermission(actor, 'jobs:read');
    const rows = await new FirmScope(this.dataSource.manager, actor.firmId).find(CalendarFeed, {
      where: { userId: actor.userId, revokedAt: IsNull() }, order: { createdAt: 'DESC' },
    });
    return rows.map((row) => toDto(row));
  }

  /** One live link per person: a new one ends the old, so a leaked link is fixed by making another. */
  async create(actor: Actor): Promise<CalendarFeedDto> {
    requirePermission(actor, 'jobs:read');
    const token = newOpaqueToken();
    const feed = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      await manager.update(CalendarFeed, { firmId: actor.firmId, userId: actor.userId, revokedAt: IsNull() }, { revokedAt: this.clock() });
      const created = await manager.save(scope.create(CalendarFeed, { userId: actor.userId, tokenHash: hashToken(token), revokedAt: null, lastFetchedAt: null }));
      await recordAudit(manager, actor, { entity: 'calendar-feed', entityId: created.id, action: 'created' });
      return created;
    });
    return toDto(feed, `${this.appUrl.replace(/\/$/, '')}/api/public/calendar/${token}.ics`);
  }

  async revoke(actor: Actor, id: string): Promise<void> {
    requirePermission(actor, 'jobs:read');
    await this.dataSource.transaction(async (manager) => {
      const feed = await new FirmScope(manager, actor.firmId).lockForUpdate(CalendarFeed, id, 'Calendar link');
      // Each person manages their own links; another person's id is simply not found.
      if (feed.userId !== actor.userId || feed.revokedAt) throw errors.notFound('Calendar link');
      feed.revokedAt = this.clock();
      await manager.save(feed);
      await recordAudit(manager, actor, { entity: 'calendar-feed', entityId: id, action: 'revoked' });
    });
  }

  /** The RFC 5545 text behind a secret link: the person's crews' job-days, in the firm's time zone. */
  async render(tokenFile: string): Promise<string> {
    const token = tokenFile.replace(/\.ics$/, '');
    const manager = this.dataSource.manager;
    const feed = await manager.findOneBy(CalendarFeed, { tokenHash: hashToken(token), revokedAt: IsNull() });
    if (!feed) throw errors.notFound('Calendar');
    const membership = await manager.findOneBy(Membership, { firmId: feed.firmId, userId: feed.userId, status: 'active' });
    if (!membership) throw errors.notFound('Calendar');
    const role = roleSchema.parse(membership.role);
    const crewIds = await crewIdsOf(manager, membership);
    const firm = await manager.findOneByOrFail(Firm, { id: feed.firmId });
    const today = todayIn(firm.timeZone, this.clock());
    const from = addDays(today, -CALENDAR_FEED_PAST_DAYS);
    const to = addDays(today, CALENDAR_FEED_FUTURE_DAYS);

    const scope = new FirmScope(manager, firm.id);
    const builder = scope.query(Assignment, 'a').andWhere('a.start_date <= :to AND a.end_date >= :from', { from, to });
    if (!can(role, 'jobs:manage')) {
      if (crewIds.length === 0) builder.andWhere('false');
      else builder.andWhere('a.crew_id IN (:...crewIds)', { crewIds });
    }
    const assignments = await builder.getMany();
    const jobIds = assignments.map((a) => a.jobId);
    const jobs = jobIds.length ? await manager.find(Job, { where: { firmId: firm.id, id: In(jobIds) }, relations: { site: true } }) : [];
    const crews = await scope.find(Crew, {});
    const holds = jobIds.length ? await scope.find(WeatherHold, { where: { jobId: In(jobIds), status: 'open' } }) : [];
    const jobById = new Map(jobs.map((job) => [job.id, job]));
    const crewName = new Map(crews.map((crew) => [crew.id, crew.name]));

    const calendar = ical({
      name: `${firm.name}: ${can(role, 'jobs:manage') ? 'all crews' : crews.filter((c) => crewIds.includes(c.id)).map((c) => c.name).join(', ') || 'no crew'}`,
      prodId: { company: 'Hodboard', product: 'crew-calendar', language: 'EN' },
      timezone: { name: firm.timeZone, generator: (zone) => vtimezone(zone, from, to) },
      ttl: 60 * 60,
    });
    for (const assignment of assignments) {
      const job = jobById.get(assignment.jobId);
      if (!job) continue;
      assignment.days.forEach((date, index) => {
        if (date < from || date > to) return;
        const hold = holds.find((h) => h.jobId === job.id && h.dates.includes(date));
        const address = formatAddress(job.site);
        const lines = [
          `${crewName.get(assignment.crewId) ?? 'Crew'}: day ${index + 1} of ${assignment.days.length}.`,
          hold ? `STOOD DOWN for ${holdReasonLabels[hold.reason].toLowerCase()}${hold.notes ? `: ${hold.notes}` : ''}. Wait for the office's new plan.` : null,
          job.site.accessNotes ? `Access: ${job.site.accessNotes}` : null,
          job.site.hazards ? `Hazards: ${job.site.hazards}` : null,
          job.siteNotes ? `Office notes: ${job.siteNotes}` : null,
        ].filter(Boolean);
        calendar.createEvent({
          id: `${assignment.id}-${date}@hodboard`,
          start: zonedTime(date, firm.dayStart, firm.timeZone),
          end: zonedTime(date, firm.dayEnd, firm.timeZone),
          timezone: firm.timeZone,
          stamp: assignment.updatedAt,
          summary: `${hold ? `Stood down (${holdReasonLabels[hold.reason].toLowerCase()}): ` : ''}${job.reference} ${job.title}`,
          location: address,
          description: lines.join('\n'),
          url: `${this.appUrl.replace(/\/$/, '')}/crew`,
          transparency: hold ? 'TRANSPARENT' : 'OPAQUE',
        } as Parameters<typeof calendar.createEvent>[0]);
      });
    }
    await manager.update(CalendarFeed, { id: feed.id }, { lastFetchedAt: this.clock() });
    return calendar.toString();
  }
}

function toDto(row: CalendarFeed, url?: string): CalendarFeedDto {
  return { id: row.id, createdAt: row.createdAt.toISOString(), lastFetchedAt: row.lastFetchedAt?.toISOString() ?? null, ...(url ? { url } : {}) };
}

/** A wall-clock time on a date in a zone, as a date that prints in that zone. */
function zonedTime(date: string, time: string, timeZone: string): TZDate {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  const [hh, mm] = time.split(':').map(Number) as [number, number];
  return new TZDate(y, m - 1, d, hh, mm, 0, timeZone);
}

/**
 * RFC 5545 §3.6.5 needs a VTIMEZONE for every TZID used. It is built from the platform's own zone data:
 * each offset change in the feed's range becomes one STANDARD or DAYLIGHT observance with its exact start.
 */
const HOUR = 3_600_000;
const DAY = 24 * HOUR;

export function vtimezone(zone: string, from: string, to: string): string {
  const start = Date.parse(`${addDays(from, -370)}T00:00:00Z`);
  const end = Date.parse(`${addDays(to, 370)}T00:00:00Z`);
  const transitions: Array<{ at: number; before: number; after: number }> = [];
  let previous = zoneOffsetMs(zone, start);
  // Day by day, then hour by hour inside a day whose offset changed: a few thousand look-ups, not tens.
  for (let day = start + DAY; day <= end; day += DAY) {
    if (zoneOffsetMs(zone, day) === previous) continue;
    for (let t = day - DAY + HOUR; t <= day; t += HOUR) {
      const offset = zoneOffsetMs(zone, t);
      if (offset !== previous) {
        transitions.push({ at: t, before: previous, after: offset });
        previous = offset;
        break;
      }
    }
  }
  const lines = ['BEGIN:VTIMEZONE', `TZID:${zone}`];
  const standardOffset = Math.min(...[zoneOffsetMs(zone, start), ...transitions.map((t) => t.after)]);
  if (transitions.length === 0) {
    lines.push('BEGIN:STANDARD', 'DTSTART:19700101T000000', `TZOFFSETFROM:${formatOffset(previous)}`, `TZOFFSETTO:${formatOffset(previous)}`, 'END:STANDARD');
  }
  for (const change of transitions) {
    const kind = change.after > standardOffset ? 'DAYLIGHT' : 'STANDARD';
    // DTSTART of an observance is local time in the offset in force before the change.
    const local = new Date(change.at + change.before).toISOString().replace(/[-:]/g, '').slice(0, 15);
    lines.push(`BEGIN:${kind}`, `DTSTART:${local}`, `TZOFFSETFROM:${formatOffset(change.before)}`, `TZOFFSETTO:${formatOffset(change.after)}`, `END:${kind}`);
  }
  lines.push('END:VTIMEZONE');
  return lines.join('\r\n');
}

function formatOffset(ms: number): string {
  const minutes = Math.round(ms / 60_000);
  const sign = minutes < 0 ? '-' : '+';
  const abs = Math.abs(minutes);
  return `${sign}${String(Math.floor(abs / 60)).padStart(2, '0')}${String(abs % 60).padStart(2, '0')}`;
}
