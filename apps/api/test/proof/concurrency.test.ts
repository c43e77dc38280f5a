import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHarness, signUpFirm, truncateAll, type Harness, type SignedIn } from '../harness.js';

let h: Harness;
let server: Server;
let base: string;
let owner: SignedIn;
let crews: string[];
let clientId: string;
let siteId: string;

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Quarry Lane Masonry', 'owner@quarrylane.example');
  clientId = (await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Orchard Row Lettings' }).expect(201)).body.id;
  siteId = (await request(h.app).post('/api/sites').set(owner.auth).send({ clientId, addressLine1: '14 Orchard Row', town: 'Lowmoor', postcode: 'LM4 2RT' }).expect(201)).body.id;
  crews = [];
  for (const [name, colour] of [['North crew', '#224466'], ['South crew', '#664422'], ['East crew', '#446622']] as const) {
    crews.push((await request(h.app).post('/api/crews').set(owner.auth).send({ name, colour }).expect(201)).body.id);
  }
  server = createServer(h.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await h.dataSource.destroy();
});

async function bookedJob(title: string, days = 3): Promise<string> {
  const job = await request(h.app).post('/api/jobs').set(owner.auth)
    .send({ clientId, siteId, title, workTypes: ['brickwork'], estimatedWorkingDays: days }).expect(201);
  await request(h.app).post(`/api/jobs/${job.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
  return job.body.id;
}

async function call(method: string, path: string, body: object): Promise<{ status: number; body: { code?: string; assignment?: { id: string; crewId: string; startDate: string } } }> {
  const res = await fetch(`${base}${path}`, { method, headers: { ...owner.auth, 'Content-Type': 'application/json' }, body: JSON.stringify(body) });
  return { status: res.status, body: (await res.json()) as never };
}

/** Pairs of assignments on one crew that share a day: what a race past the double-booking check would leave. */
async function doubleBookings(): Promise<unknown[]> {
  return h.dataSource.query(`
    SELECT a.crew_id, a.id AS first, b.id AS second
    FROM assignment a JOIN assignment b ON a.crew_id = b.crew_id AND a.id < b.id AND a.days && b.days`);
}

describe('concurrent changes to the schedule', () => {
  it('applies exactly one of 50 parallel conflicting moves of one job, answers 409 to the rest, and audits one move', async () => {
    const jobId = await bookedJob('Rebuild the yard wall');
    const placed = await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId, crewId: crews[0], startDate: '2027-03-01' }).expect(201);
    const assignmentId = placed.body.assignment.id as string;
    const eventsBefore = await h.dataSource.query(`SELECT COUNT(*)::int AS n FROM schedule_event`);

    // Every request holds the version it read, as 50 browsers would; each wants its own crew and week.
    const moves = Array.from({ length: 50 }, (_, i) => ({
      crewId: crews[i % 3]!,
      startDate: `2027-${String(4 + (i % 6)).padStart(2, '0')}-${String(5 + (i % 20)).padStart(2, '0')}`,
      workingDays: 3,
      version: 1,
    }));
    const results = await Promise.all(moves.map((move) => call('PUT', `/api/assignments/${assignmentId}`, move)));

    const applied = results.filter((r) => r.status === 200);
    expect(applied).toHaveLength(1);
    const refused = results.filter((r) => r.status !== 200);
    expect(refused.map((r) => `${r.status} ${r.body.code}`)).toEqual(Array(49).fill('409 stale-version'));

    const winner = applied[0]!.body.assignment!;
    const [row] = await h.dataSource.query(`SELECT crew_id, start_date::text AS start, version FROM assignment WHERE id = $1`, [assignmentId]);
    expect(row).toEqual({ crew_id: winner.crewId, start: winner.startDate, version: 2 });

    const audits = await h.dataSource.query(`SELECT action, after FROM audit_event WHERE entity_id = $1 AND action IN ('moved-crew', 'rescheduled')`, [jobId]);
    expect(audits).toHaveLength(1);
    expect(audits[0].after.crewId).toBe(winner.crewId);
    const eventsAfter = await h.dataSource.query(`SELECT COUNT(*)::int AS n FROM schedule_event`);
    expect(eventsAfter[0].n - eventsBefore[0].n).toBe(1);
  });

  it('lets only one of 12 jobs placed at once take the same crew and days', async () => {
    const jobIds: string[] = [];
    for (let i = 0; i < 12; i++) jobIds.push(await bookedJob(`Chimney ${i + 1}`, 2));
    const results = await Promise.all(jobIds.map((jobId) => call('POST', '/api/assignments', { jobId, crewId: crews[1], startDate: '2027-11-01' })));

    expect(results.filter((r) => r.status === 201)).toHaveLength(1);
    expect(results.filter((r) => r.status !== 201).map((r) => `${r.status} ${r.body.code}`)).toEqual(Array(11).fill('409 needs-confirmation'));
    expect(await doubleBookings()).toEqual([]);
  });

  it('never double-books a crew when different jobs are moved onto the same days at once', async () => {
    const placed: Array<{ id: string; version: number }> = [];
    for (let i = 0; i < 10; i++) {
      const jobId = await bookedJob(`Garden wall ${i + 1}`, 2);
      const res = await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId, crewId: crews[i % 3], startDate: `2028-${String(1 + i).padStart(2, '0')}-10` }).expect(201);
      placed.push({ id: res.body.assignment.id, version: res.body.assignment.version });
    }
    const results = await Promise.all(placed.map((a) => call('PUT', `/api/assignments/${a.id}`, { crewId: crews[2], startDate: '2028-11-06', workingDays: 2, version: a.version })));

    const moved = results.filter((r) => r.status === 200);
    expect(moved).toHaveLength(1);
    expect(results.filter((r) => r.status !== 200).every((r) => r.status === 409 && r.body.code === 'needs-confirmation')).toBe(true);
    expect(await doubleBookings()).toEqual([]);
  });
});
