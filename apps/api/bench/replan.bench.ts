// Re-plan after a stand-down: one crew's first job stood down for a day (wind), with 200 jobs booked back to
// back after it, then the office's "push and ripple" previewed and committed through the real API. Floor: the
// shared planReplan alone on the same spans and calendar, timed in the same run. Each round commits, so
// the next round re-plans the board the last one left (every job one working day later).
import { writeFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { planReplan, type PlacedSpan, type ReplanPreviewDto } from '@hodboard/shared';
import { loadCalendars } from '../src/services/calendar-service.js';
import { ms, openBenchDatabase, QueryCapture, quantile, ratio, seedFirm, startApi, time } from './support.js';

const FOLLOWING = 200;
const CREWS = 4;
const ROUNDS = Number(process.env.BENCH_REPLAN_ROUNDS ?? 12);
const PREVIEWS_PER_ROUND = 3;
const FLOOR_RUNS_PER_ROUND = 50;
const TODAY = '2027-03-01';

const capture = new QueryCapture();
const dataSource = await openBenchDatabase(capture);
console.log(`seeding ${CREWS} crews, each with ${FOLLOWING + 1} jobs back to back from ${TODAY}…`);
const firm = await seedFirm(dataSource, {
  name: 'Weatherhold Masonry', crews: CREWS, jobs: CREWS * (FOLLOWING + 1), from: TODAY, today: addDay(TODAY, -1), clients: 300, clientEmails: true,
});
const api = await startApi(dataSource, firm, `${TODAY}T06:30:00Z`);
const crewId = firm.crewIds[0]!;
const firstJobId = firm.jobsByCrew.get(crewId)![0]!;

function addDay(date: string, days: number): string {
  return new Date(Date.parse(`${date}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

async function post<T>(path: string, body: unknown): Promise<T> {
  const res = await fetch(`${api.base}${path}`, { method: 'POST', headers: api.headers, body: JSON.stringify(body) });
  const text = await res.text();
  if (!res.ok) throw new Error(`${path} answered ${res.status}: ${text.slice(0, 400)}`);
  return JSON.parse(text) as T;
}

/** The spans the service plans from, read the same way: the stood-down job and the crew's jobs from its start. */
async function spansNow() {
  const rows = (await dataSource.query(
    `SELECT a.id, a.job_id, a.crew_id, a.start_date, a.working_days, a.days, j.earliest_start
       FROM assignment a JOIN job j ON j.id = a.job_id
      WHERE a.firm_id = $1 AND a.crew_id = $2 AND a.start_date >= (SELECT start_date FROM assignment WHERE job_id = $3)`,
    [firm.firmId, crewId, firstJobId],
  )) as Array<{ id: string; job_id: string; crew_id: string; start_date: string; working_days: number; days: string[]; earliest_start: string | null }>;
  const spans: PlacedSpan[] = rows.map((r) => ({ assignmentId: r.id, jobId: r.job_id, crewId: r.crew_id, startDate: r.start_date, workingDays: r.working_days, days: r.days, earliestStart: r.earliest_start }));
  return { target: spans.find((s) => s.jobId === firstJobId)!, later: spans };
}

const previews: number[] = [];
const commits: number[] = [];
const floor: number[] = [];
let moved = 0;
let previewStatements = 0;
let commitStatements = 0;
for (let round = 0; round < ROUNDS; round += 1) {
  const { target, later } = await spansNow();
  const heldDates = [target.days[0]!];
  const calendars = await loadCalendars(dataSource.manager, firm.firmId);
  let floorMoves = 0;
  floor.push(...(await time(() => {
    floorMoves = planReplan({ target, heldDates, mode: 'push-and-ripple', laterOnCrew: later, calendarFor: (id) => calendars.forCrew(id) }).moves.length;
  }, FLOOR_RUNS_PER_ROUND)));

  const hold = await post<{ id: string; version: number }>('/api/weather-holds', { jobId: firstJobId, dates: heldDates, reason: 'wind', notes: 'Gusts over the scaffold limit' });
  let preview: ReplanPreviewDto | undefined;
  for (let p = 0; p < PREVIEWS_PER_ROUND; p += 1) {
    capture.queries = [];
    capture.capturing = true;
    const start = performance.now();
    preview = await post<ReplanPreviewDto>(`/api/weather-holds/${hold.id}/preview`, { mode: 'push-and-ripple', version: hold.version });
    previews.push(performance.now() - start);
    capture.capturing = false;
    previewStatements = capture.queries.length;
  }
  if (preview!.moves.length !== FOLLOWING + 1 || floorMoves !== preview!.moves.length) {
    throw new Error(`round ${round}: the preview moves ${preview!.moves.length} jobs and planReplan ${floorMoves}; expected ${FOLLOWING + 1}`);
  }
  capture.queries = [];
  capture.capturing = true;
  const start = performance.now();
  const committed = await post<ReplanPreviewDto>(`/api/weather-holds/${hold.id}/commit`, { mode: 'push-and-ripple', version: hold.version });
  commits.push(performance.now() - start);
  capture.capturing = false;
  commitStatements = capture.queries.length;
  moved = committed.moves.length;
  const { target: after } = await spansNow();
  if (after.startDate === target.startDate) throw new Error(`round ${round}: the commit answered but the job did not move`);
}
console.log(`  ${ROUNDS} rounds; each moved ${moved} jobs and sent ${api.mailer.outbox.length} client e-mails in all`);

const rows = [
  { figure: `re-plan preview p50 (1 day stood down, ${FOLLOWING} following jobs), ms`, hodboard: ms(quantile(previews, 0.5)), floor: ms(quantile(floor, 0.5)), target: '—' },
  { figure: `re-plan preview p95 (${previewStatements} SQL stmts), ms`, hodboard: ms(quantile(previews, 0.95)), floor: ms(quantile(floor, 0.95)), target: '≤ 1000' },
  { figure: `re-plan commit p50 (${FOLLOWING + 1} jobs moved, mails queued), ms`, hodboard: ms(quantile(commits, 0.5)), floor: ms(quantile(floor, 0.5)), target: '—' },
  { figure: `re-plan commit p95 (${commitStatements} SQL stmts), ms`, hodboard: ms(quantile(commits, 0.95)), floor: ms(quantile(floor, 0.95)), target: '≤ 2000' },
].map((row) => ({ ...row, ratio: ratio(row.hodboard, row.floor), met: row.target === '—' ? '' : row.hodboard <= Number(row.target.replace(/\D/g, '')) ? 'yes' : 'NO' }));
console.table(rows);
if (process.env.BENCH_RESULTS_FILE) writeFileSync(process.env.BENCH_RESULTS_FILE, JSON.stringify(rows));
await api.close();
await dataSource.destroy();
process.exit(0);
