import { In, type DataSource } from 'typeorm';
import {
  actualCostPence,
  hireCost,
  marginPctOf,
  type ActualDaysSource,
  type CostingReportDto,
  type CostingReportMonthDto,
  type CostingReportQuery,
  type CostingReportRowDto,
} from '@hodboard/shared';
import { AccessBooking, Assignment, AuditEvent, Firm, Job, JobActual, Quote, QuoteVersion, WeatherHold } from '../entities/index.js';
import { errors } from '../errors.js';
import type { EventBus } from '../lib/event-bus.js';
import { todayIn } from '../lib/today.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { assertVersion, FirmScope } from './firm-scope.js';
import type { WeatherService } from './weather/weather-service.js';

type ActualValues = {
  extraMaterialsPence: number;
  notes: string | null;
  version?: number;
};

interface ExtraHire {
  weeks: number;
  pence: number;
}

/**
 * Estimate against actual for accepted quotes, by the month the work finished (or was accepted, if not yet on the board).
 * Nothing here is typed in but the materials added: the days come from the board, the days lost from the weather
 * stand-downs, the extra hire from the access bookings.
 */
export class CostingReportService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly events: EventBus,
    private readonly weather: WeatherService,
  ) {}

  async report(actor: Actor, query: CostingReportQuery): Promise<CostingReportDto> {
    requirePermission(actor, 'quotes:manage');
    const manager = this.dataSource.manager;
    const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
    const scope = new FirmScope(manager, actor.firmId);
    const quotes = (await scope
      .query(Quote, 'quote')
      .innerJoinAndSelect('quote.job', 'job')
      .innerJoinAndMapOne('quote.current', QuoteVersion, 'current', 'current.id = quote.current_version_id')
      .leftJoinAndMapOne('quote.assignment', Assignment, 'assignment', 'assignment.job_id = quote.job_id')
      .leftJoinAndMapOne('quote.actual', JobActual, 'actual', 'actual.job_id = quote.job_id')
      .andWhere("quote.status = 'accepted'")
      .getMany()) as Array<Quote & { current: QuoteVersion; assignment: Assignment | null; actual: JobActual | null }>;
    const jobIds = quotes.map((q) => q.jobId);
    const [daysLost, heldDates, extraHire, markedDone] = await Promise.all([
      this.daysLostByJob(actor),
      this.heldDatesByJob(scope, jobIds),
      this.extraHireByJob(scope, jobIds),
      this.markedDoneJobs(scope, jobIds),
    ]);

    const rows: CostingReportRowDto[] = [];
    for (const quote of quotes) {
      const month = (quote.assignment?.endDate ?? todayIn(firm.timeZone, quote.acceptedAt ?? quote.createdAt)).slice(0, 7);
      if (month < query.from || month > query.to) continue;
      const { content, settings, breakdown } = quote.current;
      const held = heldDates.get(quote.jobId) ?? new Set<string>();
      // A stand-down that was not re-planned leaves its days in the span: the crew was not on site on them.
      const days = quote.assignment ? quote.assignment.days.filter((day) => !held.has(day)).length : content.jobDays;
      const daysFrom: ActualDaysSource = !quote.assignment ? 'estimate' : markedDone.has(quote.jobId) || isFinished(quote.job.status) ? 'done' : 'board';
      const hire = extraHire.get(quote.jobId) ?? { weeks: 0, pence: 0 };
      const figures = {
        days,
        weatherDaysLost: daysLost.get(quote.jobId) ?? 0,
        extraAccessPence: hire.pence,
        extraMaterialsPence: quote.actual?.extraMaterialsPence ?? 0,
      };
      const costPence = actualCostPence(content, settings, figures);
      const net = breakdown.totals.netPence;
      const actualMargin = net - costPence;
      rows.push({
        jobId: quote.jobId,
        jobReference: quote.job.reference,
        jobTitle: quote.job.title,
        quoteId: quote.id,
        quoteReference: quote.reference,
        month,
        estimate: {
          days: content.jobDays,
          costPence: breakdown.totals.costPence,
          accessPence: breakdown.totals.accessPence,
          marginPence: breakdown.totals.marginPence,
          netPence: net,
          marginPct: marginPctOf(breakdown.totals.marginPence, net),
        },
        actual: {
          days,
          daysFrom,
          weatherDaysLost: figures.weatherDaysLost,
          extraAccessWeeks: hire.weeks,
          extraAccessPence: hire.pence,
          extraMaterialsPence: figures.extraMaterialsPence,
          costPence,
          marginPence: actualMargin,
          marginPct: marginPctOf(actualMargin, net),
          notes: quote.actual?.notes ?? null,
          version: quote.actual?.version ?? null,
        },
      });
    }
    rows.sort((a, b) => a.month.localeCompare(b.month) || a.jobReference.localeCompare(b.jobReference));
    const months: CostingReportMonthDto[] = monthsBetween(query.from, query.to).map((month) => {
      const inMonth = rows.filter((r) => r.month === month);
      return {
        month,
        jobs: inMonth.length,
        netPence: inMonth.reduce((t, r) => t + r.estimate.netPence, 0),
        estimatedMarginPence: inMonth.reduce((t, r) => t + r.estimate.marginPence, 0),
        actualMarginPence: inMonth.reduce((t, r) => t + r.actual.marginPence, 0),
      };
    });
    return { from: query.from, to: query.to, months, rows };
  }

  /** The stand-down summary the weather screens show, summed over crews. */
  private async daysLostByJob(actor: Actor): Promise<Map<string, number>> {
    const summary = await this.weather.summary(actor);
    const byJob = new Map<string, number>();
    for (const row of summary.byJob) byJob.set(row.jobId, (byJob.get(row.jobId) ?? 0) + row.days);
    return byJob;
  }

  private async heldDatesByJob(scope: FirmScope, jobIds: string[]): Promise<Map<string, Set<string>>> {
    const map = new Map<string, Set<string>>();
    if (jobIds.length === 0) return map;
    const holds = await scope.find(WeatherHold, { where: { jobId: In(jobIds) }, select: { id: true, jobId: true, dates: true, status: true } });
    for (const hold of holds) {
      if (hold.status === 'withdrawn') continue;
      const dates = map.get(hold.jobId) ?? new Set<string>();
      for (const date of hold.dates) dates.add(date);
      map.set(hold.jobId, dates);
    }
    return map;
  }

  /**
   * Hire weeks beyond those priced on each booking, from erection (or the booked date) to strike (or the booked
   * date), at the booking's own rate. A booking shared by neighbouring jobs splits its extra cost between them.
   */
  private async extraHireByJob(scope: FirmScope, jobIds: string[]): Promise<Map<string, ExtraHire>> {
    const map = new Map<string, ExtraHire>();
    if (jobIds.length === 0) return map;
    const bookings = await scope
      .query(AccessBooking, 'b')
      .andWhere('b.job_ids && :jobIds::uuid[]', { jobIds })
      .andWhere("b.state <> 'cancelled'")
      .getMany();
    for (const booking of bookings) {
      const erect = booking.erectedOn ?? booking.confirmedErect ?? booking.requestedErect;
      const strike = booking.struckOn ?? booking.confirmedStrike ?? booking.requestedStrike;
      if (!erect || !strike || booking.pricedWeeks === null) continue;
      const charged = hireCost({ erectBy: erect, strikeFrom: strike }, { weeklyRate: booking.weeklyRate, minimumWeeks: booking.minimumWeeks }).chargedWeeks;
      const weeks = Math.max(0, charged - booking.pricedWeeks);
      if (weeks === 0) continue;
      const pence = weeks * booking.weeklyRate;
      const share = Math.floor(pence / booking.jobIds.length);
      booking.jobIds.forEach((jobId, index) => {
        const extra = map.get(jobId) ?? { weeks: 0, pence: 0 };
        // The first job takes the odd pence, so the shares add up to the bill.
        map.set(jobId, { weeks: extra.weeks + weeks, pence: extra.pence + share + (index === 0 ? pence - share * booking.jobIds.length : 0) });
      });
    }
    return map;
  }

  /** Jobs the crew marked done on the phone: the board's span was then cut or stretched to the days worked. */
  private async markedDoneJobs(scope: FirmScope, jobIds: string[]): Promise<Set<string>> {
    if (jobIds.length === 0) return new Set();
    const rows = await scope.find(AuditEvent, { where: { entity: 'job', entityId: In(jobIds), action: 'work-finished' }, select: { id: true, entityId: true } });
    return new Set(rows.map((row) => row.entityId));
  }

  async saveActual(actor: Actor, jobId: string, input: ActualValues): Promise<void> {
    requirePermission(actor, 'quotes:manage');
    const { version, ...values } = input;
    await this.dataSource.transaction(async (manager) => {
      const scope = new FirmScope(manager, actor.firmId);
      const job = await scope.lockForUpdate(Job, jobId, 'Job');
      if (!(await manager.existsBy(Quote, { jobId: job.id, firmId: actor.firmId, status: 'accepted' }))) {
        throw errors.illegalTransition(`${job.reference} has no accepted quote to compare with.`);
      }
      const existing = await manager.findOne(JobActual, { where: { jobId: job.id, firmId: actor.firmId }, lock: { mode: 'pessimistic_write' } });
      if (existing) {
        assertVersion(existing, version, 'These figures');
        const before = { ...existing };
        await manager.save(Object.assign(existing, values));
        await recordAudit(manager, actor, { entity: 'job', entityId: job.id, action: 'actuals-updated', before, after: existing });
      } else {
        const created = await manager.save(manager.create(JobActual, { ...values, jobId: job.id, firmId: actor.firmId }));
        await recordAudit(manager, actor, { entity: 'job', entityId: job.id, action: 'actuals-recorded', after: created });
      }
    });
    this.events.publish({ firmId: actor.firmId, type: 'job:updated', id: jobId });
  }
}

function isFinished(status: Job['status']): boolean {
  return status === 'complete' || status === 'invoiced';
}

function monthsBetween(from: string, to: string): string[] {
  const out: string[] = [];
  let [y, m] = from.split('-').map(Number) as [number, number];
  const [ty, tm] = to.split('-').map(Number) as [number, number];
  // A bounded loop: the query schema already orders the two months; cap a silly range at ten years.
  while ((y < ty || (y === ty && m <= tm)) && out.length < 120) {
    out.push(`${y}-${String(m).padStart(2, '0')}`);
    m += 1;
    if (m > 12) {
      m = 1;
      y += 1;
    }
  }
  return out;
}
