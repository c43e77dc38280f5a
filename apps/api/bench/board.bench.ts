// Board and live-push benchmark: 30 crews × 13 weeks with 2,000 jobs, each figure beside a floor measured in
// the same run (a hand-written SQL query; a bare socket.io broadcast). The board is timed after a move (a card moved
// inside the range before each read, which the cached board takes in place), after a job's title edit (taken in place
// too), cold (a job's target finish edited before each read, so the board is built afresh) and warm (re-reads of an
// unchanged board), beside a reference: the floor's rows served as gzipped JSON by a bare HTTP server. Writes rows to
// BENCH_RESULTS_FILE.
import { writeFileSync } from 'node:fs';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { performance } from 'node:perf_hooks';
import { gzipSync } from 'node:zlib';
import { Server } from 'socket.io';
import { io as connect, type Socket } from 'socket.io-client';
import { addDays } from '@hodboard/shared';
import { attachRealtime } from '../src/realtime/socket-server.js';
import { ms, openBenchDatabase, quantile, ratio, seedFirm, startApi, time } from './support.js';

const CREWS = 30;
const JOBS = 2000;
const WEEKS = 13;
// Enough reads that the p95 is not one stray garbage collection.
const RUNS = 200;
const SOCKETS = 200;
const MOVES = 20;

const dataSource = await openBenchDatabase();
const from = '2027-01-04';
const to = addDays(from, WEEKS * 7 - 1);
console.log(`seeding ${CREWS} crews, ${JOBS} jobs over ${WEEKS} weeks (${from} to ${to})…`);
// Mostly one- and two-day jobs back to back per crew, as a small firm's board is; the last run past the
// 13 weeks, so the board shows the ones in range.
const firm = await seedFirm(dataSource, { name: 'Bench Masonry', crews: CREWS, jobs: JOBS, from, clients: 1, lengthOf: (j) => (j % 4 === 3 ? 2 : 1) });
const { firmId, crewIds, assignmentIds } = firm;
const api = await startApi(dataSource, firm, '2027-01-01T08:00:00Z');
const { server, base, headers, token } = api;
attachRealtime(server, api.services.auth, api.services.events, api.deps.logger);

console.log('board endpoint…');
let rows = 0;
const readBoard = async () => {
  const res = await fetch(`${base}/api/board?from=${from}&to=${to}`, { headers });
  const body = (await res.json()) as { assignments: unknown[] };
  rows = body.assignments.length;
};
// After a move: a card inside the range moves a week and back before every read. The cached board takes the published
// change in place (patchBoard), so the read pays for the JSON and the gzip but not the queries or the rules.
const movedId = assignmentIds[100]!;
const [moved] = (await dataSource.query('SELECT crew_id, start_date::text AS start_date FROM assignment WHERE id = $1', [movedId])) as Array<{ crew_id: string; start_date: string }>;
let movedVersion = 1;
const moveInRange = async () => {
  const res = await fetch(`${base}/api/assignments/${movedId}`, {
    method: 'PUT', headers, body: JSON.stringify({ crewId: moved!.crew_id, startDate: addDays(moved!.start_date, (movedVersion % 2) * 7), workingDays: 1, version: movedVersion, confirmDoubleBooking: true }),
  });
  movedVersion = ((await res.json()) as { assignment: { version: number } }).assignment.version;
};
// A job on the board edited before every read: its title, which the cached boards take in place, or its target
// finish, which the conflict rules read, so no cached board can take it and each read is built anew.
const editedId = firm.jobIds[200]!;
const editJob = (change: (job: { title: string; targetFinish: string | null }) => object) => async () => {
  const job = (await (await fetch(`${base}/api/jobs/${editedId}`, { headers })).json()) as { title: string; targetFinish: string | null; version: number };
  const res = await fetch(`${base}/api/jobs/${editedId}`, { method: 'PUT', headers, body: JSON.stringify({ ...job, ...change(job) }) });
  if (!res.ok) throw new Error(`job edit answered ${res.status}: ${await res.text()}`);
};
const retitle = editJob((job) => ({ title: job.title.endsWith(' (revised)') ? job.title.slice(0, -10) : `${job.title} (revised)` }));
const redate = editJob((job) => ({ targetFinish: job.targetFinish ? null : to }));
const timedAfter = async (write: () => Promise<void>): Promise<number[]> => {
  const samples: number[] = [];
  await write();
  await readBoard();
  for (let i = 0; i < RUNS; i += 1) {
    await write();
    const start = performance.now();
    await readBoard();
    samples.push(performance.now() - start);
  }
  return samples;
};
const afterMove = await timedAfter(moveInRange);
const afterRetitle = await timedAfter(retitle);
const cold = await timedAfter(redate);
// Warm: the same board read again with no write between, answered from the cache.
const warm = await time(readBoard, RUNS);
const floorSql = `SELECT a.id, a.job_id, a.crew_id, a.start_date, a.working_days, a.days, a.version, j.reference, j.title, j.status, c.name AS client_name, s.address_line1, s.town, s.postcode
  FROM assignment a JOIN job j ON j.id = a.job_id JOIN client c ON c.id = j.client_id JOIN site s ON s.id = j.site_id
  WHERE a.firm_id = $1 AND a.start_date <= $3 AND a.end_date >= $2 ORDER BY a.crew_id, a.start_date`;
const floor = await time(() => dataSource.query(floorSql, [firmId, from, to]), RUNS);
console.log(`  ${rows} assignments per board response`);

// What any uncached read over HTTP costs at the least: the floor's rows as JSON, gzipped as the app gzips, from a
// bare node:http server (no sign-in, no rules, no framework) and read with fetch. Not a target; it shows how much of
// a cold read is the transfer alone.
const minimal = createServer((_req, res) => {
  dataSource.query(floorSql, [firmId, from, to]).then((found: unknown[]) => {
    res.writeHead(200, { 'content-type': 'application/json', 'content-encoding': 'gzip' });
    res.end(gzipSync(JSON.stringify(found), { level: 1 }));
  }, (error: unknown) => res.destroy(error as Error));
});
await new Promise<void>((resolve) => minimal.listen(0, '127.0.0.1', resolve));
const minimalUrl = `http://127.0.0.1:${(minimal.address() as AddressInfo).port}/`;
const minimalRead = await time(async () => {
  await (await fetch(minimalUrl)).json();
}, RUNS);
await new Promise<void>((resolve) => minimal.close(() => resolve()));

console.log(`move → push at ${SOCKETS} sockets…`);
const sockets: Socket[] = [];
for (let i = 0; i < SOCKETS; i += 1) {
  const socket = connect(base, { auth: { token }, transports: ['websocket'], reconnection: false });
  await new Promise<void>((resolve, reject) => {
    socket.once('connect', () => resolve());
    socket.once('connect_error', reject);
  });
  sockets.push(socket);
}
const pushSamples: number[] = [];
const versions = new Map<string, number>();
for (let m = 0; m < MOVES; m += 1) {
  const id = assignmentIds[m]!;
  const version = versions.get(id) ?? 1;
  const arrivals = sockets.map((socket) => new Promise<number>((resolve) => socket.once('schedule:changed', () => resolve(performance.now()))));
  const start = performance.now();
  const res = await fetch(`${base}/api/assignments/${id}`, {
    method: 'PUT', headers, body: JSON.stringify({ crewId: crewIds[m % CREWS], startDate: addDays(from, 7 * (m % 12)), workingDays: 1, version, confirmDoubleBooking: true }),
  });
  const body = (await res.json()) as { assignment: { version: number } };
  versions.set(id, body.assignment.version);
  for (const arrived of await Promise.all(arrivals)) pushSamples.push(arrived - start);
}
for (const socket of sockets) socket.disconnect();

// Floor: a bare socket.io server broadcasting the same sized payload to the same number of clients.
const bare = createServer();
const bareIo = new Server(bare);
await new Promise<void>((resolve) => bare.listen(0, '127.0.0.1', resolve));
const bareUrl = `http://127.0.0.1:${(bare.address() as AddressInfo).port}`;
const bareSockets: Socket[] = [];
for (let i = 0; i < SOCKETS; i += 1) {
  const socket = connect(bareUrl, { transports: ['websocket'], reconnection: false });
  await new Promise<void>((resolve) => socket.once('connect', () => resolve()));
  bareSockets.push(socket);
}
const barePayload = { eventId: 1, type: 'assignment:moved', change: { padding: 'x'.repeat(1500) } };
const bareSamples: number[] = [];
for (let m = 0; m < MOVES; m += 1) {
  const arrivals = bareSockets.map((socket) => new Promise<number>((resolve) => socket.once('schedule:changed', () => resolve(performance.now()))));
  const start = performance.now();
  bareIo.emit('schedule:changed', barePayload);
  for (const arrived of await Promise.all(arrivals)) bareSamples.push(arrived - start);
}
for (const socket of bareSockets) socket.disconnect();
await bareIo.close();

const floorP95 = ms(quantile(floor, 0.95));
const pushP95 = ms(quantile(pushSamples, 0.95));
const boardTarget = (p95: number) => (p95 <= 2 * floorP95 && p95 <= 50 ? 'yes' : 'NO');
const coldP95 = ms(quantile(cold, 0.95));
const afterMoveP95 = ms(quantile(afterMove, 0.95));
const afterRetitleP95 = ms(quantile(afterRetitle, 0.95));
const warmP95 = ms(quantile(warm, 0.95));
const results = [
  { figure: `board p50, after a move: a card moved inside the range before each read (${CREWS} crews × ${WEEKS} weeks, ${JOBS} jobs), ms`, hodboard: ms(quantile(afterMove, 0.5)), floor: ms(quantile(floor, 0.5)), target: '—', met: '' },
  { figure: 'board p95, after a move: the cached board takes the move in place, ms', hodboard: afterMoveP95, floor: floorP95, target: '≤ 2× floor and ≤ 50', met: boardTarget(afterMoveP95) },
  { figure: 'board p50, after a job\'s title edit, which the cached board takes in place, ms', hodboard: ms(quantile(afterRetitle, 0.5)), floor: ms(quantile(floor, 0.5)), target: '—', met: '' },
  { figure: 'board p95, after a job\'s title edit, ms', hodboard: afterRetitleP95, floor: floorP95, target: '≤ 2× floor and ≤ 50', met: boardTarget(afterRetitleP95) },
  { figure: 'board p50, cold: a job\'s target finish edited before each read, so the board is built afresh, ms', hodboard: ms(quantile(cold, 0.5)), floor: ms(quantile(floor, 0.5)), target: '—', met: '' },
  { figure: 'board p95, cold: built afresh, ms', hodboard: coldP95, floor: floorP95, target: '≤ 2× floor and ≤ 50', met: boardTarget(coldP95) },
  { figure: 'board p50, warm: unchanged board from the cache, ms', hodboard: ms(quantile(warm, 0.5)), floor: ms(quantile(floor, 0.5)), target: '—', met: '' },
  { figure: 'board p95, warm: unchanged board from the cache, ms', hodboard: warmP95, floor: floorP95, target: '≤ 2× floor and ≤ 50', met: boardTarget(warmP95) },
  { figure: 'reference p50: the floor\'s rows as gzipped JSON from a bare node:http server, read with fetch, ms', hodboard: ms(quantile(minimalRead, 0.5)), floor: ms(quantile(floor, 0.5)), target: '—', met: '' },
  { figure: 'reference p95: the same, ms', hodboard: ms(quantile(minimalRead, 0.95)), floor: floorP95, target: '—', met: '' },
  { figure: `move → push p95 (${SOCKETS} sockets), ms`, hodboard: pushP95, floor: ms(quantile(bareSamples, 0.95)), target: '≤ 100', met: pushP95 <= 100 ? 'yes' : 'NO' },
].map((row) => ({ ...row, ratio: ratio(row.hodboard, row.floor) }));
console.table(results);
if (process.env.BENCH_RESULTS_FILE) writeFileSync(process.env.BENCH_RESULTS_FILE, JSON.stringify(results));
await api.close();
await dataSource.destroy();
process.exit(0);
