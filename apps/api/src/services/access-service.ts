import { Between, In, type DataSource, type EntityManager } from 'typeorm';
import {
  accessTypeLabels,
  accessWindowFor,
  addDays,
  addWorkingDays,
  dayRangeLabel,
  firmRuleSettings,
  hireCost,
  inspectionRecordsKeptUntil,
  inspectionsDue,
  quotedHireWeeks,
  shortDayLabel,
  windStopDays,
  type AccessType,
  type Activity,
  type AccessBandDto,
  type AccessBookingDto,
  type AccessBookingValues,
  type AccessCancelReason,
  type AccessChangeRequestDto,
  type AccessState,
  type BoardJobDto,
  type ConflictDto,
  type HandoverDto,
  type HireCostDto,
  type InspectionStatusDto,
  type PhotoDto,
  type QuotedHireWeeksDto,
  type ScaffoldInspectionDto,
  type SupplierDto,
  type SupplierLinkDto,
  type SupplierValues,
} from '@hodboard/shared';
import type { z } from 'zod';
import type { accessStateChangeSchema, handoverUpdateSchema, inspectionInputSchema, supplierResponseSchema } from '@hodboard/shared';
import {
  AccessBooking, AccessChangeRequest, Assignment, Firm, FirmWeatherLimits, ForecastHourRow, Job, Photo, Quote, QuoteVersion, ScaffoldInspection, Site, Supplier, User, WeatherHold,
} from '../entities/index.js';
import type { PlacedAssignment } from './schedule-service.js';
import { AppError, errors } from '../errors.js';
import type { Clock } from '../lib/clock.js';
import type { EventBus } from '../lib/event-bus.js';
import { todayIn } from '../lib/today.js';
import { hashToken, newOpaqueToken } from '../lib/tokens.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { escapeHtml } from './auth-service.js';
import { queriesOf } from '../lib/queries-of.js';
import { loadCalendars, type FirmCalendars } from './calendar-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';
import { renderInspectionPdf } from './inspection-pdf.js';
import type { Mailer, MailMessage } from './mailer.js';
import type { PhotoService } from './photo-service.js';
import { formatAddress } from './site-service.js';
import { toForecastHour } from './weather/forecast-service.js';

type StateChange = z.output<typeof accessStateChangeSchema>;
type HandoverUpdate = z.output<typeof handoverUpdateSchema>;
type InspectionValues = z.output<typeof inspectionInputSchema>;
type SupplierAnswer = z.output<typeof supplierResponseSchema>;

/** Work that must wait until the transaction has committed, such as e-mail. */
export type AfterCommit = () => Promise<void>;

const LINK_TTL_MS = 14 * 24 * 3_600_000;
const LIVE_STATES: ReadonlySet<AccessState> = new Set(['requested', 'confirmed', 'erected']);
/** Only dates agreed with the supplier can be changed by the supplier's answer. */
const ANSWERABLE_STATES: ReadonlySet<AccessState> = new Set(['confirmed', 'erected']);
const HEIGHT_ACCESS = new Set(['scaffold', 'tower', 'mewp', 'edge-protection']);
/** The wind limits that count as adverse weather for each kind of access standing on site. */
const EXPOSED_ACTIVITY: Record<AccessType, Activity> = {
  scaffold: 'work-at-height', 'edge-protection': 'work-at-height', 'roof-ladder': 'work-at-height', tower: 'tower', mewp: 'mewp',
};
/** Stored forecasts reach about 8 days ahead; a forecast gale inside them brings the next inspection forward. */
const FORECAST_AHEAD_DAYS = 9;

export interface Window {
  erect: string;
  strike: string;
}

export class AccessService {
  private readonly adverseMemo = new WeakMap<FirmCalendars, Map<string, Promise<string[] | undefined>>>();
  private readonly liveMemo = new WeakMap<FirmCalendars, Promise<AccessBooking[]>>();

  constructor(
    private readonly dataSource: DataSource,
    private readonly mailer: Mailer,
    private readonly events: EventBus,
    private readonly clock: Clock,
    private readonly appUrl: string,
    private readonly photos: PhotoService,
  ) {}

  async listSuppliers(actor: Actor): Promise<SupplierDto[]> {
    requirePermission(actor, 'access:read');
    const rows = await new FirmScope(this.dataSource.manager, actor.firmId).find(Supplier, { order: { name: 'ASC' } });
    return rows.map(toSupplierDto);
  }

  async createSupplier(actor: Actor, input: SupplierValues): Promise<SupplierDto> {
    requirePermission(actor, 'access:manage');
    const supplier = await this.dataSource.transaction(async (manager) => {
      const created = await manager.save(new FirmScope(manager, actor.firmId).create(Supplier, input));
      await recordAudit(manager, actor, { entity: 'supplier', entityId: created.id, action: 'created', after: created });
      return created;
    });
    return toSupplierDto(supplier);
  }

  async updateSupplier(actor: Actor, id: string, input: SupplierValues & { version?: number }): Promise<SupplierDto> {
    requirePermission(actor, 'access:manage');
    const { version, ...values } = input;
    const supplier = await this.dataSource.transaction(async (manager) => {
      const existing = await new FirmScope(manager, actor.firmId).lockForUpdate(Supplier, id, 'Supplier');
      assertVersion(existing, version, 'This supplier');
      const before = { ...existing };
      const saved = await manager.save(Object.assign(existing, values));
      await recordAudit(manager, actor, { entity: 'supplier', entityId: id, action: 'updated', before, after: saved });
      return saved;
    });
    return toSupplierDto(supplier);
  }

  async removeSupplier(actor: Actor, id: string): Promise<void> {
    requirePermission(actor, 'access:manage');
    await this.dataSource.transaction(async (manager) => {
      const existing = await new FirmScope(manager, actor.firmId).lockForUpdate(Supplier, id, 'Supplier');
      if (await manager.existsBy(AccessBooking, { supplierId: id, firmId: actor.firmId })) {
        throw errors.conflict('This supplier has bookings; cancel them first.');
      }
      await manager.delete(Supplier, { id, firmId: actor.firmId });
      await recordAudit(manager, actor, { entity: 'supplier', entityId: id, action: 'deleted', before: existing });
    });
  }

  /** The bookings the actor may see; `jobIds` (any of them) and `id` narrow it for callers inside the API. */
  async list(actor: Actor, query: { jobId?: string; state?: AccessState; jobIds?: string[]; id?: string }): Promise<AccessBookingDto[]> {
    requirePermission(actor, 'access:read');
    const manager = this.dataSource.manager;
    const builder = new FirmScope(manager, actor.firmId).query(AccessBooking, 'b').innerJoinAndSelect('b.supplier', 'supplier').orderBy('b.created_at', 'DESC');
    if (query.jobId) builder.andWhere(':jobId = ANY(b.job_ids)', { jobId: query.jobId });
    if (query.jobIds) builder.andWhere('b.job_ids && :jobIds::uuid[]', { jobIds: query.jobIds });
    if (query.id) builder.andWhere('b.id = :id', { id: query.id });
    if (query.state) builder.andWhere('b.state = :state', { state: query.state });
    if (!['owner', 'office'].includes(actor.role)) {
      const ownJobs = await this.jobsOfCrews(manager, actor);
      if (ownJobs.length === 0) return [];
      builder.andWhere('b.job_ids && :ownJobs::uuid[]', { ownJobs });
    }
    const bookings = await builder.getMany();
    const calendars = await loadCalendars(manager, actor.firmId);
    return this.toDtos(manager, actor.firmId, bookings, calendars);
  }

  async get(actor: Actor, id: string): Promise<AccessBookingDto> {
    requirePermission(actor, 'access:read');
    const [found] = await this.list(actor, { id });
    if (!found) throw errors.notFound('Access booking');
    return found;
  }

  async create(actor: Actor, input: AccessBookingValues): Promise<AccessBookingDto> {
    requirePermission(actor, 'access:manage');
    const booking = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const supplier = await scope.get(Supplier, input.supplierId, 'Supplier');
      await scope.assertAllExist(Job, input.jobIds, 'Job');
      // One scaffold serves neighbouring jobs at one site; jobs at different sites need a booking each.
      const sites = new Set((await scope.find(Job, { where: { id: In(input.jobIds) }, select: { id: true, firmId: true, siteId: true } })).map((job) => job.siteId));
      if (sites.size > 1) throw errors.validation([{ path: 'jobIds', message: 'Jobs sharing a booking must be at the same site; book access for each site separately' }]);
      const calendars = await loadCalendars(manager, actor.firmId);
      const needed = await this.neededWindow(manager, actor.firmId, input.jobIds, input.curingDays, calendars);
      const erect = input.requestedErect ?? needed?.erect ?? null;
      const strike = input.requestedStrike ?? needed?.strike ?? null;
      if (erect && strike && strike < erect) throw errors.validation([{ path: 'requestedStrike', message: 'The strike date must be after the erect date' }]);
      const weeklyRate = input.weeklyRate ?? supplier.weeklyRates[input.accessType] ?? 0;
      const minimumWeeks = input.minimumWeeks ?? supplier.minimumWeeks;
      const pricedWeeks = input.pricedWeeks
        ?? (await this.quotedWeeks(manager, actor.firmId, input.jobIds, input.accessType)).pricedWeeks
        ?? (erect && strike ? hireCost({ erectBy: erect, strikeFrom: strike }, { weeklyRate, minimumWeeks }).chargedWeeks : null);
      const created = await manager.save(scope.create(AccessBooking, {
        jobIds: [...new Set(input.jobIds)], accessType: input.accessType, supplierId: supplier.id, state: 'requested',
        requestedErect: erect, requestedStrike: strike, confirmedErect: null, confirmedStrike: null, erectedOn: null, struckOn: null,
        weeklyRate, minimumWeeks, pricedWeeks, curingDays: input.curingDays, reference: input.reference, notes: input.notes,
      }));
      await recordAudit(manager, actor, { entity: 'access-booking', entityId: created.id, action: 'created', after: created });
      return created;
    });
    this.publish(actor.firmId, 'access:created', booking);
    return this.get(actor, booking.id);
  }

  /** What a new booking for these jobs would take as its weeks priced, for the booking form to show before it is sent. */
  async quotedHireWeeks(actor: Actor, jobIds: string[], accessType: AccessType): Promise<QuotedHireWeeksDto> {
    requirePermission(actor, 'access:manage');
    const manager = this.dataSource.manager;
    await new FirmScope(manager, actor.firmId).assertAllExist(Job, jobIds, 'Job');
    return this.quotedWeeks(manager, actor.firmId, jobIds, accessType);
  }

  /**
   * The weeks of this kind of access priced in the jobs' accepted quotes, summed over the jobs (neighbouring jobs
   * sharing one scaffold each paid for their part of it); null when none of them priced it.
   */
  private async quotedWeeks(manager: EntityManager, firmId: string, jobIds: string[], accessType: AccessType): Promise<QuotedHireWeeksDto> {
    const quotes = (await new FirmScope(manager, firmId)
      .query(Quote, 'quote')
      .innerJoinAndMapOne('quote.current', QuoteVersion, 'current', 'current.id = quote.current_version_id')
      .andWhere("quote.status = 'accepted'")
      .andWhere('quote.job_id IN (:...jobIds)', { jobIds: [...new Set(jobIds)] })
      .orderBy('quote.reference', 'ASC')
      .getMany()) as Array<Quote & { current: QuoteVersion }>;
    let pricedWeeks: number | null = null;
    const quoteReferences: string[] = [];
    for (const quote of quotes) {
      const weeks = quotedHireWeeks(quote.current.content, accessType);
      if (weeks === null) continue;
      pricedWeeks = (pricedWeeks ?? 0) + weeks;
      quoteReferences.push(quote.reference);
    }
    return { pricedWeeks, quoteReferences };
  }

  async changeState(actor: Actor, id: string, input: StateChange): Promise<AccessBookingDto> {
    requirePermission(actor, 'access:manage');
    const booking = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const booking = await scope.lockForUpdate(AccessBooking, id, 'Access booking');
      assertVersion(booking, input.version, 'This booking');
      const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
      const today = todayIn(firm.timeZone, this.clock());
      const allowed: Record<AccessState, AccessState[]> = {
        requested: ['confirmed', 'cancelled'], confirmed: ['erected', 'requested', 'cancelled'], erected: ['struck'], struck: [], cancelled: ['requested'],
      };
      if (!allowed[booking.state].includes(input.state)) {
        throw errors.illegalTransition(`A booking that is ${booking.state} cannot become ${input.state}.`);
      }
      const before = { ...booking };
      const wasAgreed = booking.state === 'confirmed';
      booking.state = input.state;
      booking.cancelledReason = null;
      if (input.state === 'requested') {
        // A request follows its jobs, so one made again asks for the window they need now.
        const needed = await this.neededWindow(manager, actor.firmId, booking.jobIds, booking.curingDays, await loadCalendars(manager, actor.firmId));
        if (needed) Object.assign(booking, { requestedErect: needed.erect, requestedStrike: needed.strike });
      }
      if (input.state === 'confirmed') {
        booking.confirmedErect = input.confirmedErect ?? booking.requestedErect;
        booking.confirmedStrike = input.confirmedStrike ?? booking.requestedStrike;
        if (!booking.confirmedErect || !booking.confirmedStrike) {
          throw errors.validation([{ path: 'confirmedErect', message: 'Give the confirmed erect and strike dates' }]);
        }
      }
      if (input.state === 'erected') {
        booking.erectedOn = today;
        if (input.handover) applyHandover(booking, input.handover, today);
      }
      if (input.state === 'struck') booking.struckOn = today;
      const saved = await manager.save(booking);
      // Dates asked of the supplier mean nothing once the booking is no longer agreed with them.
      if (!ANSWERABLE_STATES.has(input.state)) await this.closeOpenRequests(manager, id, 'withdrawn');
      await recordAudit(manager, actor, { entity: 'access-booking', entityId: id, action: `state-${input.state}`, before, after: saved });
      // The supplier holds agreed dates for a confirmed booking, so its cancellation is put to them in writing.
      const notice = wasAgreed && input.state === 'cancelled' ? await this.cancellationMail(manager, saved) : null;
      return { saved, notice };
    });
    this.publish(actor.firmId, 'access:updated', booking.saved);
    // Committed already: a mail that fails to go must not turn the cancellation into an error.
    if (booking.notice) await this.mailer.send(booking.notice).catch(() => undefined);
    return this.get(actor, id);
  }

  /** Records, or corrects, the supplier's handover of access that is up or has since been struck. */
  async recordHandover(actor: Actor, id: string, input: HandoverUpdate): Promise<AccessBookingDto> {
    requirePermission(actor, 'access:manage');
    const { version, ...handover } = input;
    const booking = await this.dataSource.transaction(async (manager) => {
      const booking = await new FirmScope(manager, actor.firmId).lockForUpdate(AccessBooking, id, 'Access booking');
      assertVersion(booking, version, 'This booking');
      if (booking.state !== 'erected' && booking.state !== 'struck') throw errors.conflict('Record the handover once the access is up.');
      const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
      const before = handoverOf(booking);
      applyHandover(booking, handover, todayIn(firm.timeZone, this.clock()));
      const saved = await manager.save(booking);
      await recordAudit(manager, actor, { entity: 'access-booking', entityId: id, action: 'handover-recorded', before, after: handoverOf(saved) });
      return saved;
    });
    this.publish(actor.firmId, 'access:updated', booking);
    return this.get(actor, id);
  }

  async recordInspection(actor: Actor, bookingId: string, input: InspectionValues): Promise<ScaffoldInspectionDto> {
    requirePermission(actor, 'inspections:record');
    const photoIds = [...new Set(input.photoIds)];
    const inspection = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const booking = await scope.lockForUpdate(AccessBooking, bookingId, 'Access booking');
      if (!['owner', 'office'].includes(actor.role)) {
        const ownJobs = await this.jobsOfCrews(manager, actor);
        if (!booking.jobIds.some((jobId) => ownJobs.includes(jobId))) throw errors.notFound('Access booking');
      }
      if (booking.state !== 'erected') throw errors.conflict('Record inspections once the access is up.');
      const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
      const inspectedAt = new Date(input.inspectedAt);
      if (inspectedAt.getTime() > this.clock().getTime() + 5 * 60_000) {
        throw errors.validation([{ path: 'inspectedAt', message: 'An inspection cannot be in the future' }]);
      }
      if (photoIds.length > 0) {
        const found = await scope.find(Photo, { where: { id: In(photoIds), jobId: In(booking.jobIds) }, select: { id: true, firmId: true } });
        const missing = photoIds.filter((id) => !found.some((photo) => photo.id === id));
        if (missing.length) {
          throw errors.validation([{ path: 'photoIds', message: `${missing.length === 1 ? 'A photo was' : `${missing.length} photos were`} not found among this booking's job photos; upload them again` }]);
        }
      }
      const saved = await manager.save(scope.create(ScaffoldInspection, {
        bookingId, inspectedAt, inspectedOn: todayIn(firm.timeZone, inspectedAt), inspectorName: input.inspectorName,
        result: input.result, defects: input.defects, notes: input.notes, photoIds, recordedBy: actor.userId,
      }));
      await recordAudit(manager, actor, { entity: 'access-booking', entityId: bookingId, action: 'inspected', after: saved });
      return { saved, booking, today: todayIn(firm.timeZone, this.clock()) };
    });
    this.publish(actor.firmId, 'access:updated', inspection.booking);
    const [dto] = await this.inspectionDtos(actor, inspection.booking, [inspection.saved], inspection.today);
    return dto!;
  }

  async listInspections(actor: Actor, bookingId: string): Promise<ScaffoldInspectionDto[]> {
    await this.get(actor, bookingId);
    const manager = this.dataSource.manager;
    const scope = new FirmScope(manager, actor.firmId);
    const booking = await scope.get(AccessBooking, bookingId, 'Access booking');
    const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
    const rows = await scope.find(ScaffoldInspection, { where: { bookingId }, order: { inspectedAt: 'DESC' } });
    return this.inspectionDtos(actor, booking, rows, todayIn(firm.timeZone, this.clock()));
  }

  /**
   * Records are kept while the access is up and for the retention period after it is struck; inside it a
   * discard is refused so the register stays whole for anyone who asks to see it.
   */
  async discardInspection(actor: Actor, bookingId: string, inspectionId: string): Promise<void> {
    requirePermission(actor, 'access:manage');
    const booking = await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const booking = await scope.lockForUpdate(AccessBooking, bookingId, 'Access booking');
      const inspection = await scope.get(ScaffoldInspection, inspectionId, 'Inspection');
      if (inspection.bookingId !== booking.id) throw errors.notFound('Inspection');
      const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
      const today = todayIn(firm.timeZone, this.clock());
      const { keepUntil, source } = inspectionRecordsKeptUntil(booking.struckOn);
      if (keepUntil === null || today <= keepUntil) {
        throw new AppError('conflict', 409,
          keepUntil === null
            ? 'Inspection records are kept for as long as the access is up, and for 3 months after it is struck: this one cannot be discarded yet.'
            : `Inspection records are kept until ${keepUntil}, 3 months after the access was struck: this one cannot be discarded before then.`,
          undefined, { keepUntil, source });
      }
      await manager.delete(ScaffoldInspection, { id: inspection.id, firmId: actor.firmId });
      await recordAudit(manager, actor, { entity: 'access-booking', entityId: bookingId, action: 'inspection-discarded', before: inspection });
      return booking;
    });
    this.publish(actor.firmId, 'access:updated', booking);
  }

  /** The booking's inspection register as a PDF, for the site file or anyone entitled to see it. */
  async inspectionReport(actor: Actor, bookingId: string): Promise<{ filename: string; body: Buffer }> {
    const dto = await this.get(actor, bookingId);
    const manager = this.dataSource.manager;
    const scope = new FirmScope(manager, actor.firmId);
    const booking = await scope.get(AccessBooking, bookingId, 'Access booking');
    const [firm, supplier, jobs, rows] = await Promise.all([
      manager.findOneByOrFail(Firm, { id: actor.firmId }),
      scope.get(Supplier, booking.supplierId, 'Supplier'),
      scope.find(Job, { where: { id: In(booking.jobIds) }, relations: { site: true }, order: { reference: 'ASC' } }),
      scope.find(ScaffoldInspection, { where: { bookingId }, order: { inspectedAt: 'ASC' } }),
    ]);
    const names = await this.userNames(manager, rows);
    const retention = inspectionRecordsKeptUntil(booking.struckOn);
    const sites = [...new Set(jobs.map((job) => formatAddress(job.site)))];
    const body = await renderInspectionPdf({
      firm: { name: firm.name, email: firm.email, phone: firm.phone, address: firm.address, timeZone: firm.timeZone },
      siteAddress: sites.join('; ') || 'Site not recorded',
      jobs: jobs.map((job) => `${job.reference} ${job.title}`).join('; '),
      equipment: accessTypeLabels[booking.accessType], supplier: supplier.name, reference: booking.reference,
      erectedOn: booking.erectedOn, struckOn: booking.struckOn, handover: handoverOf(booking), keepUntil: retention.keepUntil, retentionSource: retention.source,
      adverseDays: dto.inspection.adverseDays.filter((day) => day <= todayIn(firm.timeZone, this.clock())),
      generatedAt: this.clock(),
      records: rows.map((row) => ({
        inspectedAt: row.inspectedAt, inspectorName: row.inspectorName, result: row.result, defects: row.defects, notes: row.notes,
        recordedBy: row.recordedBy ? names.get(row.recordedBy) ?? null : null, photoCount: row.photoIds.length,
      })),
    });
    const slug = `${jobs[0]?.reference ?? 'booking'}-${booking.accessType}`.replace(/[^A-Za-z0-9-]+/g, '-');
    return { filename: `inspections-${slug}.pdf`, body };
  }

  /**
   * Called inside a schedule change's transaction, once the moved jobs' days are saved. A booking still only
   * requested follows the jobs' new window; a confirmed or erected one gets one change request for the supplier,
   * mailed after commit.
   */
  async onScheduleChanged(manager: EntityManager, actor: Actor, jobIds: string[], calendars: FirmCalendars): Promise<AfterCommit[]> {
    const scope = new FirmScope(manager, actor.firmId);
    const afterCommit: AfterCommit[] = await this.cancelRequestsWithoutWork(manager, actor, jobIds);
    for (const { booking, effect, wanted } of await this.accessChangesFor(manager, actor.firmId, jobIds, calendars, new Map(), true)) {
      if (effect === 'follows') {
        const before = { requestedErect: booking.requestedErect, requestedStrike: booking.requestedStrike };
        booking.requestedErect = wanted.erect;
        booking.requestedStrike = wanted.strike;
        await manager.save(booking);
        await recordAudit(manager, actor, { entity: 'access-booking', entityId: booking.id, action: 'followed-job', before, after: wanted });
        afterCommit.push(async () => this.publish(actor.firmId, 'access:updated', booking));
        continue;
      }
      if (effect === 'settles') {
        await this.supersedePending(manager, booking.id);
        continue;
      }
      // An earlier counter-proposal is settled by this newer request, so it must not show again once this one is answered.
      await this.closeOpenRequests(manager, booking.id, 'superseded');
      const token = newOpaqueToken();
      const request = await manager.save(scope.create(AccessChangeRequest, {
        bookingId: booking.id, status: 'pending', oldErect: booking.confirmedErect, oldStrike: booking.confirmedStrike,
        newErect: wanted.erect, newStrike: wanted.strike, counterErect: null, counterStrike: null, supplierNote: null,
        tokenHash: hashToken(token), expiresAt: new Date(this.clock().getTime() + LINK_TTL_MS), answeredAt: null,
      }));
      await recordAudit(manager, actor, { entity: 'access-booking', entityId: booking.id, action: 'change-requested', before: { erect: booking.confirmedErect, strike: booking.confirmedStrike }, after: wanted });
      const message = await this.changeRequestMail(manager, booking, request, token);
      afterCommit.push(async () => {
        if (message) await this.mailer.send(message);
        this.publish(actor.firmId, 'access:change-requested', booking);
      });
    }
    return afterCommit;
  }

  /**
   * What a change to these jobs' days does to their live bookings. Each booking's window is worked out over the days
   * of every job on it: `projected` gives the days a re-plan would move jobs to, the board gives the rest. The re-plan
   * preview and the commit (through onScheduleChanged, after the moves are saved) both decide here, so they agree.
   */
  async accessChangesFor(
    manager: EntityManager, firmId: string, jobIds: string[], calendars: FirmCalendars,
    projected: ReadonlyMap<string, readonly string[]> = new Map(), lock = false,
  ): Promise<AccessChangePlan[]> {
    if (jobIds.length === 0) return [];
    const query = new FirmScope(manager, firmId)
      .query(AccessBooking, 'b')
      .andWhere('b.job_ids && :jobIds::uuid[]', { jobIds: [...new Set(jobIds)] })
      .andWhere('b.state IN (:...states)', { states: [...LIVE_STATES] })
      .orderBy('b.createdAt', 'ASC')
      .addOrderBy('b.id', 'ASC');
    if (lock) query.setLock('pessimistic_write');
    const bookings = await query.getMany();
    if (bookings.length === 0) return [];
    const [daysOf, pending] = await queriesOf(manager, [
      () => this.jobDays(manager, firmId, bookings.flatMap((b) => b.jobIds), projected),
      () => manager.find(AccessChangeRequest, { where: { firmId, bookingId: In(bookings.map((b) => b.id)), status: 'pending' } }),
    ] as const);
    const plans: AccessChangePlan[] = [];
    for (const booking of bookings) {
      const needed = windowOver(booking.jobIds.flatMap((id) => daysOf.get(id) ?? []), booking.curingDays, calendars);
      if (!needed) continue;
      if (booking.state === 'requested') {
        if (booking.requestedErect !== needed.erect || booking.requestedStrike !== needed.strike) plans.push({ booking, effect: 'follows', wanted: needed });
        continue;
      }
      // Once up, the erect date is history: only the strike can move.
      const wanted: Window = booking.state === 'erected' ? { erect: booking.erectedOn ?? booking.confirmedErect!, strike: needed.strike } : needed;
      if (booking.confirmedErect === wanted.erect && booking.confirmedStrike === wanted.strike) {
        plans.push({ booking, effect: 'settles', wanted });
        continue;
      }
      const asked = pending.find((request) => request.bookingId === booking.id);
      if (asked && asked.newErect === wanted.erect && asked.newStrike === wanted.strike) continue;
      plans.push({ booking, effect: 'asks-supplier', wanted });
    }
    return plans;
  }

  /**
   * Called inside the transaction that cancels a job. A booking shared with other jobs drops the job and follows the
   * rest; one that served only this job is cancelled, and its supplier told if the dates were agreed. One already up
   * stays as it is, flagged, until the office has it struck.
   */
  async onJobCancelled(manager: EntityManager, actor: Actor, jobId: string, calendars: FirmCalendars): Promise<AfterCommit[]> {
    const bookings = await new FirmScope(manager, actor.firmId)
      .query(AccessBooking, 'b')
      .andWhere(':jobId = ANY(b.job_ids)', { jobId })
      .andWhere('b.state IN (:...states)', { states: [...LIVE_STATES] })
      .setLock('pessimistic_write')
      .getMany();
    const afterCommit: AfterCommit[] = [];
    const stillNeededBy = new Set<string>();
    for (const booking of bookings) {
      const others = booking.jobIds.filter((id) => id !== jobId);
      if (others.length > 0) {
        const before = { jobIds: booking.jobIds };
        booking.jobIds = others;
        await manager.save(booking);
        await recordAudit(manager, actor, { entity: 'access-booking', entityId: booking.id, action: 'job-cancelled', before, after: { jobIds: others } });
        others.forEach((id) => stillNeededBy.add(id));
        afterCommit.push(async () => this.publish(actor.firmId, 'access:updated', booking));
      } else if (booking.state !== 'erected') {
        afterCommit.push(await this.cancelForLostWork(manager, actor, booking, 'job-cancelled'));
      }
    }
    if (stillNeededBy.size > 0) afterCommit.push(...(await this.onScheduleChanged(manager, actor, [...stillNeededBy], calendars)));
    return afterCommit;
  }

  /** Requested bookings none of whose jobs has days on the board any more: nothing was agreed, so they lapse. */
  private async cancelRequestsWithoutWork(manager: EntityManager, actor: Actor, jobIds: string[]): Promise<AfterCommit[]> {
    if (jobIds.length === 0) return [];
    const requested = await new FirmScope(manager, actor.firmId)
      .query(AccessBooking, 'b')
      .andWhere('b.job_ids && :jobIds::uuid[]', { jobIds: [...new Set(jobIds)] })
      .andWhere("b.state = 'requested'")
      .setLock('pessimistic_write')
      .getMany();
    if (requested.length === 0) return [];
    const daysOf = await this.jobDays(manager, actor.firmId, requested.flatMap((b) => b.jobIds));
    const afterCommit: AfterCommit[] = [];
    for (const booking of requested) {
      if (booking.jobIds.some((id) => (daysOf.get(id) ?? []).length > 0)) continue;
      afterCommit.push(await this.cancelForLostWork(manager, actor, booking, 'job-unscheduled'));
    }
    return afterCommit;
  }

  private async cancelForLostWork(manager: EntityManager, actor: Actor, booking: AccessBooking, reason: AccessCancelReason): Promise<AfterCommit> {
    const before = { state: booking.state };
    const wasAgreed = booking.state === 'confirmed';
    booking.state = 'cancelled';
    booking.cancelledReason = reason;
    await manager.save(booking);
    await this.closeOpenRequests(manager, booking.id, 'withdrawn');
    await recordAudit(manager, actor, { entity: 'access-booking', entityId: booking.id, action: 'cancelled-with-job', before, after: { state: 'cancelled', reason } });
    const notice = wasAgreed ? await this.cancellationMail(manager, booking) : null;
    return async () => {
      this.publish(actor.firmId, 'access:updated', booking);
      if (notice) await this.mailer.send(notice);
    };
  }

  /** What a supplier sees behind the link in their e-mail; no sign-in, only this one request. */
  async supplierLink(token: string): Promise<SupplierLinkDto> {
    const { request, booking } = await this.requestForToken(this.dataSource.manager, token);
    const [firm, supplier, jobs] = await Promise.all([
      this.dataSource.manager.findOneByOrFail(Firm, { id: booking.firmId }),
      this.dataSource.manager.findOneByOrFail(Supplier, { id: booking.supplierId }),
      this.dataSource.manager.find(Job, { where: { id: In(booking.jobIds), firmId: booking.firmId }, relations: { site: true }, order: { reference: 'ASC' } }),
    ]);
    return {
      firmName: firm.name, supplierName: supplier.name, accessType: booking.accessType,
      jobReferences: jobs.map((job) => job.reference), siteAddress: jobs[0] ? formatAddress(jobs[0].site) : '',
      oldErect: request.oldErect, oldStrike: request.oldStrike, newErect: request.newErect, newStrike: request.newStrike,
      status: request.status, expiresAt: request.expiresAt.toISOString(),
    };
  }

  async answerSupplierLink(token: string, answer: SupplierAnswer): Promise<SupplierLinkDto> {
    const booking = await this.dataSource.transaction(async (manager) => {
      const { request, booking } = await this.requestForToken(manager, token, true);
      if (request.status === 'withdrawn' || !ANSWERABLE_STATES.has(booking.state)) throw errors.conflict(noLongerAnswerable(booking.state));
      if (request.status !== 'pending') throw errors.tokenInvalid('This link has already been answered.');
      const firm = await manager.findOneByOrFail(Firm, { id: booking.firmId });
      const supplier = await manager.findOneByOrFail(Supplier, { id: booking.supplierId });
      const actor = { firmId: booking.firmId, userId: null as unknown as string };
      const before = { confirmedErect: booking.confirmedErect, confirmedStrike: booking.confirmedStrike };
      request.answeredAt = this.clock();
      if (answer.answer === 'accept') {
        request.status = 'accepted';
        booking.confirmedErect = request.newErect;
        booking.confirmedStrike = request.newStrike;
      } else {
        request.status = 'countered';
        request.counterErect = answer.erectDate;
        request.counterStrike = answer.strikeDate;
        request.supplierNote = answer.note;
        booking.confirmedErect = booking.state === 'erected' ? booking.confirmedErect : answer.erectDate;
        booking.confirmedStrike = answer.strikeDate;
      }
      await manager.save(request);
      await manager.save(booking);
      await recordAudit(manager, { firmId: actor.firmId, userId: actor.userId }, {
        entity: 'access-booking', entityId: booking.id, action: `supplier-${request.status}`,
        before, after: { confirmedErect: booking.confirmedErect, confirmedStrike: booking.confirmedStrike, by: supplier.name, note: request.supplierNote },
      });
      void firm;
      return booking;
    });
    this.publish(booking.firmId, 'access:answered', booking);
    return this.supplierLink(token);
  }

  /** Conflicts the access bookings add to the board for the given placed jobs. */
  async conflictsFor(manager: EntityManager, firmId: string, assignments: PlacedAssignment[], jobs: BoardJobDto[], calendars: FirmCalendars): Promise<ConflictDto[]> {
    if (assignments.length === 0) return [];
    const bookings = await this.liveBookingsOf(manager, firmId, assignments.map((a) => a.jobId), calendars);
    if (bookings.length === 0) return [];
    const today = todayIn(calendars.timeZone, this.clock());
    const inspections = await this.inspectionsByBooking(manager, firmId, bookings.map((b) => b.id));
    const adverse = await this.adverseDaysFor(manager, firmId, bookings, calendars, today);
    const references = new Map(jobs.map((job) => [job.id, job.reference]));
    const conflicts: ConflictDto[] = [];
    for (const booking of bookings) {
      const label = accessTypeLabels[booking.accessType].toLowerCase();
      const window = currentWindow(booking);
      const status = inspectionStatus(booking, inspections.get(booking.id) ?? [], today, adverse.get(booking.id));
      for (const assignment of assignments.filter((a) => booking.jobIds.includes(a.jobId))) {
        const base = { assignmentId: assignment.id, jobId: assignment.jobId, crewId: assignment.crewId };
        if (window) {
          const outside = assignment.days.filter((day) => day < window.erect || day >= window.strike);
          for (const date of outside) {
            conflicts.push({ ...base, kind: 'outside-access-window', date, severity: 'warning', message: `Outside the ${label} booking (${dayRangeLabel(window.erect, window.strike)})` });
          }
        }
        if (booking.state === 'requested' && window) {
          const confirmBy = addWorkingDays(window.erect, -booking.supplier.leadTimeWorkingDays, calendars.firmCalendar);
          if (today >= confirmBy) {
            conflicts.push({ ...base, kind: 'access-not-confirmed', date: null, severity: 'warning',
              message: `${accessTypeLabels[booking.accessType]} not confirmed; ${booking.supplier.name} needs ${booking.supplier.leadTimeWorkingDays} working days' notice (by ${shortDayLabel(confirmBy)})` });
          }
        }
        const hire = hireFor(booking);
        if (hire && hire.overPricedPence > 0) {
          conflicts.push({ ...base, kind: 'hire-extended', date: null, severity: 'warning',
            message: `Hire now ${hire.chargedWeeks} weeks, ${hire.chargedWeeks - (hire.pricedWeeks ?? 0)} more than priced: ${formatPounds(hire.overPricedPence)} extra` });
        }
        if (booking.state === 'erected' && HEIGHT_ACCESS.has(booking.accessType)) {
          const workToday = assignment.days.includes(today);
          if (workToday && (status.status === 'overdue' || status.status === 'due' || status.status === 'unsafe')) {
            conflicts.push({ ...base, kind: 'inspection-overdue', date: today, severity: 'stop',
              message: status.status === 'unsafe'
                ? `Last ${label} inspection found it not safe to use: no work at height until a competent person passes it`
                : `${accessTypeLabels[booking.accessType]} inspection ${status.status === 'due' ? 'due' : 'overdue'} (${status.nextDue ? shortDayLabel(status.nextDue) : 'now'}): a competent person must inspect it before work at height` });
          } else if (status.nextDue) {
            const nextWorkDay = assignment.days.find((day) => day > today && day >= status.nextDue!);
            if (nextWorkDay) {
              conflicts.push({ ...base, kind: 'inspection-overdue', date: nextWorkDay, severity: 'warning',
                message: `${accessTypeLabels[booking.accessType]} inspection due by ${shortDayLabel(status.nextDue)} (${references.get(assignment.jobId) ?? 'job'})` });
            }
          }
        }
      }
    }
    return conflicts;
  }

  async bandsFor(manager: EntityManager, firmId: string, jobIds: string[], calendars: FirmCalendars): Promise<AccessBandDto[]> {
    if (jobIds.length === 0) return [];
    const bookings = await this.liveBookingsOf(manager, firmId, jobIds, calendars);
    const inspections = await this.inspectionsByBooking(manager, firmId, bookings.map((b) => b.id));
    const today = todayIn(calendars.timeZone, this.clock());
    const adverse = await this.adverseDaysFor(manager, firmId, bookings, calendars, today);
    return bookings.flatMap((booking) => {
      const window = currentWindow(booking);
      if (!window) return [];
      return [{
        bookingId: booking.id, jobIds: booking.jobIds, accessType: booking.accessType, state: booking.state,
        erect: window.erect, strike: window.strike, inspection: inspectionStatus(booking, inspections.get(booking.id) ?? [], today, adverse.get(booking.id)).status,
      }];
    });
  }

  private async neededWindow(manager: EntityManager, firmId: string, jobIds: string[], curingDays: number, calendars: FirmCalendars): Promise<Window | null> {
    const daysOf = await this.jobDays(manager, firmId, jobIds);
    return windowOver(jobIds.flatMap((id) => daysOf.get(id) ?? []), curingDays, calendars);
  }

  /** Each job's days on the board, or where `projected` puts it. */
  private async jobDays(manager: EntityManager, firmId: string, jobIds: string[], projected: ReadonlyMap<string, readonly string[]> = new Map()): Promise<Map<string, readonly string[]>> {
    const unplanned = [...new Set(jobIds)].filter((id) => !projected.has(id));
    const assignments = unplanned.length
      ? await new FirmScope(manager, firmId).find(Assignment, { where: { jobId: In(unplanned) }, select: { id: true, firmId: true, jobId: true, days: true } })
      : [];
    return new Map<string, readonly string[]>([...assignments.map((a) => [a.jobId, a.days] as const), ...projected]);
  }

  /** Closes the requests still waiting on the supplier or showing their counter-proposal. */
  private async closeOpenRequests(manager: EntityManager, bookingId: string, status: 'superseded' | 'withdrawn'): Promise<void> {
    await manager.update(AccessChangeRequest, { bookingId, status: In(['pending', 'countered']) }, { status });
  }

  private async supersedePending(manager: EntityManager, bookingId: string): Promise<void> {
    await manager.update(AccessChangeRequest, { bookingId, status: 'pending' }, { status: 'superseded' });
  }

  private async requestForToken(manager: EntityManager, token: string, lock = false) {
    const request = await manager.findOne(AccessChangeRequest, {
      where: { tokenHash: hashToken(token) },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    });
    if (!request) throw errors.tokenInvalid('This link is not valid.');
    if (request.status === 'superseded') throw errors.tokenInvalid('These dates have been replaced by a newer request; see the latest e-mail.');
    if (request.expiresAt <= this.clock()) throw errors.tokenExpired('This link has expired; ask the office to resend it.');
    const booking = await manager.findOneByOrFail(AccessBooking, { id: request.bookingId, firmId: request.firmId });
    return { request, booking };
  }

  /** Who is written to about a booking, and how the booking is named to them; null when the supplier has no e-mail. */
  private async mailContext(manager: EntityManager, booking: AccessBooking) {
    const supplier = await manager.findOneByOrFail(Supplier, { id: booking.supplierId });
    if (!supplier.email) return null;
    const firm = await manager.findOneByOrFail(Firm, { id: booking.firmId });
    const jobs = await manager.find(Job, { where: { id: In(booking.jobIds), firmId: booking.firmId } });
    const site = jobs[0] ? await manager.findOneBy(Site, { id: jobs[0].siteId }) : null;
    return { supplier: { ...supplier, email: supplier.email }, firm, kind: accessTypeLabels[booking.accessType].toLowerCase(), where: site ? formatAddress(site) : 'the site' };
  }

  private async cancellationMail(manager: EntityManager, booking: AccessBooking): Promise<MailMessage | null> {
    const context = await this.mailContext(manager, booking);
    if (!context) return null;
    const { supplier, firm, kind, where } = context;
    const contact = [firm.phone, firm.email].filter(Boolean).join(' or ');
    const text = [
      `Hello ${supplier.contactName ?? supplier.name},`,
      '',
      `${firm.name} no longer needs the ${kind} at ${where}${booking.reference ? ` (your ref ${booking.reference})` : ''}. Please cancel the booking.`,
      '',
      `Booked: up ${booking.confirmedErect ?? '-'}, down ${booking.confirmedStrike ?? '-'}`,
      '',
      `If anything is owed for the cancellation, or you have questions, contact ${firm.name}${contact ? ` on ${contact}` : ''}.`,
      '',
      `Thank you,`,
      firm.name,
    ].join('\n');
    const html = `<p>Hello ${escapeHtml(supplier.contactName ?? supplier.name)},</p>
<p>${escapeHtml(firm.name)} no longer needs the ${kind} at ${escapeHtml(where)}${booking.reference ? ` (your ref ${escapeHtml(booking.reference)})` : ''}. <strong>Please cancel the booking.</strong></p>
<p>Booked: up ${booking.confirmedErect ?? '-'}, down ${booking.confirmedStrike ?? '-'}</p>
<p>If anything is owed for the cancellation, or you have questions, contact ${escapeHtml(firm.name)}${contact ? ` on ${escapeHtml(contact)}` : ''}.</p>
<p>Thank you,<br>${escapeHtml(firm.name)}</p>`;
    return { to: supplier.email, subject: `Cancelled: ${kind} at ${where}`, text, html };
  }

  private async changeRequestMail(manager: EntityManager, booking: AccessBooking, request: AccessChangeRequest, token: string): Promise<MailMessage | null> {
    const context = await this.mailContext(manager, booking);
    if (!context) return null;
    const { supplier, firm, kind, where } = context;
    const link = `${this.appUrl}/supplier-response?token=${encodeURIComponent(token)}`;
    const text = [
      `Hello ${supplier.contactName ?? supplier.name},`,
      '',
      `${firm.name} needs to change the dates of the ${kind} at ${where}${booking.reference ? ` (your ref ${booking.reference})` : ''}.`,
      '',
      `Booked:   up ${request.oldErect ?? '-'}, down ${request.oldStrike ?? '-'}`,
      `Now needed: up ${request.newErect}, down ${request.newStrike}`,
      '',
      `Accept these dates or propose others here (no sign-in needed; the link works once and expires in 14 days):`,
      link,
      '',
      `Thank you,`,
      firm.name,
    ].join('\n');
    const html = `<p>Hello ${escapeHtml(supplier.contactName ?? supplier.name)},</p>
<p>${escapeHtml(firm.name)} needs to change the dates of the ${kind} at ${escapeHtml(where)}${booking.reference ? ` (your ref ${escapeHtml(booking.reference)})` : ''}.</p>
<table><tr><td>Booked</td><td>up ${request.oldErect ?? '-'}, down ${request.oldStrike ?? '-'}</td></tr>
<tr><td><strong>Now needed</strong></td><td><strong>up ${request.newErect}, down ${request.newStrike}</strong></td></tr></table>
<p><a href="${link}">Accept these dates or propose others</a> (no sign-in needed; the link works once and expires in 14 days).</p>
<p>Thank you,<br>${escapeHtml(firm.name)}</p>`;
    return { to: supplier.email, subject: `Date change for ${kind} at ${where}`, text, html };
  }

  /**
   * The firm's live bookings tied to any of these jobs. A firm has few live bookings, so they are read whole once per
   * read (keyed by its calendars, as adverseDaysFor is) and matched here, rather than sending every job id on the board
   * to the database twice.
   */
  private async liveBookingsOf(manager: EntityManager, firmId: string, jobIds: string[], calendars: FirmCalendars): Promise<AccessBooking[]> {
    let live = this.liveMemo.get(calendars);
    if (!live) {
      live = new FirmScope(manager, firmId)
        .query(AccessBooking, 'b')
        .innerJoinAndSelect('b.supplier', 'supplier')
        .andWhere('b.state IN (:...states)', { states: [...LIVE_STATES] })
        .orderBy('b.createdAt', 'ASC')
        .addOrderBy('b.id', 'ASC')
        .getMany();
      this.liveMemo.set(calendars, live);
    }
    const wanted = new Set(jobIds);
    return (await live).filter((booking) => booking.jobIds.some((id) => wanted.has(id)));
  }

  /**
   * adverseDaysByBooking, worked out once per booking for one read: the board asks for its conflicts and its bands at
   * the same time, over mostly the same bookings, and each read loads its own calendars, so they key the memo.
   */
  private adverseDaysFor(manager: EntityManager, firmId: string, bookings: AccessBooking[], calendars: FirmCalendars, today: string): Promise<Map<string, string[]>> {
    let memo = this.adverseMemo.get(calendars);
    if (!memo) this.adverseMemo.set(calendars, (memo = new Map()));
    const known = memo;
    const missing = bookings.filter((booking) => !known.has(`${today}|${booking.id}`));
    if (missing.length > 0) {
      const batch = this.adverseDaysByBooking(manager, firmId, missing, calendars.timeZone, today);
      for (const booking of missing) known.set(`${today}|${booking.id}`, batch.then((days) => days.get(booking.id)));
    }
    return Promise.all(bookings.map(async (booking) => [booking.id, await known.get(`${today}|${booking.id}`)!] as const)).then(
      (entries) => new Map(entries.filter((entry): entry is readonly [string, string[]] => entry[1] !== undefined)),
    );
  }

  /**
   * Adverse-weather days for each booking that has gone up: days from erection to strike (or to the end of the stored
   * forecast) whose wind reached a stop limit for that kind of access at its site, and days stood down for wind.
   */
  private async adverseDaysByBooking(manager: EntityManager, firmId: string, bookings: AccessBooking[], timeZone: string, today: string): Promise<Map<string, string[]>> {
    const result = new Map<string, string[]>();
    const up = bookings.filter((booking) => booking.erectedOn !== null);
    if (up.length === 0) return result;
    const jobIds = [...new Set(up.flatMap((booking) => booking.jobIds))];
    const jobs = await new FirmScope(manager, firmId).find(Job, { where: { id: In(jobIds) }, select: { id: true, firmId: true, siteId: true } });
    const siteOf = new Map(jobs.map((job) => [job.id, job.siteId]));
    const spans = up.map((booking) => ({ booking, from: booking.erectedOn!, to: booking.struckOn ?? addDays(today, FORECAST_AHEAD_DAYS) }));
    const earliest = spans.map((s) => s.from).sort()[0]!;
    const latest = spans.map((s) => s.to).sort().at(-1)!;
    const siteIds = [...new Set(jobs.map((job) => job.siteId))];
    const [rows, holds, limits] = await queriesOf(manager, [
      () => siteIds.length
        ? manager.find(ForecastHourRow, {
          where: { firmId, siteId: In(siteIds), time: Between(new Date(Date.parse(`${earliest}T00:00:00Z`) - 86_400_000), new Date(Date.parse(`${latest}T00:00:00Z`) + 2 * 86_400_000)) },
          order: { time: 'ASC' },
        })
        : Promise.resolve([] as ForecastHourRow[]),
      () => new FirmScope(manager, firmId).find(WeatherHold, { where: { jobId: In(jobIds), reason: 'wind' } }),
      () => manager.findOneBy(FirmWeatherLimits, { firmId }),
    ] as const);
    // The firm's own wind limits, so a day the board shows as a wind stop is the day an inspection follows.
    const { settings } = firmRuleSettings(limits?.overrides);
    const hoursBySite = new Map<string, ReturnType<typeof toForecastHour>[]>();
    for (const row of rows) {
      const hours = hoursBySite.get(row.siteId);
      if (hours) hours.push(toForecastHour(row));
      else hoursBySite.set(row.siteId, [toForecastHour(row)]);
    }
    for (const { booking, from, to } of spans) {
      const days = new Set<string>();
      for (const siteId of new Set(booking.jobIds.map((jobId) => siteOf.get(jobId)).filter((id): id is string => Boolean(id)))) {
        for (const day of windStopDays(hoursBySite.get(siteId) ?? [], from, to, timeZone, EXPOSED_ACTIVITY[booking.accessType], settings)) days.add(day);
      }
      for (const hold of holds) {
        if (hold.status === 'withdrawn' || !booking.jobIds.includes(hold.jobId)) continue;
        for (const day of hold.dates) if (day >= from && day <= to) days.add(day);
      }
      result.set(booking.id, [...days].sort());
    }
    return result;
  }

  private async inspectionDtos(actor: Actor, booking: AccessBooking, rows: ScaffoldInspection[], today: string): Promise<ScaffoldInspectionDto[]> {
    const names = await this.userNames(this.dataSource.manager, rows);
    const wanted = new Set(rows.flatMap((row) => row.photoIds));
    const photos = new Map<string, PhotoDto>();
    if (wanted.size > 0) {
      const byJob = await this.photos.listForJobs(actor, booking.jobIds);
      for (const photo of Object.values(byJob).flat()) if (wanted.has(photo.id)) photos.set(photo.id, photo);
    }
    const { keepUntil } = inspectionRecordsKeptUntil(booking.struckOn);
    return rows.map((row) => ({
      id: row.id, inspectedAt: row.inspectedAt.toISOString(), inspectorName: row.inspectorName, result: row.result,
      defects: row.defects, notes: row.notes, recordedBy: row.recordedBy ? names.get(row.recordedBy) ?? null : null,
      photos: row.photoIds.flatMap((id) => photos.get(id) ?? []),
      keepUntil, isDiscardable: keepUntil !== null && today > keepUntil,
    }));
  }

  private async userNames(manager: EntityManager, rows: ScaffoldInspection[]): Promise<Map<string, string>> {
    const ids = [...new Set(rows.map((r) => r.recordedBy).filter((v): v is string => Boolean(v)))];
    if (ids.length === 0) return new Map();
    const users = await manager.find(User, { where: { id: In(ids) }, select: { id: true, name: true } });
    return new Map(users.map((u) => [u.id, u.name]));
  }

  private async inspectionsByBooking(manager: EntityManager, firmId: string, bookingIds: string[]): Promise<Map<string, ScaffoldInspection[]>> {
    if (bookingIds.length === 0) return new Map();
    const rows = await new FirmScope(manager, firmId).find(ScaffoldInspection, { where: { bookingId: In(bookingIds) }, order: { inspectedAt: 'ASC' } });
    const map = new Map<string, ScaffoldInspection[]>();
    for (const row of rows) map.set(row.bookingId, [...(map.get(row.bookingId) ?? []), row]);
    return map;
  }

  private async jobsOfCrews(manager: EntityManager, actor: Actor): Promise<string[]> {
    if (actor.crewIds.length === 0) return [];
    const rows = await new FirmScope(manager, actor.firmId).find(Assignment, { where: { crewId: In(actor.crewIds) }, select: { jobId: true, id: true, firmId: true } });
    return rows.map((row) => row.jobId);
  }

  private async toDtos(manager: EntityManager, firmId: string, bookings: AccessBooking[], calendars: FirmCalendars): Promise<AccessBookingDto[]> {
    if (bookings.length === 0) return [];
    const today = todayIn(calendars.timeZone, this.clock());
    const jobs = await new FirmScope(manager, firmId).find(Job, { where: { id: In([...new Set(bookings.flatMap((b) => b.jobIds))]) } });
    const references = new Map(jobs.map((job) => [job.id, job.reference]));
    const cancelledJobs = new Set(jobs.filter((job) => job.status === 'cancelled').map((job) => job.id));
    const inspections = await this.inspectionsByBooking(manager, firmId, bookings.map((b) => b.id));
    const adverse = await this.adverseDaysByBooking(manager, firmId, bookings, calendars.timeZone, today);
    const pending = await new FirmScope(manager, firmId).find(AccessChangeRequest, { where: { bookingId: In(bookings.map((b) => b.id)), status: In(['pending', 'countered']) }, order: { createdAt: 'DESC' } });
    const result: AccessBookingDto[] = [];
    for (const booking of bookings) {
      const needed = await this.neededWindow(manager, firmId, booking.jobIds, booking.curingDays, calendars);
      const change = pending.find((p) => p.bookingId === booking.id);
      result.push({
        id: booking.id, jobIds: booking.jobIds, jobReferences: booking.jobIds.map((id) => references.get(id) ?? ''),
        accessType: booking.accessType, supplierId: booking.supplierId, supplierName: booking.supplier.name, state: booking.state,
        requestedErect: booking.requestedErect, requestedStrike: booking.requestedStrike,
        confirmedErect: booking.confirmedErect, confirmedStrike: booking.confirmedStrike,
        neededErect: needed?.erect ?? null, neededStrike: needed?.strike ?? null,
        weeklyRate: booking.weeklyRate, minimumWeeks: booking.minimumWeeks, curingDays: booking.curingDays,
        reference: booking.reference, notes: booking.notes, hire: hireFor(booking),
        inspection: inspectionStatus(booking, inspections.get(booking.id) ?? [], today, adverse.get(booking.id)),
        pendingChange: change ? toChangeDto(change) : null,
        handover: handoverOf(booking),
        hasNoWork: LIVE_STATES.has(booking.state) && (!needed || booking.jobIds.every((id) => cancelledJobs.has(id))),
        cancelledBecause: booking.state === 'cancelled' ? booking.cancelledReason : null,
        version: booking.version,
      });
    }
    return result;
  }

  /**
   * Tells the office, and the crews placed on the booking's jobs so a crew lead's phone changes with it. The crews are
   * looked up after commit; if that fails the office still hears.
   */
  private publish(firmId: string, type: string, booking: AccessBooking): void {
    const event = { firmId, type, id: booking.id, version: booking.version };
    void new FirmScope(this.dataSource.manager, firmId)
      .find(Assignment, { where: { jobId: In(booking.jobIds) }, select: { id: true, firmId: true, crewId: true } })
      .then(
        (rows) => this.events.publish({ ...event, crewIds: [...new Set(rows.map((row) => row.crewId))].sort() }),
        () => this.events.publish(event),
      );
  }
}

/** What a schedule change does to one live booking: a requested one follows, a confirmed or erected one asks the supplier, or settles back on its agreed dates. */
export interface AccessChangePlan {
  booking: AccessBooking;
  effect: 'follows' | 'asks-supplier' | 'settles';
  wanted: Window;
}

/** The window a booking needs over its jobs' days: up a working day before the first, down the working day after the last plus any curing. */
function windowOver(days: readonly string[], curingDays: number, calendars: FirmCalendars): Window | null {
  if (days.length === 0) return null;
  const window = accessWindowFor([...new Set(days)].sort(), { calendar: calendars.firmCalendar, erectLeadWorkingDays: 1, curingDays });
  return { erect: window.erectBy, strike: window.strikeFrom };
}

/** The hire as it stands: the days it actually went up and came down win over the agreed ones, which win over the asked. */
function currentWindow(booking: AccessBooking): Window | null {
  const erect = booking.erectedOn ?? booking.confirmedErect ?? booking.requestedErect;
  const strike = booking.struckOn ?? booking.confirmedStrike ?? booking.requestedStrike;
  return erect && strike ? { erect, strike } : null;
}

export function hireFor(booking: AccessBooking): HireCostDto | null {
  const window = currentWindow(booking);
  if (!window) return null;
  const cost = hireCost({ erectBy: window.erect, strikeFrom: window.strike }, { weeklyRate: booking.weeklyRate, minimumWeeks: booking.minimumWeeks });
  const extraWeeks = booking.pricedWeeks === null ? 0 : Math.max(0, cost.chargedWeeks - booking.pricedWeeks);
  return { erect: window.erect, strike: window.strike, ...cost, pricedWeeks: booking.pricedWeeks, overPricedPence: extraWeeks * booking.weeklyRate };
}

/**
 * Where the scaffold stands against its inspection duty (UK regime: after assembly before first use, then
 * within every 7 days and after adverse weather; the interval restarts at each recorded inspection).
 */
export function inspectionStatus(booking: AccessBooking, inspections: ScaffoldInspection[], today: string, adverseDays: string[] = []): InspectionStatusDto {
  if (booking.state !== 'erected' || !booking.erectedOn) return { status: 'none', nextDue: null, lastInspectedOn: null, reasons: [], source: null, adverseDays };
  const last = inspections[inspections.length - 1];
  if (!last) {
    const due = inspectionsDue(booking.erectedOn, booking.erectedOn, [], 'uk')[0]!;
    return { status: today > due.date ? 'overdue' : 'due', nextDue: due.date, lastInspectedOn: null, reasons: due.reasons, source: due.source, adverseDays };
  }
  if (last.result === 'unsafe') return { status: 'unsafe', nextDue: today, lastInspectedOn: last.inspectedOn, reasons: ['after-occurrence'], source: null, adverseDays };
  const horizon = [today, last.inspectedOn].sort()[1]!;
  // Wind on the day of the last inspection may have come after it, so that day still counts.
  const dues = inspectionsDue(last.inspectedOn, addDaysIso(horizon, 8), adverseDays.filter((d) => d >= last.inspectedOn), 'uk');
  const next = dues.find((due) => due.date > last.inspectedOn);
  if (!next) return { status: 'ok', nextDue: null, lastInspectedOn: last.inspectedOn, reasons: [], source: null, adverseDays };
  const status = today > next.date ? 'overdue' : today === next.date ? 'due' : 'ok';
  return { status, nextDue: next.date, lastInspectedOn: last.inspectedOn, reasons: next.reasons, source: next.source, adverseDays };
}

function addDaysIso(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/**
 * The handover's date is the day the access went up, so it moves the erect date (and with it the hire and the first
 * inspection); it cannot be in the future or after the strike.
 */
function applyHandover(booking: AccessBooking, handover: HandoverDto, today: string): void {
  if (handover.handedOverOn > today) throw errors.validation([{ path: 'handover.handedOverOn', message: 'The handover cannot be in the future' }]);
  if (booking.struckOn && handover.handedOverOn > booking.struckOn) {
    throw errors.validation([{ path: 'handover.handedOverOn', message: 'The handover must be on or before the day it was struck' }]);
  }
  Object.assign(booking, {
    erectedOn: handover.handedOverOn, handedOverOn: handover.handedOverOn, handedOverBy: handover.handedOverBy,
    competentPersonName: handover.competentPersonName, tagReference: handover.tagReference, handoverNotes: handover.notes,
  });
}

function handoverOf(booking: AccessBooking): HandoverDto | null {
  if (!booking.handedOverOn || !booking.handedOverBy || !booking.competentPersonName) return null;
  return {
    handedOverOn: booking.handedOverOn, handedOverBy: booking.handedOverBy, competentPersonName: booking.competentPersonName,
    tagReference: booking.tagReference, notes: booking.handoverNotes,
  };
}

/** What a supplier is told when their link no longer has dates to answer. */
function noLongerAnswerable(state: AccessState): string {
  switch (state) {
    case 'cancelled': return 'The firm has cancelled this booking, so there are no new dates to answer.';
    case 'struck': return 'This access has been struck, so its dates can no longer change.';
    case 'requested': return 'The firm has taken this booking back to a request and no longer asks for these dates; they will be in touch.';
    default: return 'The firm has withdrawn this request; look for their latest e-mail.';
  }
}

function formatPounds(pence: number): string {
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP' }).format(pence / 100);
}

function toSupplierDto(supplier: Supplier): SupplierDto {
  return {
    id: supplier.id, name: supplier.name, contactName: supplier.contactName, email: supplier.email, phone: supplier.phone,
    leadTimeWorkingDays: supplier.leadTimeWorkingDays, minimumWeeks: supplier.minimumWeeks, weeklyRates: supplier.weeklyRates, version: supplier.version,
  };
}

function toChangeDto(request: AccessChangeRequest): AccessChangeRequestDto {
  return {
    id: request.id, status: request.status, oldErect: request.oldErect, oldStrike: request.oldStrike,
    newErect: request.newErect, newStrike: request.newStrike, counterErect: request.counterErect, counterStrike: request.counterStrike,
    supplierNote: request.supplierNote, createdAt: request.createdAt.toISOString(), answeredAt: request.answeredAt?.toISOString() ?? null,
  };
}
