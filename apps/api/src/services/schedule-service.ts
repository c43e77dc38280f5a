import { In, type DataSource, type EntityManager } from 'typeorm';
import { queriesOf } from '../lib/queries-of.js';
import {
  can,
  compareTrayJobs,
  conflictWithin,
  doubleBookedDays,
  SCHEDULE_CHANGES_PAGE,
  scheduleConflicts,
  spanFor,
  TRAY_STATUSES,
  type AssignmentDto,
  type BoardAssignmentDto,
  type BoardDto,
  type BoardHoldDayDto,
  type BoardJobDto,
  type BoardQuery,
  type DayWeatherDto,
  type ConflictDto,
  type PlacedJob,
  type ScheduleChangeDto,
  type ScheduleEventDto,
} from '@hodboard/shared';
import type { z } from 'zod';
import type { assignmentCreateSchema, assignmentUpdateSchema } from '@hodboard/shared';
import { Assignment, Crew, Job, ScheduleEvent, User } from '../entities/index.js';
import { errors } from '../errors.js';
import type { Logger } from 'pino';
import type { EventBus } from '../lib/event-bus.js';
import type { AccessService, AfterCommit } from './access-service.js';
import type { WeatherService } from './weather/weather-service.js';
import { requirePermission, type Actor } from './actor.js';
import type { BoardView } from './board-patch.js';
import { recordAudit, recordAudits } from './audit-service.js';
import { datesBetween, loadCalendars, type FirmCalendars } from './calendar-service.js';
import { FirmScope } from './firm-scope.js';
import { formatAddress } from './site-service.js';

type CreateValues = z.output<typeof assignmentCreateSchema>;
type UpdateValues = z.output<typeof assignmentUpdateSchema>;

export class ScheduleService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
    private readonly access?: AccessService,
    private readonly logger?: Pick<Logger, 'error'>,
    private readonly weather?: WeatherService,
  ) {}

  async board(actor: Actor, query: BoardQuery): Promise<BoardDto> {
    requirePermission(actor, 'jobs:read');
    const manager = this.dataSource.manager;
    const scope = new FirmScope(manager, actor.firmId);
    const view = this.boardView(actor, query);
    const isOffice = view.hasTray;
    const crewFilter = view.crewIds;
    // The board is the hottest read: plain queries (no entity hydration), run side by side on the pool.
    const [crews, calendars, placed, trayRows, lastEvent, holdDays] = await Promise.all([
      scope.find(Crew, { where: crewFilter ? { id: In(crewFilter) } : {}, order: { name: 'ASC' } }),
      loadCalendars(manager, actor.firmId),
      crewFilter?.length === 0 ? [] : placedRows(manager, actor.firmId, crewFilter, query.from, query.to),
      isOffice ? trayRowsOf(manager, actor.firmId) : [],
      scope.query(ScheduleEvent, 'e').select('MAX(e.id)', 'max').getRawOne<{ max: string | null }>(),
      crewFilter?.length === 0 ? [] : holdDayRows(manager, actor.firmId, crewFilter, query.from, query.to),
    ]);
    // One object per card serves the rules and the response alike.
    const assignments = placed.map(toBoardAssignment);
    const jobs = new Map<string, BoardJobDto>();
    const siteOfJob = new Map<string, string>();
    for (const row of placed) {
      jobs.set(row.id, toBoardJobFromRow(row));
      siteOfJob.set(row.id, row.site_id);
    }
    const trayJobs = trayRows.map(toBoardJobFromRow);
    for (const job of trayJobs) jobs.set(job.id, job);
    const jobList = [...jobs.values()];
    const [assessed, accessBands] = await Promise.all([
      this.assess(manager, actor.firmId, assignments, jobList, calendars, siteOfJob),
      this.access ? this.access.bandsFor(manager, actor.firmId, [...jobs.keys()], calendars) : [],
    ]);

    return {
      from: query.from,
      to: query.to,
      days: datesBetween(query.from, query.to).map((date) => {
        const offReason = calendars.offReason(date);
        return { date, isWorkingDay: offReason === null, offReason };
      }),
      crews: crews.map((crew) => ({
        id: crew.id,
        name: crew.name,
        colour: crew.colour,
        leave: calendars.crewLeave(crew.id, query.from, query.to),
        memberLeave: calendars.memberLeave(crew.id, query.from, query.to),
      })),
      assignments,
      jobs: Object.fromEntries(jobs),
      trayJobIds: trayJobs.sort(compareTrayJobs).map((job) => job.id),
      conflicts: assessed.conflicts.filter((conflict) => conflictWithin(view, conflict)),
      weather: assessed.weather,
      accessBands,
      holdDays,
      lastEventId: Number(lastEvent?.max ?? 0),
    };
  }

  /** Which board this reader gets for this query: the office sees every crew and the tray, crew roles only their own crews. */
  boardView(actor: Actor, query: BoardQuery): BoardView {
    const isOffice = can(actor.role, 'jobs:manage');
    // Crew roles see only their own crews, whatever crew id they ask for.
    const ownCrews = isOffice ? null : [...actor.crewIds].sort();
    const crewIds = query.crewId ? (ownCrews && !ownCrews.includes(query.crewId) ? [] : [query.crewId]) : ownCrews;
    return { from: query.from, to: query.to, crewIds, hasTray: isOffice };
  }

  async place(actor: Actor, input: CreateValues): Promise<ScheduleChangeDto> {
    requirePermission(actor, 'jobs:manage');
    return this.change(actor, 'assignment:created', async (manager, scope, calendars) => {
      const crew = await scope.lockForUpdate(Crew, input.crewId, 'Crew');
      const job = await scope.lockForUpdate(Job, input.jobId, 'Job');
      if (await manager.existsBy(Assignment, { jobId: job.id })) {
        throw errors.conflict(`${job.reference} is already on the board; move it instead.`);
      }
      if (!TRAY_STATUSES.has(job.status)) {
        throw errors.illegalTransition(`${job.reference} is ${job.status.replace('-', ' ')}; only booked jobs can be scheduled.`);
      }
      const workingDays = input.workingDays ?? job.estimatedWorkingDays;
      const days = spanFor(input.startDate, workingDays, calendars.forCrew(crew.id));
      await this.assertNoDoubleBooking(scope, { assignmentId: '', crewId: crew.id, days }, input.confirmDoubleBooking);
      const assignment = await manager.save(scope.create(Assignment, {
        jobId: job.id, crewId: crew.id, startDate: days[0]!, workingDays, days, endDate: days[days.length - 1]!, updatedBy: actor.userId,
      }));
      const beforeStatus = job.status;
      job.status = 'scheduled';
      await manager.save(job);
      await recordAudit(manager, actor, {
        entity: 'job', entityId: job.id, action: 'scheduled',
        before: { status: beforeStatus }, after: { status: job.status, crew: crew.name, days },
      });
      return { assignment, job, crewIds: [crew.id], touchedDays: days };
    });
  }

  async move(actor: Actor, assignmentId: string, input: UpdateValues): Promise<ScheduleChangeDto> {
    requirePermission(actor, 'jobs:manage');
    return this.change(actor, 'assignment:moved', async (manager, scope, calendars) => {
      const assignment = await this.lockCurrent(manager, scope, assignmentId, input.version);
      const crewIds = [...new Set([assignment.crewId, input.crewId])].sort();
      for (const crewId of crewIds) await scope.lockForUpdate(Crew, crewId, 'Crew');
      const job = await scope.lockForUpdate(Job, assignment.jobId, 'Job');
      const days = spanFor(input.startDate, input.workingDays, calendars.forCrew(input.crewId));
      await this.assertNoDoubleBooking(scope, { assignmentId, crewId: input.crewId, days }, input.confirmDoubleBooking);
      const before = { crewId: assignment.crewId, days: assignment.days };
      Object.assign(assignment, {
        crewId: input.crewId, startDate: days[0]!, workingDays: input.workingDays, days, endDate: days[days.length - 1]!, updatedBy: actor.userId,
      });
      const saved = await manager.save(assignment);
      await recordAudit(manager, actor, {
        entity: 'job', entityId: job.id, action: before.crewId !== input.crewId ? 'moved-crew' : 'rescheduled',
        before, after: { crewId: saved.crewId, days },
      });
      return { assignment: saved, job, crewIds, touchedDays: [...before.days, ...days] };
    });
  }

  /**
   * Records how far a job got: the job's days up to `date` are done and `remainingWorkingDays` are left, so the
   * span ends sooner or runs on. A replay of the same report (offline queue) returns the state it produced.
   */
  async progress(actor: Actor, assignmentId: string, input: { date: string; remainingWorkingDays: number; version: number }): Promise<ScheduleChangeDto> {
    requirePermission(actor, 'inspections:record');
    return this.change(actor, 'assignment:moved', async (manager, scope, calendars) => {
      const assignment = await scope.lockForUpdate(Assignment, assignmentId, 'Scheduled job');
      if (!can(actor.role, 'jobs:manage') && !actor.crewIds.includes(assignment.crewId)) throw errors.notFound('Scheduled job');
      const done = assignment.days.filter((day) => day <= input.date).length;
      if (done === 0) throw errors.validation([{ path: 'date', message: 'That day is before the job starts' }]);
      const workingDays = Math.max(1, done + input.remainingWorkingDays);
      if (assignment.version !== input.version) {
        const isReplay = assignment.updatedBy === actor.userId && assignment.workingDays === workingDays;
        if (!isReplay) await this.lockCurrent(manager, scope, assignmentId, input.version);
      }
      const job = await scope.lockForUpdate(Job, assignment.jobId, 'Job');
      const days = spanFor(assignment.startDate, workingDays, calendars.forCrew(assignment.crewId));
      const before = { days: assignment.days };
      if (workingDays !== assignment.workingDays) {
        Object.assign(assignment, { workingDays, days, endDate: days[days.length - 1]!, updatedBy: actor.userId });
        await manager.save(assignment);
        await recordAudit(manager, actor, {
          entity: 'job', entityId: job.id, action: input.remainingWorkingDays === 0 ? 'work-finished' : 'progress-reported',
          before, after: { days, remainingWorkingDays: input.remainingWorkingDays, reportedFor: input.date },
        });
      }
      if (job.status === 'scheduled') {
        job.status = 'on-site';
        await manager.save(job);
      }
      return { assignment, job, crewIds: [assignment.crewId], touchedDays: [...before.days, ...days] };
    });
  }

  async remove(actor: Actor, assignmentId: string, version: number): Promise<ScheduleChangeDto> {
    requirePermission(actor, 'jobs:manage');
    return this.change(actor, 'assignment:removed', async (manager, scope) => {
      const assignment = await this.lockCurrent(manager, scope, assignmentId, version);
      const job = await scope.lockForUpdate(Job, assignment.jobId, 'Job');
      await manager.delete(Assignment, { id: assignment.id, firmId: actor.firmId });
      const beforeStatus = job.status;
      if (job.status === 'scheduled' || job.status === 'stood-down') job.status = 'booked';
      await manager.save(job);
      await recordAudit(manager, actor, {
        entity: 'job', entityId: job.id, action: 'unscheduled',
        before: { status: beforeStatus, crewId: assignment.crewId, days: assignment.days }, after: { status: job.status },
      });
      return { assignment: null, removedAssignmentId: assignment.id, job, crewIds: [assignment.crewId], touchedDays: assignment.days };
    });
  }

  /**
   * Applies several moves in one transaction (a re-plan). `prepare` runs first in that transaction and plans them, so
   * what is applied is what was planned from the rows it read; each move is still checked against the version it
   * was planned from, and `prepare`'s `extra` step runs after the moves are saved. One schedule event per moved job,
   * all published after commit.
   */
  async applyMoves(
    actor: Actor,
    prepare: (manager: EntityManager) => Promise<{ moves: PlannedAssignmentMove[]; extra: (manager: EntityManager) => Promise<AfterCommit[]> }>,
    action = 'replanned',
  ): Promise<ScheduleChangeDto[]> {
    const published: Array<{ change: ScheduleChangeDto; eventId: number }> = [];
    const afterCommit: AfterCommit[] = [];
    await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const { moves, extra } = await prepare(manager);
      const calendars = await loadCalendars(manager, actor.firmId);
      const crewIds = [...new Set(moves.map((m) => m.crewId))].sort();
      for (const crewId of crewIds) await scope.lockForUpdate(Crew, crewId, 'Crew');
      const current = await scope.lockAllForUpdate(Assignment, moves.map((m) => m.assignmentId), 'Scheduled job');
      for (const planned of moves) await this.assertCurrent(manager, current.get(planned.assignmentId)!, planned.expectedVersion);
      const lockedJobs = await scope.lockAllForUpdate(Job, [...current.values()].map((a) => a.jobId), 'Job');
      const touched: Array<{ assignment: Assignment; job: Job; crewIds: string[]; touchedDays: string[]; before: { crewId: string; days: string[] } }> = [];
      for (const planned of moves) {
        const assignment = current.get(planned.assignmentId)!;
        const days = spanFor(planned.startDate, planned.workingDays, calendars.forCrew(planned.crewId));
        const before = { crewId: assignment.crewId, days: assignment.days };
        Object.assign(assignment, {
          crewId: planned.crewId, startDate: days[0]!, workingDays: planned.workingDays, days, endDate: days[days.length - 1]!, updatedBy: actor.userId,
        });
        touched.push({ assignment, job: lockedJobs.get(assignment.jobId)!, crewIds: [...new Set([before.crewId, planned.crewId])], touchedDays: [...before.days, ...days], before });
      }
      await manager.save(touched.map((t) => t.assignment));
      await recordAudits(manager, actor, touched.map((t) => ({
        entity: 'job', entityId: t.job.id, action, before: t.before, after: { crewId: t.assignment.crewId, days: t.assignment.days },
      })));
      afterCommit.push(...(await extra(manager)));
      if (this.access) afterCommit.push(...(await this.access.onScheduleChanged(manager, actor, touched.map((t) => t.job.id), calendars)));
      const names = await this.userNames(manager, [actor.userId]);
      // Jobs read again: the caller's extra step may have changed their status.
      const jobs = new Map((await manager.findBy(Job, { id: In(touched.map((t) => t.job.id)) })).map((job) => [job.id, job]));
      const changes = await this.describeChanges(
        manager, actor, calendars,
        touched.map((item) => ({ assignment: item.assignment, job: jobs.get(item.job.id)!, crewIds: item.crewIds, touchedDays: item.touchedDays })),
        names,
      );
      // One multi-row INSERT for all the events, in the order the changes were made.
      const events = await manager.save(changes.map((change, index) => manager.create(ScheduleEvent, {
        firmId: actor.firmId, crewIds: touched[index]!.crewIds, type: 'assignment:moved', payload: change as unknown as Record<string, unknown>,
      })));
      changes.forEach((change, index) => published.push({ change, eventId: Number(events[index]!.id) }));
    });
    await this.runAfterCommit(afterCommit);
    for (const { change, eventId } of published) {
      this.events.publish({
        firmId: actor.firmId, type: 'assignment:moved', id: change.assignment!.id, version: change.assignment!.version,
        payload: { eventId, ...change }, crewIds: change.crewIds,
      });
    }
    return published.map((p) => p.change);
  }

  async eventsSince(actor: Actor, afterEventId: number): Promise<ScheduleEventDto[]> {
    requirePermission(actor, 'jobs:read');
    const query = new FirmScope(this.dataSource.manager, actor.firmId)
      .query(ScheduleEvent, 'e')
      .andWhere('e.id > :afterEventId', { afterEventId: String(afterEventId) })
      .orderBy('e.id', 'ASC')
      .take(SCHEDULE_CHANGES_PAGE);
    // Crew roles get only their crews' changes, filtered before the page is cut so a full page means more may follow.
    if (!can(actor.role, 'jobs:manage')) query.andWhere('e.crew_ids && :crewIds::uuid[]', { crewIds: actor.crewIds });
    const rows = await query.getMany();
    return rows.map((row) => ({ id: Number(row.id), type: row.type, payload: row.payload as unknown as ScheduleChangeDto }));
  }

  /**
   * Runs one schedule change in a transaction, recomputes the conflicts it touches, logs a schedule event
   * for reconnecting clients, and publishes it only after commit.
   */
  private async change(
    actor: Actor,
    type: string,
    work: (manager: EntityManager, scope: FirmScope, calendars: FirmCalendars) => Promise<{
      assignment: Assignment | null; removedAssignmentId?: string; job: Job; crewIds: string[]; touchedDays: string[];
    }>,
  ): Promise<ScheduleChangeDto> {
    const { change, eventId, afterCommit } = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const calendars = await loadCalendars(manager, actor.firmId);
      const result = await work(manager, scope, calendars);
      const afterCommit = this.access ? await this.access.onScheduleChanged(manager, actor, [result.job.id], calendars) : [];
      const names = await this.userNames(manager, [actor.userId]);
      const change = await this.describeChange(manager, actor, calendars, result, names);
      const event = await manager.save(manager.create(ScheduleEvent, {
        firmId: actor.firmId, crewIds: result.crewIds, type, payload: change as unknown as Record<string, unknown>,
      }));
      return { change, eventId: Number(event.id), afterCommit };
    });
    await this.runAfterCommit(afterCommit);
    this.events.publish({
      firmId: actor.firmId, type, id: change.assignment?.id ?? change.removedAssignmentId ?? change.job.id,
      version: change.assignment?.version, payload: { eventId, ...change }, crewIds: change.crewIds,
    });
    return change;
  }

  private async describeChange(
    manager: EntityManager,
    actor: Actor,
    calendars: FirmCalendars,
    result: ChangeToDescribe,
    names: Map<string, string>,
  ): Promise<ScheduleChangeDto> {
    return (await this.describeChanges(manager, actor, calendars, [result], names))[0]!;
  }

  /**
   * What each change did to the board: the assignments on its crews over its days, with their conflicts, weather and
   * access bands. Read once for all the changes together (a re-plan moves hundreds), then split per change.
   */
  private async describeChanges(
    manager: EntityManager,
    actor: Actor,
    calendars: FirmCalendars,
    results: ChangeToDescribe[],
    names: Map<string, string>,
  ): Promise<ScheduleChangeDto[]> {
    if (results.length === 0) return [];
    const scope = new FirmScope(manager, actor.firmId);
    const ranges = results.map((result) => {
      const sorted = [...result.touchedDays].sort();
      return { from: sorted[0]!, to: sorted[sorted.length - 1]! };
    });
    const crewIds = [...new Set(results.flatMap((result) => result.crewIds))];
    const from = ranges.map((r) => r.from).sort()[0]!;
    const to = ranges.map((r) => r.to).sort().at(-1)!;
    const inRange = await scope
      .query(Assignment, 'a')
      .andWhere('a.crew_id IN (:...crewIds)', { crewIds })
      .andWhere('a.start_date <= :to AND a.end_date >= :from', { from, to })
      .getMany();
    const jobs = await this.boardJobs(manager, actor.firmId, [...inRange.map((a) => a.jobId), ...results.map((result) => result.job.id)]);
    const assessed = await this.assess(manager, actor.firmId, inRange, jobs, calendars);
    const bands = this.access ? await this.access.bandsFor(manager, actor.firmId, results.map((result) => result.job.id), calendars) : [];
    const jobById = new Map(jobs.map((job) => [job.id, job]));
    return results.map((result, index) => {
      const { from: first, to: last } = ranges[index]!;
      const affected = inRange.filter((a) => result.crewIds.includes(a.crewId) && a.startDate <= last && a.endDate >= first);
      const affectedIds = new Set(affected.map((a) => a.id));
      return {
        assignment: result.assignment ? toAssignmentDto(result.assignment, names) : null,
        ...(result.removedAssignmentId ? { removedAssignmentId: result.removedAssignmentId } : {}),
        job: jobById.get(result.job.id)!,
        affectedAssignmentIds: [...new Set([...affectedIds, ...(result.removedAssignmentId ? [result.removedAssignmentId] : [])])],
        conflicts: assessed.conflicts.filter((conflict) => affectedIds.has(conflict.assignmentId)),
        accessBands: bands.filter((band) => band.jobIds.includes(result.job.id)),
        weather: assessed.weather.filter((day) => day.jobId === result.job.id),
        crewIds: result.crewIds,
        actorName: names.get(actor.userId) ?? 'Someone',
      };
    });
  }

  private async runAfterCommit(tasks: AfterCommit[]): Promise<void> {
    for (const task of tasks) {
      // The change is committed; a failed e-mail is logged for the office to resend, never rolled back.
      await task().catch((error: unknown) => this.logger?.error({ err: error }, 'after-commit task failed'));
    }
  }

  private async lockCurrent(manager: EntityManager, scope: FirmScope, id: string, version: number): Promise<Assignment> {
    const assignment = await scope.lockForUpdate(Assignment, id, 'Scheduled job');
    await this.assertCurrent(manager, assignment, version);
    return assignment;
  }

  /** A change made against an older version is refused, naming who changed it since. */
  private async assertCurrent(manager: EntityManager, assignment: Assignment, version: number): Promise<void> {
    if (assignment.version !== version) {
      const names = await this.userNames(manager, [assignment.updatedBy]);
      const changedBy = assignment.updatedBy ? names.get(assignment.updatedBy) ?? null : null;
      throw errors.staleVersion(changedBy ? `This job was just changed by ${changedBy}, so` : 'This job', {
        current: toAssignmentDto(assignment, names),
        changedBy,
      });
    }
  }

  private async assertNoDoubleBooking(
    scope: FirmScope,
    candidate: { assignmentId: string; crewId: string; days: string[] },
    confirmed: boolean,
  ): Promise<void> {
    if (confirmed) return;
    const others = await scope
      .query(Assignment, 'a')
      .innerJoinAndSelect('a.job', 'job')
      .andWhere('a.crew_id = :crewId', { crewId: candidate.crewId })
      .andWhere('a.days && :days::date[]', { days: candidate.days })
      .getMany();
    const placed = others.map((a) => toPlaced(a, a.job.reference, null, null));
    const clashes = doubleBookedDays(candidate, placed);
    if (clashes.length) {
      const references = [...new Set(others.filter((a) => a.id !== candidate.assignmentId).map((a) => a.job.reference))];
      throw errors.needsConfirmation(
        `This double-books the crew on ${clashes.length} day${clashes.length > 1 ? 's' : ''} (with ${references.join(', ')}). Confirm to book it anyway.`,
        { days: clashes, withJobs: references },
      );
    }
  }

  /** Conflicts of every kind for these placed jobs, and the weather verdicts of their days. */
  private async assess(
    manager: EntityManager, firmId: string, assignments: PlacedAssignment[], jobs: BoardJobDto[], calendars: FirmCalendars, siteOfJob?: Map<string, string>,
  ): Promise<{ conflicts: ConflictDto[]; weather: DayWeatherDto[] }> {
    const [weather, conflicts] = await queriesOf(manager, [
      async () => (this.weather ? this.weather.dayVerdicts(manager, firmId, assignments, calendars, siteOfJob) : []),
      () => this.conflictsFor(manager, firmId, assignments, jobs, calendars),
    ] as const);
    const crewOf = new Map(assignments.map((a) => [a.id, a.crewId]));
    // A stop on a day already gone is history, shown by its marker; only days still to come need acting on.
    const today = this.weather?.todayFor(calendars) ?? '';
    const weatherConflicts: ConflictDto[] = weather
      .filter((day) => day.verdict === 'stop' && day.date >= today)
      .map((day) => ({
        kind: 'weather-stop', assignmentId: day.assignmentId, jobId: day.jobId, crewId: crewOf.get(day.assignmentId) ?? '',
        date: day.date, severity: 'stop', message: `Weather stop: ${day.reasons.find((r) => r.verdict === 'stop')?.message ?? 'see the forecast'}`,
      }));
    return { conflicts: [...conflicts, ...weatherConflicts], weather };
  }

  private async conflictsFor(manager: EntityManager, firmId: string, assignments: PlacedAssignment[], jobs: BoardJobDto[], calendars: FirmCalendars): Promise<ConflictDto[]> {
    if (assignments.length === 0) return [];
    const accessConflicts = this.access ? await this.access.conflictsFor(manager, firmId, assignments, jobs, calendars) : [];
    const byId = new Map(jobs.map((job) => [job.id, job]));
    const placed = assignments.map((a) => {
      const job = byId.get(a.jobId);
      return toPlaced(a, job?.reference ?? '', job?.earliestStart ?? null, job?.targetFinish ?? null);
    });
    let first = assignments[0]!.days[0]!;
    let last = first;
    for (const a of assignments) {
      for (const day of a.days) {
        if (day < first) first = day;
        if (day > last) last = day;
      }
    }
    const absences = [...new Set(assignments.map((a) => a.crewId))].flatMap((crewId) =>
      calendars.memberLeave(crewId, first, last).map((leave) => ({ crewId, ...leave })),
    );
    return [...scheduleConflicts(placed, absences), ...accessConflicts];
  }

  /** Board cards for these jobs, read in one plain query: the board's hottest read, so no entity hydration. */
  private async boardJobs(manager: EntityManager, firmId: string, ids: string[]): Promise<BoardJobDto[]> {
    const unique = [...new Set(ids)];
    if (unique.length === 0) return [];
    const rows = (await manager.query(
      `SELECT ${BOARD_JOB_COLUMNS} FROM job j JOIN client c ON c.id = j.client_id JOIN site s ON s.id = j.site_id
        WHERE j.firm_id = $1 AND j.id = ANY($2::uuid[])`,
      [firmId, unique],
    )) as Array<Encoded<BoardJobRow>>;
    return rows.map((row) => toBoardJobFromRow(decodeRow(row)));
  }

  private async userNames(manager: EntityManager, ids: Array<string | null>): Promise<Map<string, string>> {
    const unique = [...new Set(ids.filter((id): id is string => Boolean(id)))];
    if (unique.length === 0) return new Map();
    const users = await manager.find(User, { where: { id: In(unique) }, select: { id: true, name: true } });
    return new Map(users.map((user) => [user.id, user.name]));
  }
}

// Arrays come as comma-joined text: the driver's array parser was the largest share of the board read's CPU.
// decodeRow turns them back, once per row. Only what a card shows is read; the weather rules read the rest of a
// job's site for the few sites that have a forecast.
const BOARD_JOB_COLUMNS = `j.id, j.reference, j.title, j.status, j.estimated_working_days,
  array_to_string(j.work_types, ',') AS work_types, array_to_string(j.access_needs, ',') AS access_needs,
  j.earliest_start, j.target_finish, j.priority, j.version, j.site_id, c.name AS client_name,
  s.address_line1, s.address_line2, s.town, s.postcode`;

interface PlacedRow {
  a_id: string;
  crew_id: string;
  start_date: string;
  working_days: number;
  days: string[];
  a_version: number;
}

type Encoded<T> = Omit<T, 'work_types' | 'access_needs' | 'days'> & {
  work_types: string;
  access_needs: string;
  days?: string;
};

const listOf = <T extends string>(joined: string): T[] => (joined ? (joined.split(',') as T[]) : []);

function decodeRow<T extends BoardJobRow>(row: Encoded<T>): T {
  const decoded = row as unknown as Record<string, unknown>;
  decoded.work_types = listOf(row.work_types);
  decoded.access_needs = listOf(row.access_needs);
  if (row.days !== undefined) decoded.days = listOf(row.days);
  return decoded as T;
}

/** The placed cards in range, with their job, client and site, in one plain query. */
async function placedRows(manager: EntityManager, firmId: string, crewIds: string[] | null, from: string, to: string): Promise<Array<BoardJobRow & PlacedRow>> {
  const rows = (await manager.query(
    `SELECT ${BOARD_JOB_COLUMNS}, a.id AS a_id, a.crew_id, a.start_date, a.working_days, array_to_string(a.days, ',') AS days,
            a.version AS a_version
       FROM assignment a JOIN job j ON j.id = a.job_id JOIN client c ON c.id = j.client_id JOIN site s ON s.id = j.site_id
      WHERE a.firm_id = $1 AND ($2::uuid[] IS NULL OR a.crew_id = ANY($2::uuid[])) AND a.start_date <= $4 AND a.end_date >= $3
      ORDER BY a.start_date`,
    [firmId, crewIds, from, to],
  )) as Array<Encoded<BoardJobRow & PlacedRow>>;
  return rows.map((row) => decodeRow(row));
}

/** Booked and quoted jobs on no crew yet. */
async function trayRowsOf(manager: EntityManager, firmId: string): Promise<BoardJobRow[]> {
  const rows = (await manager.query(
    `SELECT ${BOARD_JOB_COLUMNS}
       FROM job j JOIN client c ON c.id = j.client_id JOIN site s ON s.id = j.site_id
      WHERE j.firm_id = $1 AND j.status = ANY($2::text[]) AND NOT EXISTS (SELECT 1 FROM assignment a WHERE a.job_id = j.id)`,
    [firmId, [...TRAY_STATUSES]],
  )) as Array<Encoded<BoardJobRow>>;
  return rows.map((row) => decodeRow(row));
}

/**
 * The stood-down days in range of the jobs placed on these crews, in one plain query. Each job-day comes once even
 * if two stand-downs name it (rows from before overlaps were refused), an open one before a settled one.
 */
async function holdDayRows(manager: EntityManager, firmId: string, crewIds: string[] | null, from: string, to: string): Promise<BoardHoldDayDto[]> {
  const rows = (await manager.query(
    `SELECT DISTINCT ON (h.job_id, d.day) h.id, h.job_id, to_char(d.day, 'YYYY-MM-DD') AS date, h.reason, h.status
       FROM weather_hold h
       JOIN assignment a ON a.job_id = h.job_id AND a.firm_id = h.firm_id
       CROSS JOIN LATERAL unnest(h.dates) AS d(day)
      WHERE h.firm_id = $1 AND h.status IN ('open', 'replanned') AND ($2::uuid[] IS NULL OR a.crew_id = ANY($2::uuid[]))
        AND a.start_date <= $4 AND a.end_date >= $3 AND d.day BETWEEN $3 AND $4
      ORDER BY h.job_id, d.day, h.status = 'open' DESC, h.raised_at DESC`,
    [firmId, crewIds, from, to],
  )) as Array<{ id: string; job_id: string; date: string; reason: BoardHoldDayDto['reason']; status: BoardHoldDayDto['status'] }>;
  return rows.map((row) => ({ holdId: row.id, jobId: row.job_id, date: row.date, reason: row.reason, status: row.status }));
}

interface ChangeToDescribe {
  assignment: Assignment | null;
  removedAssignmentId?: string;
  job: Job;
  crewIds: string[];
  touchedDays: string[];
}

/** One job's place after a re-plan, and the version of its assignment the plan was made from. */
export interface PlannedAssignmentMove {
  assignmentId: string;
  crewId: string;
  startDate: string;
  workingDays: number;
  expectedVersion: number;
}

/** What the weather rules need to know of a placed job and its site. */
export interface JobSiteInfo {
  id: string;
  siteId: string;
  workTypes: Job['workTypes'];
  accessNeeds: Job['accessNeeds'];
  title: string;
  description: string | null;
  hazards: string | null;
  lat: number | null;
  lon: number | null;
}

/** The fields of an assignment the conflict, weather and access rules read, and all a board card needs of it. */
export type PlacedAssignment = Pick<Assignment, 'id' | 'jobId' | 'crewId' | 'startDate' | 'workingDays' | 'days' | 'version'>;

function toBoardAssignment(row: BoardJobRow & PlacedRow): BoardAssignmentDto {
  return { id: row.a_id, jobId: row.id, crewId: row.crew_id, startDate: row.start_date, workingDays: row.working_days, days: row.days, version: row.a_version };
}

function toBoardJobFromRow(row: BoardJobRow): BoardJobDto {
  return {
    id: row.id,
    reference: row.reference,
    title: row.title,
    clientName: row.client_name,
    siteAddress: formatAddress({ addressLine1: row.address_line1, addressLine2: row.address_line2, town: row.town, postcode: row.postcode }),
    status: row.status,
    estimatedWorkingDays: row.estimated_working_days,
    workTypes: row.work_types,
    accessNeeds: row.access_needs,
    earliestStart: row.earliest_start,
    targetFinish: row.target_finish,
    priority: row.priority,
    version: row.version,
  };
}

interface BoardJobRow {
  site_id: string;
  id: string;
  reference: string;
  title: string;
  status: Job['status'];
  estimated_working_days: number;
  work_types: Job['workTypes'];
  access_needs: Job['accessNeeds'];
  earliest_start: string | null;
  target_finish: string | null;
  priority: Job['priority'];
  version: number;
  client_name: string;
  address_line1: string;
  address_line2: string | null;
  town: string;
  postcode: string;
}

function toPlaced(a: PlacedAssignment, reference: string, earliestStart: string | null, targetFinish: string | null): PlacedJob {
  return { assignmentId: a.id, jobId: a.jobId, crewId: a.crewId, reference, days: a.days, earliestStart, targetFinish };
}

export function toAssignmentDto(a: Assignment, names: Map<string, string>): AssignmentDto {
  return {
    id: a.id,
    jobId: a.jobId,
    crewId: a.crewId,
    startDate: a.startDate,
    workingDays: a.workingDays,
    days: a.days,
    version: a.version,
    updatedBy: a.updatedBy ? names.get(a.updatedBy) ?? null : null,
    updatedAt: a.updatedAt.toISOString(),
  };
}

export function toBoardJob(job: Job): BoardJobDto {
  return {
    id: job.id,
    reference: job.reference,
    title: job.title,
    clientName: job.client.name,
    siteAddress: formatAddress(job.site),
    status: job.status,
    estimatedWorkingDays: job.estimatedWorkingDays,
    workTypes: job.workTypes,
    accessNeeds: job.accessNeeds,
    earliestStart: job.earliestStart,
    targetFinish: job.targetFinish,
    priority: job.priority,
    version: job.version,
  };
}
