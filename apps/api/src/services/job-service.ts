import type { DataSource, EntityManager, SelectQueryBuilder } from 'typeorm';
import {
  accessTypeLabels,
  can,
  canTransition,
  dayRangeLabel,
  jobInputSchema,
  jobStatusLabels,
  type BoardJobDto,
  type JobDto,
  type JobHistoryEntryDto,
  type JobListQuery,
  type JobStatus,
  type JobStatusChangeInput,
  type AccessType,
  type Page,
} from '@hodboard/shared';
import type { z } from 'zod';
import { AccessBooking, Assignment, AuditEvent, Client, Crew, Job, Site, User } from '../entities/index.js';
import { errors } from '../errors.js';
import type { EventBus } from '../lib/event-bus.js';
import type { AccessService, AfterCommit } from './access-service.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { loadCalendars } from './calendar-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';
import { paginate } from './paging.js';
import { formatAddress } from './site-service.js';

type JobValues = z.output<typeof jobInputSchema>;

export class JobService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
    private readonly access?: AccessService,
  ) {}

  async list(actor: Actor, query: JobListQuery): Promise<Page<JobDto>> {
    requirePermission(actor, 'jobs:read');
    const builder = this.baseQuery(this.dataSource.manager, actor);
    if (query.status) builder.andWhere('job.status = :status', { status: query.status });
    if (query.clientId) builder.andWhere('job.client_id = :clientId', { clientId: query.clientId });
    if (query.crewId) builder.andWhere('assignment.crew_id = :crewId', { crewId: query.crewId });
    if (query.workType) builder.andWhere(':workType = ANY(job.work_types)', { workType: query.workType });
    if (query.from) builder.andWhere('assignment.end_date >= :from', { from: query.from });
    if (query.to) builder.andWhere('assignment.start_date <= :to', { to: query.to });
    return paginate(builder, query, {
      sortColumns: {
        reference: 'job.reference',
        title: 'job.title',
        status: 'job.status',
        createdAt: 'job.created_at',
        earliestStart: 'job.earliest_start',
        startDate: 'assignment.start_date',
      },
      defaultSort: 'reference',
      searchColumns: ['job.reference', 'job.title', 'client.name', 'site.address_line1', 'site.town', 'site.postcode'],
      toDto: toJobDto,
    });
  }

  async get(actor: Actor, id: string): Promise<JobDto> {
    requirePermission(actor, 'jobs:read');
    const job = await this.baseQuery(this.dataSource.manager, actor).andWhere('job.id = :id', { id }).getOne();
    if (!job) throw errors.notFound('Job');
    return toJobDto(job);
  }

  async create(actor: Actor, input: JobValues): Promise<JobDto> {
    requirePermission(actor, 'jobs:manage');
    const job = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      await assertSiteOfClient(scope, input.clientId, input.siteId);
      const reference = await nextReference(manager, actor.firmId);
      const created = await manager.save(scope.create(Job, { ...input, reference, status: 'enquiry' }));
      await recordAudit(manager, actor, { entity: 'job', entityId: created.id, action: 'created', after: created });
      return created;
    });
    this.events.publish({ firmId: actor.firmId, type: 'job:created', id: job.id, version: job.version });
    return this.get(actor, job.id);
  }

  async update(actor: Actor, id: string, input: JobValues & { version?: number }): Promise<JobDto> {
    requirePermission(actor, 'jobs:manage');
    const { version, ...values } = input;
    const job = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Job, id, 'Job');
      assertVersion(existing, version, 'This job');
      await assertSiteOfClient(scope, values.clientId, values.siteId);
      const before = { ...existing };
      const changedFields = (Object.keys(values) as Array<keyof typeof values>).filter((field) => !sameValue(existing[field], values[field]));
      const saved = await manager.save(Object.assign(existing, values));
      await recordAudit(manager, actor, { entity: 'job', entityId: id, action: 'updated', before, after: saved });
      return { saved, changedFields };
    });
    const { saved } = job;
    const payload: JobEditedPayload = {
      changedFields: job.changedFields,
      job: { id, title: saved.title, priority: saved.priority, estimatedWorkingDays: saved.estimatedWorkingDays, version: saved.version },
    };
    this.events.publish({ firmId: actor.firmId, type: 'job:updated', id, version: saved.version, payload });
    return this.get(actor, id);
  }

  async changeStatus(actor: Actor, id: string, input: JobStatusChangeInput): Promise<JobDto> {
    requirePermission(actor, 'jobs:manage');
    const afterCommit: AfterCommit[] = [];
    const job = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const existing = await scope.lockForUpdate(Job, id, 'Job');
      assertVersion(existing, input.version, 'This job');
      const isPlaced = await manager.existsBy(Assignment, { jobId: id, firmId: actor.firmId });
      if ((input.status === 'scheduled' || input.status === 'on-site') && !isPlaced) {
        throw errors.illegalTransition(`Put ${existing.reference} on a crew's days on the board before marking it ${jobStatusLabels[input.status].toLowerCase()}.`);
      }
      if (input.status === 'booked' && isPlaced) {
        throw errors.illegalTransition(`Take ${existing.reference} off the board to return it to booked.`);
      }
      if (!canTransition(existing.status, input.status)) {
        throw errors.illegalTransition(
          `A job that is ${jobStatusLabels[existing.status].toLowerCase()} cannot become ${jobStatusLabels[input.status].toLowerCase()}.`,
        );
      }
      const before = { status: existing.status };
      existing.status = input.status;
      const saved = await manager.save(existing);
      await recordAudit(manager, actor, { entity: 'job', entityId: id, action: 'status-changed', before, after: { status: saved.status } });
      if (saved.status === 'cancelled' && this.access) {
        afterCommit.push(...(await this.access.onJobCancelled(manager, actor, id, await loadCalendars(manager, actor.firmId))));
      }
      return saved;
    });
    this.events.publish({ firmId: actor.firmId, type: 'job:updated', id, version: job.version });
    // The job is cancelled whatever happens to a supplier's e-mail after commit.
    for (const task of afterCommit) await task().catch(() => undefined);
    return this.get(actor, id);
  }

  async history(actor: Actor, id: string): Promise<JobHistoryEntryDto[]> {
    await this.get(actor, id);
    const scope = new FirmScope(this.dataSource.manager, actor.firmId);
    // The access booked for the job belongs to its story too: requested, agreed, up, inspected, struck.
    const bookings = await scope.query(AccessBooking, 'b').andWhere(':id = ANY(b.job_ids)', { id }).getMany();
    const kindOf = new Map(bookings.map((booking) => [booking.id, booking.accessType]));
    const rows = await scope
      .query(AuditEvent, 'event')
      .leftJoinAndMapOne('event.actor', User, 'actor', 'actor.id = event.actor_user_id')
      .andWhere(
        bookings.length
          ? "((event.entity = 'job' AND event.entity_id = :id) OR (event.entity = 'access-booking' AND event.entity_id IN (:...bookingIds)))"
          : "event.entity = 'job' AND event.entity_id = :id",
        { id, bookingIds: [...kindOf.keys()] },
      )
      .orderBy('event.at', 'DESC')
      .addOrderBy('event.id', 'DESC')
      .take(200)
      .getMany();
    return rows.map((event) => {
      const kind = kindOf.get(event.entityId);
      return {
        id: event.id,
        at: event.at.toISOString(),
        actorName: (event as AuditEvent & { actor?: User }).actor?.name ?? null,
        about: kind ? 'access' : 'job',
        action: event.action,
        summary: kind ? describeAccessChange(event, kind) : describeChange(event),
        before: event.before,
        after: event.after,
      };
    });
  }

  private baseQuery(manager: EntityManager, actor: Actor): SelectQueryBuilder<Job> {
    const builder = new FirmScope(manager, actor.firmId)
      .query(Job, 'job')
      .innerJoinAndSelect('job.client', 'client')
      .innerJoinAndSelect('job.site', 'site')
      .leftJoinAndMapOne('job.assignment', Assignment, 'assignment', 'assignment.job_id = job.id')
      .leftJoinAndMapOne('job.crew', Crew, 'crew', 'crew.id = assignment.crew_id');
    if (!can(actor.role, 'jobs:manage')) restrictToOwnCrews(builder, actor);
    return builder;
  }
}

/** Crew roles see only jobs placed on one of their own crews. */
function restrictToOwnCrews(builder: SelectQueryBuilder<Job>, actor: Actor): void {
  if (actor.crewIds.length === 0) builder.andWhere('FALSE');
  else builder.andWhere('assignment.crew_id IN (:...ownCrewIds)', { ownCrewIds: actor.crewIds });
}

async function assertSiteOfClient(scope: FirmScope, clientId: string, siteId: string): Promise<void> {
  await scope.get(Client, clientId, 'Client');
  const site = await scope.get(Site, siteId, 'Site');
  if (site.clientId !== clientId) {
    throw errors.validation([{ path: 'siteId', message: 'This site belongs to another client' }]);
  }
}

/** Per-firm job numbers, taken under the firm row's lock so two new jobs never share one. */
async function nextReference(manager: EntityManager, firmId: string): Promise<string> {
  const rows = (await manager.query(
    'UPDATE firm SET job_sequence = job_sequence + 1 WHERE id = $1 RETURNING job_sequence',
    [firmId],
  )) as [Array<{ job_sequence: number }>, number] | Array<{ job_sequence: number }>;
  const list = Array.isArray(rows[0]) ? (rows[0] as Array<{ job_sequence: number }>) : (rows as Array<{ job_sequence: number }>);
  const sequence = list[0]?.job_sequence;
  if (sequence === undefined) throw errors.notFound('Firm');
  return `J${String(sequence).padStart(4, '0')}`;
}

function statusLabel(status: unknown): string {
  return typeof status === 'string' && status in jobStatusLabels ? jobStatusLabels[status as JobStatus] : String(status ?? '');
}

function describeChange(event: AuditEvent): string {
  const after = event.after ?? {};
  const before = event.before ?? {};
  const span = (days: unknown) => (Array.isArray(days) && days.length ? dayRangeLabel(String(days[0]), String(days[days.length - 1])) : '');
  switch (event.action) {
    case 'created': return 'Job created';
    case 'updated': return 'Details edited';
    case 'status-changed': return `Status ${statusLabel(before.status)} → ${statusLabel(after.status)}`;
    case 'scheduled': return `Put on ${String(after.crew ?? 'a crew')}, ${span(after.days)}`;
    case 'rescheduled': return `Dates changed: ${span(after.days)}`;
    case 'moved-crew': return `Moved to another crew: ${span(after.days)}`;
    case 'unscheduled': return 'Taken off the board';
    default: return event.action.replaceAll('-', ' ');
  }
}

function describeAccessChange(event: AuditEvent, type: AccessType): string {
  const kind = accessTypeLabels[type];
  const after = event.after ?? {};
  const dates = (from: unknown, to: unknown) => (typeof from === 'string' && typeof to === 'string' ? `, ${dayRangeLabel(from, to)}` : '');
  switch (event.action) {
    case 'created': return `${kind} asked for`;
    case 'state-requested': return `${kind} back to asked for`;
    case 'state-confirmed': return `${kind} agreed with the supplier`;
    case 'state-erected': return `${kind} up`;
    case 'state-struck': return `${kind} struck`;
    case 'state-cancelled': return `${kind} booking cancelled`;
    case 'handover-recorded': return `${kind} handed over`;
    case 'inspected': return `${kind} inspected`;
    case 'inspection-discarded': return `${kind} inspection record removed`;
    case 'followed-job': return `${kind} dates moved with the job${dates(after.erect, after.strike)}`;
    case 'change-requested': return `New ${kind.toLowerCase()} dates asked of the supplier${dates(after.erect, after.strike)}`;
    case 'supplier-accepted': return `Supplier agreed the new ${kind.toLowerCase()} dates${dates(after.confirmedErect, after.confirmedStrike)}`;
    case 'supplier-countered': return `Supplier offered other ${kind.toLowerCase()} dates${dates(after.confirmedErect, after.confirmedStrike)}`;
    case 'job-cancelled': return `${kind} booking no longer covers a cancelled job`;
    case 'cancelled-with-job': return `${kind} booking cancelled with the job`;
    default: return `${kind}: ${event.action.replaceAll('-', ' ')}`;
  }
}

type JobRow = Job & { assignment?: Assignment | null; crew?: Crew | null };

export function toJobDto(row: Job): JobDto {
  const job = row as JobRow;
  return {
    id: job.id,
    reference: job.reference,
    clientId: job.clientId,
    clientName: job.client.name,
    siteId: job.siteId,
    siteAddress: formatAddress(job.site),
    title: job.title,
    description: job.description,
    workTypes: job.workTypes,
    estimatedWorkingDays: job.estimatedWorkingDays,
    accessNeeds: job.accessNeeds,
    earliestStart: job.earliestStart,
    targetFinish: job.targetFinish,
    priority: job.priority,
    siteNotes: job.siteNotes,
    status: job.status,
    assignment: job.assignment
      ? {
          id: job.assignment.id,
          crewId: job.assignment.crewId,
          crewName: job.crew?.name ?? '',
          startDate: job.assignment.startDate,
          endDate: job.assignment.endDate,
          workingDays: job.assignment.workingDays,
          version: job.assignment.version,
        }
      : null,
    version: job.version,
    createdAt: job.createdAt.toISOString(),
  };
}

/** What a job edit published: which of the job's fields it changed, and the new values of those a board draws as they are. */
export interface JobEditedPayload {
  changedFields: string[];
  job: Pick<BoardJobDto, 'id' | 'title' | 'priority' | 'estimatedWorkingDays' | 'version'>;
}

function sameValue(a: unknown, b: unknown): boolean {
  return Array.isArray(a) && Array.isArray(b) ? a.length === b.length && a.every((item, i) => item === b[i]) : a === b;
}
