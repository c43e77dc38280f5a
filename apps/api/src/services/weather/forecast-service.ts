import { createHash } from 'node:crypto';
import { Between, In, type DataSource, type EntityManager } from 'typeorm';
import type { Logger } from 'pino';
import type { ForecastHour, ScheduleChangeDto } from '@hodboard/shared';
import { Assignment, ForecastFetch, ForecastHourRow, Job, Site } from '../../entities/index.js';
import type { Clock } from '../../lib/clock.js';
import type { EventBus } from '../../lib/event-bus.js';
import type { ForecastProvider, Geocoder } from './forecast-provider.js';

const FORECAST_DAYS = 8;
/** Older than this, a forecast is shown as stale on the board. */
export const STALE_AFTER_MS = 6 * 3_600_000;
/** A site whose first fetch failed is not asked again on every placement, only after this long. */
const FIRST_FETCH_RETRY_MS = 10 * 60_000;

export interface SiteForecast {
  hours: ForecastHour[];
  fetchedAt: Date | null;
  isStale: boolean;
}

/**
 * Fetches and stores hourly forecasts per site. A failing provider never clears what is stored: the last good
 * forecast stays and its age shows; the error is kept beside it.
 */
export class ForecastService {
  private readonly firstFetches = new Map<string, Promise<void>>();

  constructor(
    readonly dataSource: DataSource,
    private readonly provider: ForecastProvider,
    private readonly geocoder: Geocoder,
    private readonly events: EventBus,
    private readonly clock: Clock,
    private readonly logger: Pick<Logger, 'warn' | 'error'>,
  ) {}

  /** Sites with placed work from today for the next week: the ones worth keeping fresh. */
  async sitesWithUpcomingWork(firmId?: string): Promise<Site[]> {
    const { today, horizon } = this.forecastWindow();
    const query = this.dataSource.manager
      .createQueryBuilder(Site, 'site')
      .where((qb) => {
        const sub = qb.subQuery().select('job.site_id').from(Job, 'job').innerJoin(Assignment, 'a', 'a.job_id = job.id')
          .where('a.end_date >= :today AND a.start_date <= :horizon').getQuery();
        return `site.id IN ${sub}`;
      })
      .setParameters({ today, horizon });
    if (firmId) query.andWhere('site.firm_id = :firmId', { firmId });
    return query.getMany();
  }

  async refreshAll(firmId?: string): Promise<{ refreshed: number; failed: number }> {
    let refreshed = 0;
    let failed = 0;
    for (const site of await this.sitesWithUpcomingWork(firmId)) {
      if (await this.refreshSite(site)) refreshed += 1;
      else failed += 1;
    }
    return { refreshed, failed };
  }

  /**
   * A job placed in the coming week at a site that has never had a forecast would show no weather until the next
   * scheduled refresh: fetch that site's forecast as soon as the placement is committed. The fetch publishes
   * forecast:updated, so open boards read the new verdicts. Returns the unsubscribe.
   */
  followPlacements(events: EventBus): () => void {
    return events.subscribe((event) => {
      if (!event.type.startsWith('assignment:')) return;
      const assignment = (event.payload as Partial<ScheduleChangeDto> | undefined)?.assignment;
      if (!assignment) return;
      const { today, horizon } = this.forecastWindow();
      if (!assignment.days.some((date) => date >= today && date <= horizon)) return;
      if (this.firstFetches.has(assignment.jobId)) return;
      const fetching = this.fetchIfNeverForecast(event.firmId, assignment.jobId)
        .catch((error: unknown) => this.logger.error({ err: error, jobId: assignment.jobId }, 'first forecast fetch failed'))
        .finally(() => this.firstFetches.delete(assignment.jobId));
      this.firstFetches.set(assignment.jobId, fetching);
    });
  }

  /** Settles once every first fetch started by a placement has finished. */
  async idle(): Promise<void> {
    while (this.firstFetches.size > 0) await Promise.all(this.firstFetches.values());
  }

  private async fetchIfNeverForecast(firmId: string, jobId: string): Promise<void> {
    const manager = this.dataSource.manager;
    const job = await manager.findOne(Job, { where: { firmId, id: jobId }, relations: { site: true } });
    if (!job?.site) return;
    const fetch = await manager.findOneBy(ForecastFetch, { siteId: job.site.id });
    if (fetch?.lastSuccessAt) return;
    if (fetch?.lastAttemptAt && this.clock().getTime() - fetch.lastAttemptAt.getTime() < FIRST_FETCH_RETRY_MS) return;
    await this.refreshSite(job.site);
  }

  private forecastWindow(): { today: string; horizon: string } {
    const now = this.clock().getTime();
    return { today: new Date(now).toISOString().slice(0, 10), horizon: new Date(now + FORECAST_DAYS * 86_400_000).toISOString().slice(0, 10) };
  }

  /** Returns true when a fresh forecast was stored. */
  async refreshSite(site: Site): Promise<boolean> {
    const now = this.clock();
    try {
      const position = await this.ensurePosition(site);
      if (!position) throw new Error(`no position for postcode ${site.postcode}`);
      const hours = await this.provider.hourly(position.lat, position.lon, FORECAST_DAYS);
      if (hours.length === 0) throw new Error('the forecast service returned no hours');
      const digest = createHash('sha256').update(JSON.stringify(hours)).digest('hex');
      let changed = false;
      let wasStale = false;
      await this.dataSource.transaction(async (manager) => {
        const previous = await manager.findOneBy(ForecastFetch, { siteId: site.id });
        changed = previous?.digest !== digest;
        wasStale = !previous?.lastSuccessAt || now.getTime() - previous.lastSuccessAt.getTime() > STALE_AFTER_MS || Boolean(previous.lastError);
        if (changed) {
          const first = new Date(hours[0]!.time);
          const last = new Date(hours[hours.length - 1]!.time);
          await manager.delete(ForecastHourRow, { siteId: site.id, time: Between(first, last) });
          await manager.insert(ForecastHourRow, hours.map((hour) => ({
            siteId: site.id, firmId: site.firmId, time: new Date(hour.time), tempC: hour.tempC, windMeanMs: hour.windMeanMs,
            windGustMs: hour.windGustMs, precipMm: hour.precipMm, precipProbability: hour.precipProbability, fetchedAt: now,
          })));
        }
        await manager.save(ForecastFetch, { siteId: site.id, firmId: site.firmId, lastSuccessAt: now, lastAttemptAt: now, lastError: null, digest });
      });
      // Re-assessment happens when boards next read; tell them a site's forecast moved, or is no longer stale.
      if (changed || wasStale) this.events.publish({ firmId: site.firmId, type: 'forecast:updated', id: site.id });
      return true;
    } catch (error) {
      const cause = error instanceof Error && error.cause instanceof Error ? `: ${error.cause.message}` : '';
      const message = `${error instanceof Error ? error.message : String(error)}${cause}`;
      this.logger.warn({ siteId: site.id, err: message }, 'forecast refresh failed; keeping the last good forecast');
      await this.dataSource.manager
        .createQueryBuilder()
        .insert()
        .into(ForecastFetch)
        .values({ siteId: site.id, firmId: site.firmId, lastAttemptAt: now, lastError: message, lastSuccessAt: null, digest: null })
        .orUpdate(['last_attempt_at', 'last_error'], ['site_id'])
        .execute();
      // The board marks the site's verdicts stale from now on.
      this.events.publish({ firmId: site.firmId, type: 'forecast:updated', id: site.id });
      return false;
    }
  }

  /** Stored hours for each site between two instants, with the age of each site's forecast. */
  async forSites(manager: EntityManager, siteIds: string[], from: Date, to: Date): Promise<Map<string, SiteForecast>> {
    const result = new Map<string, SiteForecast>();
    if (siteIds.length === 0) return result;
    const [rows, fetches] = [
      await manager.find(ForecastHourRow, { where: { siteId: In(siteIds), time: Between(from, to) }, order: { time: 'ASC' } }),
      await manager.find(ForecastFetch, { where: { siteId: In(siteIds) } }),
    ];
    const now = this.clock().getTime();
    for (const siteId of siteIds) {
      const fetch = fetches.find((f) => f.siteId === siteId);
      const fetchedAt = fetch?.lastSuccessAt ?? null;
      result.set(siteId, {
        hours: rows.filter((row) => row.siteId === siteId).map(toForecastHour),
        fetchedAt,
        isStale: !fetchedAt || now - fetchedAt.getTime() > STALE_AFTER_MS || Boolean(fetch?.lastError),
      });
    }
    return result;
  }

  private async ensurePosition(site: Site): Promise<{ lat: number; lon: number } | null> {
    if (site.lat !== null && site.lon !== null) return { lat: site.lat, lon: site.lon };
    const position = await this.geocoder.locate(site.postcode);
    if (position) await this.dataSource.manager.update(Site, { id: site.id }, { lat: position.lat, lon: position.lon });
    return position;
  }
}

export function toForecastHour(row: ForecastHourRow): ForecastHour {
  return {
    time: row.time.toISOString(), tempC: row.tempC, windMeanMs: row.windMeanMs, windGustMs: row.windGustMs,
    precipMm: row.precipMm, precipProbability: row.precipProbability,
  };
}
