import { In, type DataSource, type EntityManager } from 'typeorm';
import {
  addDays,
  can,
  isWorkingDay,
  type AccessBookingDto,
  type BoardDto,
  type CrewDayDto,
  type CrewDayHoldDto,
  type CrewDaysDto,
  type CrewMaterialDto,
  type CrewWorkingDayDto,
  type DayWeatherDto,
} from '@hodboard/shared';
import { Assignment, Firm, Job, Quote, QuoteVersion, User, WeatherHold } from '../entities/index.js';
import { errors } from '../errors.js';
import type { Clock } from '../lib/clock.js';
import { todayIn } from '../lib/today.js';
import type { AccessService } from './access-service.js';
import { requirePermission, type Actor } from './actor.js';
import { loadCalendars } from './calendar-service.js';
import { FirmScope } from './firm-scope.js';
import type { PhotoService } from './photo-service.js';
import type { ScheduleService } from './schedule-service.js';
import type { SiteNoteService } from './site-note-service.js';
import { formatAddress } from './site-service.js';

/** How many working days after today the week-ahead strip shows. */
const AHEAD_WORKING_DAYS = 5;

/**
 * The one check every crew-phone read and write makes: the office sees every job of the firm; a crew lead
 * or operative only jobs placed on one of their crews. Anything else is "not found", never "forbidden",
 * so a guessed id tells nothing.
 */
export async function visibleJob(manager: EntityManager, actor: Actor, jobId: string): Promise<Job> {
  const job = await new FirmScope(manager, actor.firmId).get(Job, jobId, 'Job');
  if (can(actor.role, 'jobs:manage')) return job;
  const isOwnCrew = actor.crewIds.length > 0
    && await manager.existsBy(Assignment, { firmId: actor.firmId, jobId, crewId: In(actor.crewIds) });
  if (!isOwnCrew) throw errors.notFound('Job');
  return job;
}

/** The crews a job is placed on, so live updates reach those crews' phones. */
export async function crewsOfJob(manager: EntityManager, firmId: string, jobId: string): Promise<string[]> {
  const rows = await manager.find(Assignment, { where: { firmId, jobId }, select: { id: true, crewId: true } });
  return [...new Set(rows.map((row) => row.crewId))];
}

export class CrewDayService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly clock: Clock,
    private readonly schedule: ScheduleService,
    private readonly access: AccessService,
    private readonly notes: SiteNoteService,
    private readonly photos: PhotoService,
  ) {}

  async days(actor: Actor, query: { from?: string; days: number }): Promise<CrewDaysDto> {
    requirePermission(actor, 'jobs:read');
    const manager = this.dataSource.manager;
    const [firm, calendars] = await Promise.all([manager.findOneByOrFail(Firm, { id: actor.firmId }), loadCalendars(manager, actor.firmId)]);
    const today = todayIn(firm.timeZone, this.clock());
    const from = query.from ?? today;
    const ahead: string[] = [];
    for (let date = addDays(today, 1); ahead.length < AHEAD_WORKING_DAYS; date = addDays(date, 1)) {
      if (isWorkingDay(date, calendars.firmCalendar)) ahead.push(date);
    }
    const lastDay = [addDays(from, query.days - 1), ahead[ahead.length - 1]!].sort()[1]!;
    const board = await this.schedule.board(actor, { from, to: lastDay });
    const jobIds = [...new Set(board.assignments.map((a) => a.jobId))];
    const [jobs, holds, access, materials, notes, photos] = await Promise.all([
      jobIds.length ? manager.find(Job, { where: { firmId: actor.firmId, id: In(jobIds) }, relations: { site: true, client: true } }) : [],
      this.holdsFor(manager, actor.firmId, jobIds),
      jobIds.length ? this.access.list(actor, { jobIds }) : Promise.resolve([] as AccessBookingDto[]),
      this.materialsFor(manager, actor.firmId, jobIds),
      this.notes.listForJobs(actor, jobIds),
      this.photos.listForJobs(actor, jobIds),
    ]);
    const jobById = new Map(jobs.map((job) => [job.id, job]));
    const crewName = new Map(board.crews.map((crew) => [crew.id, crew.name]));
    const showClient = actor.role === 'crew-lead' || can(actor.role, 'clients:read');
    const weather = weatherIndex(board);

    const days: CrewDayDto[] = [];
    for (const assignment of board.assignments) {
      const job = jobById.get(assignment.jobId);
      if (!job) continue;
      assignment.days.forEach((date, index) => {
        if (date < from || date > lastDay) return;
        days.push({
          date,
          crewId: assignment.crewId,
          crewName: crewName.get(assignment.crewId) ?? '',
          assignmentId: assignment.id,
          assignmentVersion: assignment.version,
          dayNumber: index + 1,
          dayCount: assignment.days.length,
          startTime: firm.dayStart,
          endTime: firm.dayEnd,
          job: {
            id: job.id, reference: job.reference, title: job.title, description: job.description, status: job.status,
            workTypes: job.workTypes, accessNeeds: job.accessNeeds, officeNotes: job.siteNotes,
          },
          site: {
            address: formatAddress(job.site),
            postcode: job.site.postcode,
            ...mapLinks(formatAddress(job.site), job.site.lat, job.site.lon),
            accessNotes: job.site.accessNotes,
            hazards: job.site.hazards,
          },
          client: showClient ? { firstName: job.client.contactName ? firstNameOf(job.client.contactName) : job.client.name, phone: job.client.phone } : null,
          weather: weather.get(`${assignment.id}|${date}`) ?? null,
          access: access.filter((booking) => booking.jobIds.includes(job.id)).map((booking) => ({
            bookingId: booking.id, accessType: booking.accessType, state: booking.state, supplierName: booking.supplierName, inspection: booking.inspection,
          })),
          holds: (holds.get(job.id) ?? []).filter((hold) => hold.dates.includes(date)).map((hold) => hold.dto),
          materials: materials.get(job.id) ?? null,
        });
      });
    }
    days.sort((a, b) => a.date.localeCompare(b.date) || a.job.reference.localeCompare(b.job.reference));

    const aheadDays: CrewWorkingDayDto[] = ahead.map((date) => ({
      date,
      isWorkingDay: true,
      offReason: null,
      jobs: days.filter((day) => day.date === date).map((day) => ({
        jobId: day.job.id, reference: day.job.reference, title: day.job.title, isStoodDown: day.holds.some((hold) => hold.status === 'open'),
      })),
    }));

    return {
      today,
      nextDay: ahead[0]!,
      timeZone: firm.timeZone,
      days,
      ahead: aheadDays,
      notes,
      photos,
      isLead: actor.role === 'crew-lead',
      lastEventId: board.lastEventId,
      generatedAt: this.clock().toISOString(),
    };
  }

  private async holdsFor(manager: EntityManager, firmId: string, jobIds: string[]): Promise<Map<string, Array<{ dates: string[]; dto: CrewDayHoldDto }>>> {
    const map = new Map<string, Array<{ dates: string[]; dto: CrewDayHoldDto }>>();
    if (jobIds.length === 0) return map;
    const rows = await manager.find(WeatherHold, { where: { firmId, jobId: In(jobIds) }, order: { raisedAt: 'DESC' } });
    const raisers = rows.map((row) => row.raisedBy).filter((id): id is string => Boolean(id));
    const users = raisers.length ? await manager.find(User, { where: { id: In([...new Set(raisers)]) }, select: { id: true, name: true } }) : [];
    const names = new Map(users.map((user) => [user.id, user.name]));
    for (const row of rows) {
      const entry = {
        dates: row.dates,
        dto: {
          id: row.id, reason: row.reason, notes: row.notes, status: row.status,
          raisedBy: row.raisedBy ? names.get(row.raisedBy) ?? null : null, raisedAt: row.raisedAt.toISOString(),
        },
      };
      map.set(row.jobId, [...(map.get(row.jobId) ?? []), entry]);
    }
    return map;
  }

  /** The accepted quote's materials: what the office priced is what should be on site. */
  private async materialsFor(manager: EntityManager, firmId: string, jobIds: string[]): Promise<Map<string, CrewMaterialDto[]>> {
    const map = new Map<string, CrewMaterialDto[]>();
    if (jobIds.length === 0) return map;
    const quotes = await manager.find(Quote, { where: { firmId, jobId: In(jobIds), status: 'accepted' } });
    const versionIds = quotes.map((quote) => quote.currentVersionId).filter((id): id is string => Boolean(id));
    if (versionIds.length === 0) return map;
    const versions = await manager.find(QuoteVersion, { where: { firmId, id: In(versionIds) } });
    const byId = new Map(versions.map((version) => [version.id, version]));
    for (const quote of quotes) {
      const version = quote.currentVersionId ? byId.get(quote.currentVersionId) : undefined;
      if (!version) continue;
      map.set(quote.jobId, version.content.materials.map((line) => ({ description: line.description, quantity: line.quantity, unit: line.unit })));
    }
    return map;
  }
}

function weatherIndex(board: BoardDto): Map<string, DayWeatherDto> {
  // Older boards (before forecasts) carry no weather list.
  const list: DayWeatherDto[] = (board as Partial<BoardDto>).weather ?? [];
  return new Map(list.map((day) => [`${day.assignmentId}|${day.date}`, day]));
}

/** geo: (RFC 5870) opens the phone's own maps app; the web link is a fallback. Neither is fetched by Hodboard. */
export function mapLinks(address: string, lat: number | null, lon: number | null): { mapsUrl: string; mapsWebUrl: string } {
  const query = encodeURIComponent(address);
  if (lat !== null && lon !== null) {
    return {
      mapsUrl: `geo:${lat},${lon}?q=${lat},${lon}(${query})`,
      mapsWebUrl: `https://www.openstreetmap.org/?mlat=${lat}&mlon=${lon}#map=18/${lat}/${lon}`,
    };
  }
  return { mapsUrl: `geo:0,0?q=${query}`, mapsWebUrl: `https://www.openstreetmap.org/search?query=${query}` };
}

function firstNameOf(name: string): string {
  const words = name.trim().split(/\s+/);
  // "Graham and Lise Pennock" is a couple: keep "Graham and Lise".
  if (words.length >= 3 && (words[1] === 'and' || words[1] === '&')) return words.slice(0, 3).join(' ');
  return words[0] ?? name;
}
