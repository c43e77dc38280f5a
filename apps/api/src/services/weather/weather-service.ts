import { createHash } from 'node:crypto';
import { In, type DataSource, type EntityManager } from 'typeorm';
import {
  activitiesForJob,
  assessDay,
  daylight,
  firmRuleSettings,
  planReplan,
  workingWindow,
  can,
  type DayWeatherDto,
  type RuleSettings,
  type PlacedSpan,
  type ReplanMoveDto,
  type ReplanPreviewDto,
  type HoldWithdrawValues,
  type ReplanValues,
  type WeatherHoldDto,
  type WeatherHoldValues,
  type WeatherLimitOverrides,
  type WeatherLimitsDto,
  type WeatherOutlookDto,
  shortDayLabel,
} from '@hodboard/shared';
import { AccessBooking, Assignment, Client, Crew, Firm, FirmWeatherLimits, Job, Notification, Site, User, WeatherHold } from '../../entities/index.js';
import { errors } from '../../errors.js';
import type { Clock } from '../../lib/clock.js';
import type { EventBus } from '../../lib/event-bus.js';
import { todayIn } from '../../lib/today.js';
import type { AccessService, AfterCommit } from '../access-service.js';
import { requirePermission, type Actor } from '../actor.js';
import { recordAudit } from '../audit-service.js';
import { escapeHtml } from '../auth-service.js';
import { loadCalendars, type FirmCalendars } from '../calendar-service.js';
import { assertVersion, FirmScope } from '../firm-scope.js';
import type { Mailer } from '../mailer.js';
import type { JobSiteInfo, PlacedAssignment, ScheduleService } from '../schedule-service.js';
import { formatAddress } from '../site-service.js';
import type { ForecastService } from './forecast-service.js';
import { knockOnKey, outlookKnockOns } from './outlook-knock-on.js';

const HOUR = 3_600_000;

export class WeatherService {
  private schedule?: ScheduleService;
  private access?: AccessService;

  constructor(
    private readonly dataSource: DataSource,
    private readonly forecasts: ForecastService,
    private readonly mailer: Mailer,
    private readonly events: EventBus,
    private readonly clock: Clock,
  ) {}

  /** The schedule service and this one use each other; the app wires the loop once at start-up. */
  attachSchedule(schedule: ScheduleService, access?: AccessService): void {
    this.schedule = schedule;
    this.access = access;
  }

  /** Today in the firm's time zone, by this service's clock. */
  todayFor(calendars: FirmCalendars): string {
    return todayIn(calendars.timeZone, this.clock());
  }

  /**
   * The verdict of each placed job-day that has a forecast: the job's activities assessed over the firm's
   * working hours cut to daylight at the site. Days past the forecast have no entry.
   */
  async dayVerdicts(
    manager: EntityManager, firmId: string, assignments: PlacedAssignment[], calendars: FirmCalendars, siteOfJob?: Map<string, string>,
  ): Promise<DayWeatherDto[]> {
    if (assignments.length === 0) return [];
    let first = assignments[0]!.days[0]!;
    let last = first;
    for (const a of assignments) {
      for (const day of a.days) {
        if (day < first) first = day;
        if (day > last) last = day;
      }
    }
    const from = new Date(Date.parse(`${first}T00:00:00Z`) - 12 * HOUR);
    const to = new Date(Date.parse(`${last}T00:00:00Z`) + 9 * 24 * HOUR);
    // Knowing each job's site, the rest of what the rules read is fetched only for the jobs whose site has a forecast.
    let jobById = siteOfJob ? null : await this.jobSiteInfo(manager, firmId, assignments);
    const siteIds = [...new Set(siteOfJob ? siteOfJob.values() : [...jobById!.values()].map((job) => job.siteId))];
    const forecasts = await this.forecasts.forSites(manager, siteIds, from, to);
    if (siteOfJob) {
      const forecastJobs = assignments.filter((a) => (forecasts.get(siteOfJob.get(a.jobId) ?? '')?.hours.length ?? 0) > 0);
      if (forecastJobs.length === 0) return [];
      jobById = await this.jobSiteInfo(manager, firmId, forecastJobs);
    }
    const jobs = jobById!;
    const siteById = new Map([...jobs.values()].map((job) => [job.siteId, { id: job.siteId, hazards: job.hazards, lat: job.lat, lon: job.lon }]));
    // Read on every call, never kept: a change to the firm's limits shows on the next board read.
    const settings = await this.settingsFor(manager, firmId);
    const { firm } = calendars;
    const result: DayWeatherDto[] = [];
    for (const assignment of assignments) {
      const job = jobs.get(assignment.jobId);
      const site = job ? siteById.get(job.siteId) : undefined;
      const forecast = site ? forecasts.get(site.id) : undefined;
      if (!job || !site || !forecast || forecast.hours.length === 0) continue;
      const lime = /\blime\b/i.test(`${site.hazards ?? ''} ${job.description ?? ''} ${job.title}`);
      const activities = activitiesForJob(job.workTypes, job.accessNeeds, lime ? 'hydraulic-lime' : 'cement');
      if (activities.length === 0) continue;
      const lastHour = Date.parse(forecast.hours[forecast.hours.length - 1]!.time);
      for (const date of assignment.days) {
        const light = site.lat !== null && site.lon !== null ? { times: daylight(date, site.lat, site.lon) } : undefined;
        const window = workingWindow(date, { start: firm.dayStart, end: firm.dayEnd }, firm.timeZone, light);
        if (!window || Date.parse(window.end) > lastHour + HOUR) continue;
        const startMs = Date.parse(window.start);
        const hours = forecast.hours.filter((h) => Date.parse(h.time) >= startMs - HOUR);
        if (hours.length === 0 || Date.parse(hours[0]!.time) > startMs) continue;
        const assessment = assessDay({ activities, forecast: hours, window, settings });
        result.push({
          assignmentId: assignment.id,
          jobId: assignment.jobId,
          date,
          verdict: assessment.verdict,
          reasons: assessment.activities.flatMap((a) =>
            a.reasons.map((r) => ({
              activity: a.activity, ruleId: r.ruleId, verdict: r.verdict, message: r.message, source: r.source, at: r.at,
              threshold: r.threshold, unit: r.unit, observed: r.observed, beaufort: r.beaufort ?? null,
            })),
          ),
          notes: assessment.notes.map((n) => ({
            activities: [...n.activities], ruleId: n.ruleId, message: n.message, source: n.source, uncovered: n.uncovered.map((g) => ({ from: g.from, to: g.to })),
          })),
          advice: [...new Set(assessment.activities.flatMap((a) => [...a.advice]))],
          forecastFetchedAt: forecast.fetchedAt?.toISOString() ?? null,
          isStale: forecast.isStale,
        });
      }
    }
    return result;
  }

  /** The thresholds a firm's verdicts are worked out with: the defaults with its own limits on top. */
  async settingsFor(manager: EntityManager, firmId: string): Promise<RuleSettings> {
    const row = await manager.findOneBy(FirmWeatherLimits, { firmId });
    return firmRuleSettings(row?.overrides).settings;
  }

  async limits(actor: Actor): Promise<WeatherLimitsDto> {
    requirePermission(actor, 'jobs:manage');
    return toLimitsDto(await this.dataSource.manager.findOneBy(FirmWeatherLimits, { firmId: actor.firmId }));
  }

  /** Replaces the firm's own limits: a key left out goes back to its default. */
  async updateLimits(actor: Actor, input: { overrides: WeatherLimitOverrides; version: number }): Promise<WeatherLimitsDto> {
    requirePermission(actor, 'firm:manage');
    const saved = await this.dataSource.transaction(async (manager) => {
      const existing = await manager.findOne(FirmWeatherLimits, { where: { firmId: actor.firmId }, lock: { mode: 'pessimistic_write' } });
      // Version 0 means "never saved": a second first save is stale like any other (the primary key refuses it).
      assertVersion(existing ?? { version: 0 }, input.version, 'The weather limits');
      const before = existing ? { ...existing.overrides } : {};
      const row = existing ?? manager.create(FirmWeatherLimits, { firmId: actor.firmId });
      row.overrides = { ...input.overrides };
      row.updatedBy = actor.userId;
      const result = await manager.save(row);
      await recordAudit(manager, actor, { entity: 'weather-limits', entityId: actor.firmId, action: existing ? 'updated' : 'created', before, after: result.overrides });
      return result;
    });
    this.events.publish({ firmId: actor.firmId, type: 'weather-limits:updated', id: actor.firmId, version: saved.version });
    return toLimitsDto(saved);
  }

  private async jobSiteInfo(manager: EntityManager, firmId: string, assignments: PlacedAssignment[]): Promise<Map<string, JobSiteInfo>> {
    const rows = (await manager.query(
      `SELECT j.id, j.site_id, j.work_types, j.access_needs, j.title, j.description, s.hazards, s.lat, s.lon
         FROM job j JOIN site s ON s.id = j.site_id WHERE j.firm_id = $1 AND j.id = ANY($2::uuid[])`,
      [firmId, [...new Set(assignments.map((a) => a.jobId))]],
    )) as Array<{ id: string; site_id: string; work_types: Job['workTypes']; access_needs: Job['accessNeeds']; title: string; description: string | null; hazards: string | null; lat: number | null; lon: number | null }>;
    return new Map(rows.map((row) => [row.id, {
      id: row.id, siteId: row.site_id, workTypes: row.work_types, accessNeeds: row.access_needs, title: row.title,
      description: row.description, hazards: row.hazards, lat: row.lat, lon: row.lon,
    }]));
  }

  async outlook(actor: Actor, days = 7): Promise<WeatherOutlookDto> {
    requirePermission(actor, 'jobs:read');
    const manager = this.dataSource.manager;
    const calendars = await loadCalendars(manager, actor.firmId);
    const from = todayIn(calendars.timeZone, this.clock());
    const to = new Date(Date.parse(`${from}T00:00:00Z`) + (days - 1) * 24 * HOUR).toISOString().slice(0, 10);
    const scope = new FirmScope(manager, actor.firmId);
    const query = scope.query(Assignment, 'a').andWhere('a.start_date <= :to AND a.end_date >= :from', { from, to });
    if (!can(actor.role, 'jobs:manage')) query.andWhere('a.crew_id IN (:...crews)', { crews: actor.crewIds.length ? actor.crewIds : ['00000000-0000-0000-0000-000000000000'] });
    const assignments = await query.getMany();
    const verdicts = (await this.dayVerdicts(manager, actor.firmId, assignments, calendars)).filter((d) => d.date >= from && d.date <= to);
    const jobs = await scope.find(Job, { where: { id: In(assignments.map((a) => a.jobId).concat(['00000000-0000-0000-0000-000000000000'])) } });
    const confirmed = await scope.query(AccessBooking, 'b').andWhere("b.state IN ('confirmed', 'erected')").getMany();
    const atRisk = verdicts.filter((d) => d.verdict !== 'go');
    const assignmentById = new Map(assignments.map((a) => [a.id, a]));
    const knockOns = await outlookKnockOns(
      manager, actor.firmId, atRisk.flatMap((d) => { const assignment = assignmentById.get(d.assignmentId); return assignment ? [{ assignment, date: d.date }] : []; }),
      calendars, this.access,
    );
    return {
      from, to, days: verdicts,
      atRisk: atRisk.map((d) => {
        const job = jobs.find((j) => j.id === d.jobId);
        return {
          jobId: d.jobId, reference: job?.reference ?? '', date: d.date, verdict: d.verdict as 'caution' | 'stop',
          crewId: assignmentById.get(d.assignmentId)?.crewId ?? '',
          hasConfirmedAccess: confirmed.some((b) => b.jobIds.includes(d.jobId)), targetFinish: job?.targetFinish ?? null,
          knockOn: knockOns.get(knockOnKey(d.assignmentId, d.date)) ?? null,
        };
      }),
    };
  }

  async listHolds(actor: Actor, query: { jobId?: string; status?: string }): Promise<WeatherHoldDto[]> {
    requirePermission(actor, 'jobs:read');
    const builder = new FirmScope(this.dataSource.manager, actor.firmId).query(WeatherHold, 'h').orderBy('h.raised_at', 'DESC').take(200);
    if (query.jobId) builder.andWhere('h.job_id = :jobId', { jobId: query.jobId });
    if (query.status) builder.andWhere('h.status = :status', { status: query.status });
    if (!can(actor.role, 'jobs:manage')) builder.andWhere('h.crew_id IN (:...crews)', { crews: actor.crewIds.length ? actor.crewIds : ['00000000-0000-0000-0000-000000000000'] });
    return this.toDtos(this.dataSource.manager, await builder.getMany());
  }

  /**
   * Stands job-days down. A crew lead may do it for their own crew's jobs; the job shows as stood down until the
   * office re-plans. The same idempotency key twice returns the first hold, so an offline retry is stored once.
   */
  async raise(actor: Actor, input: WeatherHoldValues): Promise<{ hold: WeatherHoldDto; created: boolean }> {
    requirePermission(actor, 'holds:raise');
    const result = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      if (input.idempotencyKey) {
        const existing = await scope.find(WeatherHold, { where: { idempotencyKey: input.idempotencyKey } });
        if (existing[0]) return { hold: existing[0], created: false };
      }
      const job = await scope.lockForUpdate(Job, input.jobId, 'Job');
      const assignment = await manager.findOneBy(Assignment, { jobId: job.id, firmId: actor.firmId });
      if (!assignment) throw errors.illegalTransition(`${job.reference} is not on the board, so there is nothing to stand down.`);
      if (!can(actor.role, 'jobs:manage') && !actor.crewIds.includes(assignment.crewId)) throw errors.notFound('Job');
      const notOnJob = input.dates.filter((date) => !assignment.days.includes(date));
      if (notOnJob.length) throw errors.validation([{ path: 'dates', message: `Not a day of ${job.reference}: ${notOnJob.join(', ')}` }]);
      const dates = [...new Set(input.dates)].sort();
      // The job row is locked above, so two stand-downs of the same days at once meet here one after the other.
      const standing = await scope.query(WeatherHold, 'h')
        .andWhere("h.job_id = :jobId AND h.status <> 'withdrawn'", { jobId: job.id })
        .orderBy('h.raised_at', 'DESC')
        .getMany();
      const overlap = dates.filter((date) => standing.some((other) => other.dates.includes(date)));
      if (overlap.length) {
        throw errors.conflict(`${job.reference} is already stood down on ${overlap.map(shortDayLabel).join(', ')}; withdraw that stand-down first to record it again.`);
      }
      const site = await manager.findOneByOrFail(Site, { id: job.siteId });
      const from = new Date(Date.parse(`${dates[0]}T00:00:00Z`));
      const to = new Date(Date.parse(`${dates[dates.length - 1]}T23:59:59Z`));
      const forecast = (await this.forecasts.forSites(manager, [site.id], from, to)).get(site.id);
      // Already stood down by another stand-down: what it goes back to is what that one went back to.
      const jobStatusBefore = job.status === 'stood-down' ? standing.find((other) => other.jobStatusBefore)?.jobStatusBefore ?? null : job.status;
      const hold = await manager.save(scope.create(WeatherHold, {
        jobId: job.id, crewId: assignment.crewId, dates, reason: input.reason, notes: input.notes, raisedBy: actor.userId,
        raisedFrom: can(actor.role, 'jobs:manage') ? 'office' : 'crew', status: 'open',
        forecastSeen: forecast?.hours ?? [], forecastFetchedAt: forecast?.fetchedAt ?? null, forecastWasStale: forecast?.isStale ?? false,
        jobStatusBefore, replanMode: null, idempotencyKey: input.idempotencyKey ?? null,
      }));
      const before = job.status;
      if (job.status === 'scheduled' || job.status === 'on-site') {
        job.status = 'stood-down';
        await manager.save(job);
      }
      await recordAudit(manager, actor, {
        entity: 'job', entityId: job.id, action: 'stood-down',
        before: { status: before }, after: { status: job.status, dates, reason: input.reason },
      });
      return { hold, created: true };
    });
    if (result.created) {
      this.events.publish({ firmId: actor.firmId, type: 'hold:raised', id: result.hold.id, version: result.hold.version, crewIds: result.hold.crewId ? [result.hold.crewId] : [] });
    }
    return { hold: (await this.toDtos(this.dataSource.manager, [result.hold]))[0]!, created: result.created };
  }

  async preview(actor: Actor, holdId: string, input: ReplanValues): Promise<ReplanPreviewDto> {
    requirePermission(actor, 'holds:replan');
    const manager = this.dataSource.manager;
    const hold = await new FirmScope(manager, actor.firmId).get(WeatherHold, holdId, 'Stand-down');
    return (await this.buildPreview(manager, actor, hold, input)).preview;
  }

  /**
   * Commits a re-plan in one transaction: the stand-down is locked, then the crews planned on (as placing and moving
   * jobs lock them), and the plan is made from what is read there and applied as made, so the clients are told the
   * dates the board then shows. Of two commits of one stand-down the second finds it re-planned (409); with the
   * preview's planKey, a plan that would no longer be the one previewed is refused (409) rather than applied.
   */
  async commit(actor: Actor, holdId: string, input: ReplanValues): Promise<ReplanPreviewDto> {
    requirePermission(actor, 'holds:replan');
    if (!this.schedule) throw new Error('weather service used before the schedule was attached');
    let committed: ReplanPreviewDto | undefined;
    await this.schedule.applyMoves(actor, async (tx) => {
      const scope = new FirmScope(tx, actor.firmId);
      const hold = await scope.lockForUpdate(WeatherHold, holdId, 'Stand-down');
      assertVersion(hold, input.version, 'This stand-down');
      if (hold.status !== 'open') throw errors.conflict('This stand-down has already been re-planned.');
      const target = await tx.findOneBy(Assignment, { jobId: hold.jobId, firmId: actor.firmId });
      const crewIds = [target?.crewId, input.mode === 'move-crew' ? input.crewId : undefined].filter((id): id is string => Boolean(id));
      for (const crewId of [...new Set(crewIds)].sort()) await scope.lockForUpdate(Crew, crewId, 'Crew');
      const { preview, plan, spans } = await this.buildPreview(tx, actor, hold, input);
      if (input.planKey && input.planKey !== preview.planKey) {
        throw errors.conflict('The board has changed since this re-plan was previewed; check the new preview before committing.');
      }
      committed = preview;
      return {
        moves: plan.moves.map((m) => ({ assignmentId: m.assignmentId, crewId: m.toCrewId, startDate: m.startDate, workingDays: m.workingDays, expectedVersion: spans.get(m.assignmentId)!.version })),
        extra: async (manager) => {
          hold.status = 'replanned';
          hold.replanMode = input.mode;
          await manager.save(hold);
          // Locked already when the job moved; when nothing moved, locked here, after the crews and assignments.
          await new FirmScope(manager, actor.firmId).lockForUpdate(Job, hold.jobId, 'Job');
          const status = await this.settleJobStatus(manager, actor, hold);
          await recordAudit(manager, actor, { entity: 'job', entityId: hold.jobId, action: 'replanned', after: { mode: input.mode, moves: plan.moves.length, ...status } });
          return this.clientMails(manager, actor, hold, preview);
        },
      };
    }, 'replanned');
    this.events.publish({ firmId: actor.firmId, type: 'hold:replanned', id: holdId });
    return committed!;
  }

  /**
   * Takes a stand-down back: one still open, or one re-planned with nothing moved. The job goes back to its status
   * before unless another stand-down still holds it, and the days no longer count as lost.
   */
  async withdraw(actor: Actor, holdId: string, input: HoldWithdrawValues): Promise<WeatherHoldDto> {
    requirePermission(actor, 'holds:raise');
    const hold = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      // The stand-down first, then its job, in the order a re-plan takes them, so a withdrawal and a re-plan queue up.
      const current = await scope.lockForUpdate(WeatherHold, holdId, 'Stand-down');
      if (!can(actor.role, 'jobs:manage') && !(current.crewId && actor.crewIds.includes(current.crewId))) throw errors.notFound('Stand-down');
      await scope.lockForUpdate(Job, current.jobId, 'Job');
      assertVersion(current, input.version, 'This stand-down');
      if (current.status === 'withdrawn') throw errors.conflict('This stand-down has already been withdrawn.');
      if (current.status === 'replanned' && current.replanMode !== 'none') {
        throw errors.conflict('This stand-down has been re-planned and its jobs moved; move them back on the board instead.');
      }
      const before = { status: current.status };
      current.status = 'withdrawn';
      const saved = await manager.save(current);
      const status = await this.settleJobStatus(manager, actor, saved);
      await recordAudit(manager, actor, {
        entity: 'job', entityId: saved.jobId, action: 'stand-down-withdrawn',
        before, after: { dates: saved.dates, reason: input.reason ?? null, ...status },
      });
      return saved;
    });
    this.events.publish({ firmId: actor.firmId, type: 'hold:withdrawn', id: hold.id, version: hold.version, crewIds: hold.crewId ? [hold.crewId] : [] });
    return (await this.toDtos(this.dataSource.manager, [hold]))[0]!;
  }

  /**
   * Jobs left stood down by a stand-down re-planned with nothing moved go back to their status once its days are past.
   * Run on a schedule for every firm; returns how many jobs it put back.
   */
  async releasePassedStandDowns(): Promise<number> {
    const rows = (await this.dataSource.query(
      `SELECT DISTINCT h.firm_id, h.job_id FROM weather_hold h JOIN job j ON j.id = h.job_id AND j.firm_id = h.firm_id
        WHERE j.status = 'stood-down' AND h.status = 'replanned' AND h.replan_mode = 'none'`,
    )) as Array<{ firm_id: string; job_id: string }>;
    let released = 0;
    for (const row of rows) {
      const system = { firmId: row.firm_id, userId: null as unknown as string };
      const job = await this.dataSource.transaction(async (manager) => {
        const locked = await new FirmScope(manager, row.firm_id).lockForUpdate(Job, row.job_id, 'Job');
        const latest = await new FirmScope(manager, row.firm_id).query(WeatherHold, 'h')
          .andWhere("h.job_id = :jobId AND h.status = 'replanned' AND h.replan_mode = 'none'", { jobId: row.job_id })
          .orderBy('h.raised_at', 'DESC').getOne();
        if (!latest) return null;
        const status = await this.settleJobStatus(manager, system, latest);
        if (status.statusAfter === status.statusBefore) return null;
        await recordAudit(manager, system, { entity: 'job', entityId: locked.id, action: 'stand-down-ended', before: { status: status.statusBefore }, after: { status: status.statusAfter } });
        return locked;
      });
      if (job) {
        released += 1;
        this.events.publish({ firmId: row.firm_id, type: 'job:updated', id: job.id });
      }
    }
    return released;
  }

  /**
   * Puts the job of a settled stand-down (re-planned or withdrawn) back to its status before, unless a stand-down still
   * holds it: one open, or one re-planned with nothing moved that has a held day today or ahead. Runs in the caller's
   * transaction with the job row locked.
   */
  private async settleJobStatus(manager: EntityManager, actor: Pick<Actor, 'firmId'>, settled: WeatherHold): Promise<{ statusBefore: Job['status']; statusAfter: Job['status'] }> {
    const scope = new FirmScope(manager, actor.firmId);
    const job = await scope.get(Job, settled.jobId, 'Job');
    const statusBefore = job.status;
    if (job.status !== 'stood-down') return { statusBefore, statusAfter: job.status };
    const calendars = await loadCalendars(manager, actor.firmId);
    const today = todayIn(calendars.timeZone, this.clock());
    const others = await scope.find(WeatherHold, { where: { jobId: job.id } });
    const isHolding = (hold: WeatherHold) =>
      hold.status === 'open' || (hold.status === 'replanned' && hold.replanMode === 'none' && hold.dates.some((date) => date >= today));
    if (others.some(isHolding)) return { statusBefore, statusAfter: job.status };
    job.status = settled.jobStatusBefore === 'on-site' ? 'on-site' : 'scheduled';
    await manager.save(job);
    return { statusBefore, statusAfter: job.status };
  }

  /** Days lost to weather per job and per crew: each job-day once, however many stand-downs name it. */
  async summary(actor: Actor): Promise<{ byJob: Array<{ jobId: string; days: number }>; byCrew: Array<{ crewId: string; days: number }> }> {
    requirePermission(actor, 'jobs:manage');
    const rows = (await this.dataSource.query(
      `SELECT DISTINCT h.job_id, h.crew_id, d::text AS date FROM weather_hold h CROSS JOIN LATERAL unnest(h.dates) AS d
        WHERE h.firm_id = $1 AND h.status <> 'withdrawn'`,
      [actor.firmId],
    )) as Array<{ job_id: string; crew_id: string | null; date: string }>;
    const byJob = new Map<string, Set<string>>();
    const byCrew = new Map<string, Set<string>>();
    for (const row of rows) {
      byJob.set(row.job_id, (byJob.get(row.job_id) ?? new Set()).add(row.date));
      if (row.crew_id) byCrew.set(row.crew_id, (byCrew.get(row.crew_id) ?? new Set()).add(`${row.job_id}|${row.date}`));
    }
    return {
      byJob: [...byJob].map(([jobId, days]) => ({ jobId, days: days.size })),
      byCrew: [...byCrew].map(([crewId, days]) => ({ crewId, days: days.size })),
    };
  }

  private async plan(manager: EntityManager, actor: Actor, hold: WeatherHold, input: ReplanValues) {
    const scope = new FirmScope(manager, actor.firmId);
    const calendars = await loadCalendars(manager, actor.firmId);
    const target = await manager.findOneBy(Assignment, { jobId: hold.jobId, firmId: actor.firmId });
    if (!target) throw errors.conflict('The job stood down is no longer on the board.');
    const receivingCrew = input.mode === 'move-crew' && input.crewId ? await scope.get(Crew, input.crewId, 'Crew') : null;
    const later = await scope.query(Assignment, 'a').andWhere('a.crew_id = :crewId AND a.start_date >= :start', { crewId: target.crewId, start: target.startDate }).getMany();
    const firstHeldOwn = target.days.find((day) => hold.dates.includes(day));
    // The receiving crew's jobs still running on or after the day asked for: one already begun holds the move back,
    // later ones ripple on after it.
    const receiving = receivingCrew && firstHeldOwn
      ? await scope.query(Assignment, 'a')
        .andWhere('a.crew_id = :crewId AND a.end_date >= :from AND a.job_id <> :jobId', { crewId: receivingCrew.id, from: input.startDate ?? firstHeldOwn, jobId: target.jobId })
        .getMany()
      : [];
    const jobs = await scope.find(Job, { where: { id: In([target.jobId, ...later.map((a) => a.jobId), ...receiving.map((a) => a.jobId)]) } });
    const earliest = new Map(jobs.map((j) => [j.id, j.earliestStart]));
    const toSpan = (a: Assignment): PlacedSpan => ({
      assignmentId: a.id, jobId: a.jobId, crewId: a.crewId, startDate: a.startDate, workingDays: a.workingDays, days: a.days, earliestStart: earliest.get(a.jobId) ?? null,
    });
    const plan = planReplan({
      target: toSpan(target), heldDates: hold.dates, mode: input.mode, laterOnCrew: later.map(toSpan), onReceivingCrew: receiving.map(toSpan),
      calendarFor: (crewId) => calendars.forCrew(crewId), toCrewId: input.crewId, startDate: input.startDate,
    });
    const firstHeld = target.days[plan.workedDays.length];
    if (input.mode === 'move-crew' && input.startDate && plan.workedDays.length > 0 && firstHeld && input.startDate < firstHeld) {
      throw errors.validation([{ path: 'startDate', message: `The days before ${firstHeld} were worked by the first crew; the new crew starts on or after it` }]);
    }
    return { plan, spans: new Map([target, ...later, ...receiving].map((a) => [a.id, a])), jobs, calendars, receivingCrew };
  }

  private async buildPreview(manager: EntityManager, actor: Actor, hold: WeatherHold, input: ReplanValues) {
    const { plan, jobs, calendars, spans, receivingCrew } = await this.plan(manager, actor, hold, input);
    const clients = await manager.find(Client, { where: { id: In(jobs.map((j) => j.clientId)) } });
    const projected = new Map(plan.moves.map((m) => [m.jobId, m.toDays]));
    const planned = this.access ? await this.access.accessChangesFor(manager, actor.firmId, [...projected.keys()], calendars, projected) : [];
    const accessChanges = planned.flatMap(({ booking, effect, wanted }) => {
      if (effect === 'settles') return [];
      const isRequested = booking.state === 'requested';
      return [{
        bookingId: booking.id, accessType: booking.accessType, state: booking.state,
        fromErect: isRequested ? booking.requestedErect : booking.confirmedErect ?? booking.requestedErect,
        fromStrike: isRequested ? booking.requestedStrike : booking.confirmedStrike ?? booking.requestedStrike,
        toErect: wanted.erect, toStrike: wanted.strike, effect,
      }];
    });
    const warnings: string[] = [];
    if (receivingCrew && plan.blockedBy.length > 0 && plan.moves[0]) {
      const references = plan.blockedBy.map((id) => jobs.find((j) => j.id === spans.get(id)?.jobId)?.reference ?? 'a job');
      warnings.push(`${receivingCrew.name} is still on ${references.join(', ')} on ${shortDayLabel(plan.requestedStart!)}, so they start on ${shortDayLabel(plan.moves[0].startDate)}.`);
    }
    if (plan.lostWorkingDays === 0) warnings.push('None of the days stood down are working days of this job; nothing moves.');
    const moves = plan.moves.map((m) => {
      const job = jobs.find((j) => j.id === m.jobId)!;
      return {
        jobId: m.jobId, reference: job.reference, title: job.title, clientName: clients.find((c) => c.id === job.clientId)?.name ?? '',
        fromCrewId: m.fromCrewId, toCrewId: m.toCrewId, fromDays: [...m.fromDays], toDays: m.toDays,
      };
    });
    const preview: ReplanPreviewDto = {
      holdId: hold.id, mode: input.mode, lostWorkingDays: plan.lostWorkingDays, workedDays: plan.workedDays,
      moves,
      accessChanges,
      clientsToTell: [...new Set(plan.moves.map((m) => clients.find((c) => c.id === jobs.find((j) => j.id === m.jobId)?.clientId)).filter((c) => c?.email).map((c) => c!.name))],
      warnings,
      planKey: planKeyOf({ mode: input.mode, moves, accessChanges }),
    };
    return { preview, plan, spans };
  }

  /**
   * One e-mail per client per re-plan, listing every job of theirs that moved. The notification key (stand-down and
   * client) is claimed in the commit's transaction, so a second commit of the same change claims nothing and nobody
   * is told twice.
   */
  private async clientMails(manager: EntityManager, actor: Actor, hold: WeatherHold, preview: ReplanPreviewDto): Promise<AfterCommit[]> {
    if (preview.moves.length === 0) return [];
    const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
    // Read for all the moved jobs at once: a re-plan can move hundreds.
    const jobs = await manager.find(Job, { where: { id: In(preview.moves.map((m) => m.jobId)), firmId: actor.firmId }, relations: { client: true, site: true } });
    const jobById = new Map(jobs.map((job) => [job.id, job]));
    const byClient = new Map<string, { client: Client; moves: Array<{ job: Job; move: ReplanMoveDto }> }>();
    for (const move of preview.moves) {
      const job = jobById.get(move.jobId);
      if (!job?.client.email) continue;
      const entry = byClient.get(job.clientId) ?? { client: job.client, moves: [] };
      entry.moves.push({ job, move });
      byClient.set(job.clientId, entry);
    }
    if (byClient.size === 0) return [];
    const keyOf = (clientId: string) => `replan:${hold.id}:client:${clientId}`;
    const inserted = await manager.createQueryBuilder().insert().into(Notification)
      .values([...byClient].map(([clientId, { client }]) => ({ firmId: actor.firmId, dedupeKey: keyOf(clientId), channel: 'email', recipient: client.email! })))
      .orIgnore().returning('dedupe_key').execute();
    const claimed = new Set((inserted.raw as Array<{ dedupe_key: string }>).map((row) => row.dedupe_key));
    const tasks: AfterCommit[] = [];
    for (const [clientId, { client, moves }] of byClient) {
      if (!claimed.has(keyOf(clientId))) continue;
      const text = replanMailText(firm, client, hold, moves);
      const references = moves.map(({ job }) => job.reference);
      tasks.push(() => this.mailer.send({
        to: client.email!,
        subject: `New dates for your ${references.length === 1 ? 'job' : 'jobs'} ${listInWords(references)}`,
        text,
        html: text.split('\n\n').map((p) => `<p>${escapeHtml(p).replaceAll('\n', '<br>')}</p>`).join(''),
      }));
    }
    return tasks;
  }

  private async toDtos(manager: EntityManager, holds: WeatherHold[]): Promise<WeatherHoldDto[]> {
    if (holds.length === 0) return [];
    const jobs = await manager.find(Job, { where: { id: In(holds.map((h) => h.jobId)) }, select: { id: true, reference: true } });
    const users = await manager.find(User, { where: { id: In(holds.map((h) => h.raisedBy).filter((v): v is string => Boolean(v)).concat(['00000000-0000-0000-0000-000000000000'])) } });
    return holds.map((hold) => ({
      id: hold.id, jobId: hold.jobId, jobReference: jobs.find((j) => j.id === hold.jobId)?.reference ?? '', crewId: hold.crewId, dates: hold.dates,
      reason: hold.reason, notes: hold.notes, raisedBy: users.find((u) => u.id === hold.raisedBy)?.name ?? null, raisedFrom: hold.raisedFrom,
      raisedAt: hold.raisedAt.toISOString(), status: hold.status, forecastSeen: hold.forecastSeen,
      forecastFetchedAt: hold.forecastFetchedAt?.toISOString() ?? null, forecastWasStale: hold.forecastWasStale, replanMode: hold.replanMode, version: hold.version,
    }));
  }
}

/** The client's e-mail after a re-plan, in plain words: why, then each of their jobs with its new dates. */
function replanMailText(firm: Firm, client: Client, hold: WeatherHold, moves: Array<{ job: Job; move: ReplanMoveDto }>): string {
  const when = (d: string) => new Intl.DateTimeFormat('en-GB', { weekday: 'long', day: 'numeric', month: 'long', timeZone: 'UTC' }).format(new Date(`${d}T12:00:00Z`));
  const held = moves.find(({ job }) => job.id === hold.jobId)?.job;
  const why = held
    ? `The weather has stopped work on ${held.title.toLowerCase()} at ${formatAddress(held.site)} (our ref ${held.reference}), so we have changed the dates of ${moves.length === 1 ? 'your job' : 'your jobs'} with us.`
    : `The weather has stopped work on another job of ours, and that moves the dates of ${moves.length === 1 ? 'your job' : 'your jobs'} with us.`;
  const lines = moves.map(({ job, move }) => {
    const first = move.toDays[0]!;
    const last = move.toDays[move.toDays.length - 1]!;
    const dates = first === move.fromDays[0]
      ? `same start, now expected to finish on ${when(last)}`
      : first === last ? `now on ${when(first)}` : `now starting on ${when(first)} and expected to finish on ${when(last)}`;
    return `- ${job.reference}, ${job.title.toLowerCase()} at ${formatAddress(job.site)}: ${dates}.`;
  });
  return [
    `Dear ${client.contactName ?? client.name},`,
    why,
    lines.join('\n'),
    'We will keep you posted if the forecast changes again.',
    `With thanks for your patience,\n${firm.name}${firm.phone ? `\n${firm.phone}` : ''}`,
  ].join('\n\n');
}

/** "J-1", "J-1 and J-2", "J-1, J-2 and J-3". */
function listInWords(items: string[]): string {
  return items.length <= 1 ? items.join('') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** What a commit compares with the preview it was shown: every job's days and every booking's dates it would change. */
function planKeyOf(plan: Pick<ReplanPreviewDto, 'mode' | 'moves' | 'accessChanges'>): string {
  const canonical = JSON.stringify([
    plan.mode,
    plan.moves.map((m) => [m.jobId, m.fromCrewId, m.toCrewId, m.fromDays, m.toDays]),
    plan.accessChanges.map((c) => [c.bookingId, c.effect, c.fromErect, c.fromStrike, c.toErect, c.toStrike]),
  ]);
  return createHash('sha256').update(canonical).digest('base64url');
}

function toLimitsDto(row: FirmWeatherLimits | null): WeatherLimitsDto {
  const { settings, overrides, ignored } = firmRuleSettings(row?.overrides);
  return { overrides, effective: settings, ignored, version: row?.version ?? 0, updatedAt: row?.updatedAt.toISOString() ?? null };
}
