import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { addDays, jobPriorities, type BoardDto, type BoardQuery } from '@hodboard/shared';
import type { Actor } from '../src/services/actor.js';
import { addPerson, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { ScenarioProvider } from './weather-fixtures.js';

// A cached board takes each schedule change (and a job edit of what no rule reads) in place instead of being read
// again. Whatever it took, the next read must be the board a fresh read gives: checked here over a long random run of
// places, moves, removals and job edits, with the rules' inputs all present (double-bookings, member leave, earliest
// starts and deadlines, a stand-down, a gale forecast, a scaffold booking), for the office's whole board, the office's
// one-crew board and a crew lead's board.

let h: Harness;
let owner: SignedIn;
let lead: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;
let crews: string[];
let now: { value: Date };
let provider: ScenarioProvider;

const FROM = '2027-03-01';
const TO = '2027-03-19';

beforeEach(async () => {
  now = { value: new Date('2027-03-01T06:00:00Z') };
  provider = new ScenarioProvider(now);
  h = await createHarness({ forecastProvider: provider, geocoder: { locate: async () => ({ lat: 53.8, lon: -1.55 }) }, clock: () => now.value });
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Kestrel Yard Builders', 'owner@kestrel.example');
  ids = await populateFirm(h, owner);
  const more = await Promise.all(['Flue crew', 'Coping crew'].map(async (name, i) =>
    (await request(h.app).post('/api/crews').set(owner.auth).send({ name, colour: i ? '#335577' : '#775533' }).expect(201)).body.id as string));
  crews = [ids.crewId, ...more];

  // A crew lead of the second crew, with a day of their own leave while the crew works.
  lead = await addPerson(h, owner, 'crew-lead', 'lead@kestrel.example');
  const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
  const leadMemberId = people.find((p) => p.email === 'lead@kestrel.example')!.id;
  const crew = await request(h.app).get(`/api/crews/${crews[1]}`).set(owner.auth).expect(200);
  await request(h.app).put(`/api/crews/${crews[1]}`).set(owner.auth).send({ ...crew.body, leadMemberId, memberIds: [leadMemberId] }).expect(200);
  await request(h.app).post('/api/time-off').set(owner.auth).send({ scope: 'member', memberId: leadMemberId, label: 'Dentist', startDate: '2027-03-04', endDate: '2027-03-04' }).expect(201);

  // Booked jobs for the tray, some with an earliest start, a deadline or an urgent priority.
  for (let n = 0; n < 8; n += 1) {
    const job = await request(h.app).post('/api/jobs').set(owner.auth).send({
      clientId: ids.clientId, siteId: ids.siteId, title: `Garden wall ${n}`, workTypes: [n % 2 ? 'brickwork' : 'repointing'],
      estimatedWorkingDays: 1 + (n % 3), priority: n % 4 === 0 ? 'urgent' : 'normal',
      ...(n % 3 === 1 ? { earliestStart: '2027-03-08' } : {}), ...(n % 3 === 2 ? { targetFinish: '2027-03-05' } : {}),
    }).expect(201);
    await request(h.app).post(`/api/jobs/${job.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
  }
  // A stood-down day on the populated job, and a gale on the forecast for its site.
  await request(h.app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates: ['2027-03-02'], reason: 'wind' }).expect(201);
  provider.scenario = 'gale';
  await request(h.app).post('/api/weather/refresh').set(owner.auth).send({}).expect(200);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

/** A small seeded generator, so a failing run can be replayed. */
function random(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state + 0x6d2b79f5) | 0;
    let t = Math.imul(state ^ (state >>> 15), 1 | state);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

/** The parts of a board whose order carries no meaning, sorted, so two boards compare by what they hold. */
function normalised(board: BoardDto): BoardDto {
  const by = <T>(key: (item: T) => string) => (a: T, b: T) => key(a).localeCompare(key(b));
  return {
    ...board,
    assignments: [...board.assignments].sort(by((a) => a.id)),
    conflicts: [...board.conflicts].sort(by((c) => `${c.assignmentId}|${c.kind}|${c.date}|${c.message}`)),
    accessBands: [...board.accessBands].sort(by((b) => b.bookingId)),
    weather: [...board.weather].sort(by((d) => `${d.assignmentId}|${d.date}`)),
    holdDays: [...board.holdDays].sort(by((d) => `${d.jobId}|${d.date}`)),
  };
}

describe('a cached board patched by schedule changes', () => {
  it('reads the same as a fresh board after every place, move, removal and job edit, for every kind of reader', async () => {
    const actor = (who: SignedIn): Promise<Actor> => h.services.auth.authenticate(who.token);
    const readers: Array<{ who: SignedIn; query: BoardQuery }> = [
      { who: owner, query: { from: FROM, to: TO } },
      { who: owner, query: { from: FROM, to: TO, crewId: crews[1] } },
      { who: lead, query: { from: FROM, to: TO } },
    ];
    const cachedRead = async ({ who, query }: { who: SignedIn; query: BoardQuery }) =>
      (await request(h.app).get('/api/board').query(query).set(who.auth).expect(200)).body as BoardDto;
    const freshRead = async ({ who, query }: { who: SignedIn; query: BoardQuery }) =>
      JSON.parse(JSON.stringify(await h.services.schedule.board(await actor(who), query))) as BoardDto;

    const next = random(20270301);
    const pick = <T>(items: T[]): T => items[Math.floor(next() * items.length)]!;
    const dayNear = () => addDays(FROM, Math.floor(next() * 30) - 7);
    const reads = vi.spyOn(h.services.schedule, 'board');
    let cachedReads = 0;
    let rebuilds = 0;
    let writes = 0;

    for (const reader of readers) await cachedRead(reader);
    for (let step = 0; step < 60; step += 1) {
      const office = await freshRead(readers[0]!);
      const placed = office.assignments;
      const roll = next();
      let res: request.Response;
      if (office.trayJobIds.length > 0 && (roll < 0.3 || placed.length === 0)) {
        res = await request(h.app).post('/api/assignments').set(owner.auth)
          .send({ jobId: pick(office.trayJobIds), crewId: pick(crews), startDate: dayNear(), confirmDoubleBooking: true });
      } else if (roll < 0.45) {
        // A job edit: its title or priority, which the boards take in place, or now and then its target finish, which
        // drops them. The priority orders the tray, so it is edited on tray jobs; the others on any job.
        const kind = next();
        const jobId = kind < 0.9 && kind >= 0.45 && office.trayJobIds.length > 0 ? pick(office.trayJobIds) : pick([...office.trayJobIds, ...placed.map((card) => card.jobId)]);
        const job = (await request(h.app).get(`/api/jobs/${jobId}`).set(owner.auth).expect(200)).body as { title: string; priority: string; targetFinish: string | null; version: number };
        const edit = kind < 0.45 ? { title: `${job.title.split(' · ')[0]} · ${step}` }
          : kind < 0.9 ? { priority: pick(jobPriorities.filter((p) => p !== job.priority)) }
            : { targetFinish: job.targetFinish ? null : '2027-03-03' };
        res = await request(h.app).put(`/api/jobs/${jobId}`).set(owner.auth).send({ ...job, ...edit });
      } else if (roll < 0.85 || office.trayJobIds.length === 0) {
        const card = pick(placed);
        res = await request(h.app).put(`/api/assignments/${card.id}`).set(owner.auth).send({
          crewId: next() < 0.6 ? card.crewId : pick(crews), startDate: next() < 0.7 ? dayNear() : card.startDate,
          workingDays: 1 + Math.floor(next() * 4), version: card.version, confirmDoubleBooking: true,
        });
      } else {
        const card = pick(placed);
        res = await request(h.app).delete(`/api/assignments/${card.id}`).query({ version: card.version }).set(owner.auth);
      }
      expect(res.status, JSON.stringify(res.body)).toBeLessThan(300);
      writes += 1;

      for (const reader of readers) {
        const before = reads.mock.calls.length;
        const cached = await cachedRead(reader);
        if (reads.mock.calls.length > before) rebuilds += 1;
        cachedReads += 1;
        const fresh = await freshRead(reader);
        expect(normalised(cached), `step ${step}, ${reader.query.crewId ? 'one crew' : reader.who === lead ? 'lead' : 'office'}`).toEqual(normalised(fresh));
      }
    }
    expect(writes).toBe(60);
    // Most reads after a write were patched boards; the rest were jobs coming onto a board, read afresh.
    expect(rebuilds).toBeLessThan(cachedReads / 2);
  });
});
