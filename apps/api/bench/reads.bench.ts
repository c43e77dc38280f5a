// Read endpoints under load: autocannon (10 connections, BENCH_SECONDS each, default 30) against the real app
// with a realistic firm, each beside a floor in the same run: a bare Express + pg endpoint sending exactly the
// SQL statements the Hodboard request sent (captured from TypeORM), one after another, and answering their
// rows as JSON. The ratio is then what the app adds over the database work it asks for.
import { spawn } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import express from 'express';
import pg from 'pg';
import { addDays } from '@hodboard/shared';
import { ratio, ms, openBenchDatabase, QueryCapture, seedFirm, startApi, type CapturedQuery } from './support.js';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 30);
const WARMUP_SECONDS = Math.min(3, Math.max(1, Math.round(SECONDS / 10)));
const CONNECTIONS = 10;
const TODAY = '2027-03-01';
const CREWS = 6;
const JOBS = 1000;

const capture = new QueryCapture();
const dataSource = await openBenchDatabase(capture);
console.log(`seeding a firm of ${CREWS} crews with ${JOBS} placed jobs over about two years, 30 in the tray, 400 clients, forecasts…`);
const firm = await seedFirm(dataSource, {
  name: 'Kiln Lane Builders', crews: CREWS, jobs: JOBS, from: '2025-05-05', today: TODAY, clients: 400, trayJobs: 30, forecastDays: 9, clientEmails: true,
});
const api = await startApi(dataSource, firm, `${TODAY}T07:00:00Z`);
// Every read builds the board afresh, as the first read after a write does: a load of identical reads would
// otherwise be answered from the board cache and compare cached bytes with the floor's SQL.
api.services.boards.read = (actor, query) => api.services.boards.build(actor, query);

// What the office's screens ask for most: the jobs list's first page as the jobs screen opens it, the board's
// default two weeks, and the crew list the screens' filters load.
const endpoints = [
  { name: 'jobs', label: 'GET /api/jobs (page 1 of 25, newest first)', path: '/api/jobs?page=1&pageSize=25&sort=createdAt&order=desc' },
  { name: 'board', label: 'GET /api/board (two weeks, 6 crews, cache bypassed)', path: `/api/board?from=${TODAY}&to=${addDays(TODAY, 13)}` },
  { name: 'crews', label: 'GET /api/crews (all, by name)', path: '/api/crews?page=1&pageSize=200&sort=name' },
];

const statements = new Map<string, CapturedQuery[]>();
for (const endpoint of endpoints) {
  capture.queries = [];
  capture.capturing = true;
  const res = await fetch(`${api.base}${endpoint.path}`, { headers: api.headers });
  const body = await res.text();
  capture.capturing = false;
  if (!res.ok) throw new Error(`${endpoint.path} answered ${res.status}: ${body.slice(0, 300)}`);
  const sent = capture.queries.filter((q) => !/^\s*(START TRANSACTION|BEGIN|COMMIT|ROLLBACK|SAVEPOINT|RELEASE)/i.test(q.sql));
  statements.set(endpoint.name, sent);
  if (process.env.BENCH_DUMP_SQL) writeFileSync(`${process.env.BENCH_DUMP_SQL}-${endpoint.name}.json`, JSON.stringify(sent, null, 1));
  console.log(`  ${endpoint.path}: ${sent.length} SQL statements, ${(body.length / 1024).toFixed(1)} KB JSON`);
}

// The floor: Express and a pg pool of the same size as the app's, nothing else.
const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 10 });
const bare = express();
bare.get('/floor/:name', async (req, res, next) => {
  try {
    const results: unknown[][] = [];
    for (const q of statements.get(req.params.name) ?? []) results.push((await pool.query(q.sql, q.parameters)).rows);
    res.json(results);
  } catch (error) {
    next(error);
  }
});
const floorServer = createServer(bare);
await new Promise<void>((resolve) => floorServer.listen(0, '127.0.0.1', resolve));
const floorBase = `http://127.0.0.1:${(floorServer.address() as AddressInfo).port}`;

interface LoadResult { requestsPerSecond: number; requests: number; non2xx: number; errors: number; p50: number; p95: number; p99: number; bytesPerResponse: number }
const driver = fileURLToPath(new URL('./load-driver.mjs', import.meta.url));
function load(url: string, headers: Record<string, string>): Promise<LoadResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [driver, JSON.stringify({ url, headers, connections: CONNECTIONS, seconds: SECONDS, warmupSeconds: WARMUP_SECONDS })], { stdio: ['ignore', 'pipe', 'inherit'] });
    let out = '';
    child.stdout.on('data', (chunk: Buffer) => { out += chunk.toString(); });
    child.on('error', reject);
    child.on('close', (code) => {
      if (code !== 0) return reject(new Error(`load driver exited ${code}`));
      const result = JSON.parse(out.trim().split('\n').pop()!) as LoadResult;
      if (!result.requests) return reject(new Error(`${url}: no answer completed within ${SECONDS} s; give the run more time (BENCH_SECONDS)`));
      if (result.non2xx || result.errors) return reject(new Error(`${url}: ${result.non2xx} non-2xx answers and ${result.errors} errors of ${result.requests}`));
      resolve(result);
    });
  });
}

const rows: Array<Record<string, unknown>> = [];
for (const endpoint of endpoints) {
  console.log(`${endpoint.label}: ${SECONDS} s each at ${CONNECTIONS} connections…`);
  const hodboard = await load(`${api.base}${endpoint.path}`, { authorization: api.headers.authorization! });
  const floor = await load(`${floorBase}/floor/${endpoint.name}`, {});
  const count = statements.get(endpoint.name)!.length;
  console.log(`  Hodboard ${hodboard.requestsPerSecond.toFixed(0)} req/s p95 ${hodboard.p95.toFixed(1)} ms; floor ${floor.requestsPerSecond.toFixed(0)} req/s p95 ${floor.p95.toFixed(1)} ms`);
  const rps = { figure: `${endpoint.label}, req/s (${CONNECTIONS} conn, ${count} SQL stmts)`, hodboard: Math.round(hodboard.requestsPerSecond * 10) / 10, floor: Math.round(floor.requestsPerSecond * 10) / 10, target: '≥ ½ floor' };
  const p95 = { figure: `${endpoint.label}, p95 ms under that load`, hodboard: ms(hodboard.p95), floor: ms(floor.p95), target: '≤ 2× floor' };
  rows.push(
    { ...rps, ratio: ratio(rps.hodboard, rps.floor), met: rps.hodboard >= rps.floor / 2 ? 'yes' : 'NO' },
    { ...p95, ratio: ratio(p95.hodboard, p95.floor), met: p95.hodboard <= p95.floor * 2 ? 'yes' : 'NO' },
  );
}
console.table(rows);
if (process.env.BENCH_RESULTS_FILE) writeFileSync(process.env.BENCH_RESULTS_FILE, JSON.stringify(rows));
await new Promise((resolve) => floorServer.close(resolve));
await pool.end();
await api.close();
await dataSource.destroy();
process.exit(0);
