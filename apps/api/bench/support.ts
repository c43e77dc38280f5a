// What the API benches share: a throwaway database rebuilt from the migrations, an invented firm seeded
// straight into the tables (fast, and the same rows the app would write), and the real app on loopback.
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { performance } from 'node:perf_hooks';
import jwt from 'jsonwebtoken';
import { pino } from 'pino';
import { DataSource, type Logger } from 'typeorm';
import { addDays, spanFor, type AccessNeed, type WorkType } from '@hodboard/shared';
import { createApp, createServices, type AppDeps, type AppServices } from '../src/app.js';
import { dataSourceOptions } from '../src/db/data-source.js';
import { loadCalendars } from '../src/services/calendar-service.js';
import { MemoryMailer } from '../src/services/mailer.js';

export interface CapturedQuery {
  sql: string;
  parameters: unknown[];
}

/** Records the SQL TypeORM sends while `capturing` is on, so a floor can send exactly the same statements. */
export class QueryCapture implements Logger {
  capturing = false;
  queries: CapturedQuery[] = [];
  logQuery(sql: string, parameters?: unknown[]): void {
    if (this.capturing) this.queries.push({ sql, parameters: parameters ?? [] });
  }
  logQueryError(): void {}
  logQuerySlow(): void {}
  logSchemaBuild(): void {}
  logMigration(): void {}
  log(): void {}
}

/** DATABASE_URL must name a throwaway database: its public schema is dropped and rebuilt from the migrations. */
export async function openBenchDatabase(capture?: QueryCapture): Promise<DataSource> {
  const url = process.env.DATABASE_URL;
  if (!url || !/bench|test/.test(url)) throw new Error('set DATABASE_URL to a throwaway database whose name contains "bench"');
  const dataSource = new DataSource({ ...dataSourceOptions(url), ...(capture ? { logger: capture } : {}) });
  await dataSource.initialize();
  await dataSource.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
  await dataSource.runMigrations({ transaction: 'each' });
  return dataSource;
}

const KINDS: Array<{ title: string; workTypes: WorkType[]; days: number; access: AccessNeed[] }> = [
  { title: 'Rebuild chimney stack', workTypes: ['chimney'], days: 4, access: ['scaffold'] },
  { title: 'Repoint front elevation', workTypes: ['repointing'], days: 5, access: ['scaffold'] },
  { title: 'Rebuild garden wall', workTypes: ['garden-wall', 'brickwork'], days: 3, access: [] },
  { title: 'Replace chimney pots', workTypes: ['chimney', 'repairs'], days: 1, access: ['roof-ladder'] },
  { title: 'Render repair to rear wall', workTypes: ['rendering', 'repairs'], days: 2, access: ['tower'] },
  { title: 'Extension brickwork to plate', workTypes: ['extension', 'brickwork'], days: 6, access: [] },
  { title: 'Replace spalled bricks', workTypes: ['brickwork'], days: 1, access: [] },
  { title: 'Footings for garden room', workTypes: ['groundworks', 'concrete'], days: 2, access: [] },
];
const TOWNS = ['Callowmere', 'Greenhythe', 'Thornley Edge', 'Saltby Cross', 'Marlow Fen', 'Kettleby'];
const STREETS = ['Quarry Row', 'Mill Lane', 'Tannery Court', 'Top Road', 'Heron Close', 'Candle Street', 'Orchard Rise', 'Chapel Walk'];

export interface FirmShape {
  name: string;
  crews: number;
  /** Jobs placed back to back on each crew in turn, starting on `from`. */
  jobs: number;
  from: string;
  /** Working days of the j-th job; by default a mix of one to six days as a small firm books them. */
  lengthOf?: (j: number) => number;
  /** Clients (one site each); jobs go round them. */
  clients: number;
  /** Unplaced jobs waiting in the tray. */
  trayJobs?: number;
  /** "Now" for statuses: jobs finished before it are complete, the one spanning it is on site. */
  today?: string;
  /** Hourly forecasts stored for every site from `today` for this many days (the board's weather markers). */
  forecastDays?: number;
  /** Client e-mail addresses, so a re-plan writes to them as it would to real clients. */
  clientEmails?: boolean;
}

export interface SeededFirm {
  firmId: string;
  officeUserId: string;
  officeMembershipId: string;
  crewIds: string[];
  jobIds: string[];
  assignmentIds: string[];
  /** Placed jobs in order per crew. */
  jobsByCrew: Map<string, string[]>;
}

/** Seeds an invented firm; none of its people or addresses exist. */
export async function seedFirm(dataSource: DataSource, shape: FirmShape): Promise<SeededFirm> {
  const q = async <T = { id: string }>(sql: string, params: unknown[]): Promise<T> => ((await dataSource.query(sql, params)) as T[])[0]!;
  const slug = shape.name.toLowerCase().replace(/[^a-z]+/g, '-');
  const { id: firmId } = await q(`INSERT INTO firm (name, version) VALUES ($1, 1) RETURNING id`, [shape.name]);
  const person = async (email: string, name: string, role: string) => {
    const { id: userId } = await q(`INSERT INTO app_user (email, name) VALUES ($1, $2) RETURNING id`, [email, name]);
    const { id: membershipId } = await q(`INSERT INTO membership (firm_id, user_id, role) VALUES ($1, $2, $3) RETURNING id`, [firmId, userId, role]);
    return { userId, membershipId };
  };
  const office = await person(`office@${slug}.example`, 'Office', 'office');
  const crewIds: string[] = [];
  for (let c = 0; c < shape.crews; c += 1) {
    const lead = await person(`lead${c + 1}@${slug}.example`, `Lead ${c + 1}`, 'crew-lead');
    const hand = await person(`hand${c + 1}@${slug}.example`, `Operative ${c + 1}`, 'operative');
    const { id } = await q(`INSERT INTO crew (firm_id, name, colour, lead_member_id, version) VALUES ($1, $2, '#445566', $3, 1) RETURNING id`, [firmId, `Crew ${String(c + 1).padStart(2, '0')}`, lead.membershipId]);
    await dataSource.query(`INSERT INTO crew_member (crew_id, member_id, firm_id) VALUES ($1, $2, $4), ($1, $3, $4)`, [id, lead.membershipId, hand.membershipId, firmId]);
    crewIds.push(id);
  }
  const sites: Array<{ clientId: string; siteId: string }> = [];
  for (let i = 0; i < shape.clients; i += 1) {
    const name = `Client ${i + 1}`;
    const contacts = [{ name, role: null, email: shape.clientEmails ? `client${i + 1}@example.org` : null, phone: null }];
    const { id: clientId } = await q(`INSERT INTO client (firm_id, name, contacts, version) VALUES ($1, $2, $3, 1) RETURNING id`, [firmId, name, JSON.stringify(contacts)]);
    const { id: siteId } = await q(
      `INSERT INTO site (firm_id, client_id, address_line1, town, postcode, lat, lon, version) VALUES ($1, $2, $3, $4, $5, $6, $7, 1) RETURNING id`,
      [firmId, clientId, `${(i % 60) + 1} ${STREETS[i % STREETS.length]}`, TOWNS[i % TOWNS.length], `CM${(i % 9) + 1} ${(i % 8) + 1}AB`, 52.1 + (i % 40) * 0.01, -1.9 + (i % 50) * 0.01],
    );
    sites.push({ clientId, siteId });
  }

  const calendars = await loadCalendars(dataSource.manager, firmId);
  const today = shape.today ?? shape.from;
  const cursors = crewIds.map(() => shape.from);
  const jobIds: string[] = [];
  const assignmentIds: string[] = [];
  const jobsByCrew = new Map(crewIds.map((id) => [id, [] as string[]]));
  let reference = 0;
  const insertJob = async (j: number, days: number, status: string) => {
    const kind = KINDS[j % KINDS.length]!;
    const site = sites[(j * 7) % sites.length]!;
    reference += 1;
    const { id } = await q(
      `INSERT INTO job (firm_id, reference, client_id, site_id, title, work_types, estimated_working_days, access_needs, status, priority, version)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, 1) RETURNING id`,
      [firmId, `J${String(reference).padStart(5, '0')}`, site.clientId, site.siteId, kind.title, kind.workTypes, days, kind.access, status, j % 11 === 0 ? 'high' : 'normal'],
    );
    return id;
  };
  for (let j = 0; j < shape.jobs; j += 1) {
    const c = j % crewIds.length;
    const crewId = crewIds[c]!;
    const length = shape.lengthOf ? shape.lengthOf(j) : KINDS[j % KINDS.length]!.days;
    const days = spanFor(cursors[c]!, length, calendars.forCrew(crewId));
    const first = days[0]!;
    const last = days[days.length - 1]!;
    cursors[c] = addDays(last, 1);
    const status = last < today ? 'complete' : first <= today ? 'on-site' : 'scheduled';
    const jobId = await insertJob(j, length, status);
    const { id } = await q(
      `INSERT INTO assignment (firm_id, job_id, crew_id, start_date, working_days, days, end_date, version) VALUES ($1, $2, $3, $4, $5, $6, $7, 1) RETURNING id`,
      [firmId, jobId, crewId, first, length, days, last],
    );
    jobIds.push(jobId);
    assignmentIds.push(id);
    jobsByCrew.get(crewId)!.push(jobId);
  }
  for (let t = 0; t < (shape.trayJobs ?? 0); t += 1) {
    jobIds.push(await insertJob(shape.jobs + t, KINDS[t % KINDS.length]!.days, ['booked', 'quoted', 'enquiry'][t % 3]!));
  }
  await dataSource.query(`UPDATE firm SET job_sequence = $2 WHERE id = $1`, [firmId, reference]);

  if (shape.forecastDays) {
    // Plausible spring weather that varies by site and hour: mostly workable, some wind and showers.
    const start = `${today}T00:00:00Z`;
    await dataSource.query(
      `INSERT INTO forecast_hour (site_id, time, firm_id, temp_c, wind_mean_ms, wind_gust_ms, precip_mm, precip_probability, fetched_at)
       SELECT s.id, t, s.firm_id,
              8 + 5 * sin(extract(hour FROM t) / 24.0 * 2 * pi()) + (abs(hashtext(s.id::text)::bigint) % 5),
              3 + (abs(hashtext(s.id::text || t::text)::bigint) % 9),
              6 + (abs(hashtext(s.id::text || t::text)::bigint) % 15),
              CASE WHEN abs(hashtext(t::text || s.id::text)::bigint) % 7 = 0 THEN 0.6 ELSE 0 END,
              (abs(hashtext(t::text)::bigint) % 80) / 100.0,
              $3::timestamptz
         FROM site s CROSS JOIN generate_series($2::timestamptz - interval '12 hours', $2::timestamptz + ($4 || ' days')::interval, interval '1 hour') AS t
        WHERE s.firm_id = $1`,
      [firmId, start, `${today}T05:00:00Z`, String(shape.forecastDays)],
    );
    await dataSource.query(
      `INSERT INTO forecast_fetch (site_id, firm_id, last_success_at, last_attempt_at) SELECT id, firm_id, $2, $2 FROM site WHERE firm_id = $1`,
      [firmId, `${today}T05:00:00Z`],
    );
  }
  await dataSource.query('ANALYZE');
  return { firmId, officeUserId: office.userId, officeMembershipId: office.membershipId, crewIds, jobIds, assignmentIds, jobsByCrew };
}

export interface RunningApi {
  base: string;
  server: Server;
  deps: AppDeps;
  services: AppServices;
  mailer: MemoryMailer;
  /** Headers of a signed-in office user of the seeded firm. */
  headers: Record<string, string>;
  token: string;
  close(): Promise<void>;
}

/** The real app (createApp with its own services) on a loopback port, as the office of `firm` sees it. */
export async function startApi(dataSource: DataSource, firm: SeededFirm, now: string): Promise<RunningApi> {
  const secret = 'bench-secret-bench-secret-bench-secret';
  const mailer = new MemoryMailer();
  const deps: AppDeps = { dataSource, mailer, clock: () => new Date(now), logger: pino({ level: 'silent' }), jwtSecret: secret, appUrl: 'http://127.0.0.1', authAttemptsPerWindow: 1_000_000, authAttemptsPerAddress: 1_000_000 };
  const services = createServices(deps);
  const server = createServer(createApp(deps, services));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const token = jwt.sign({ sub: firm.officeUserId, mid: firm.officeMembershipId, fid: firm.firmId }, secret, { algorithm: 'HS256', expiresIn: 3600 * 4 });
  return {
    base: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    server, deps, services, mailer, token,
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    close: () => new Promise<void>((resolve) => { server.closeAllConnections(); server.close(() => resolve()); }),
  };
}

export function quantile(values: number[], q: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))]!;
}

/** One warm-up call, then `runs` timed calls in a row; milliseconds. */
export async function time(run: () => Promise<unknown> | unknown, runs: number): Promise<number[]> {
  await run();
  const samples: number[] = [];
  for (let i = 0; i < runs; i += 1) {
    const start = performance.now();
    await run();
    samples.push(performance.now() - start);
  }
  return samples;
}

export const ms = (n: number): number => Math.round(n * 10) / 10;
export const ratio = (hodboard: number, floor: number): number => Math.round((hodboard / Math.max(floor, 0.001)) * 10) / 10;
