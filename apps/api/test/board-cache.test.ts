import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it, vi } from 'vitest';
import type { BoardDto } from '@hodboard/shared';
import { addPerson, createHarness, inviteTokenFrom, PASSWORD, populateFirm, signIn, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { ScenarioProvider } from './weather-fixtures.js';

let h: Harness;
let owner: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;
let provider: ScenarioProvider;
let now: { value: Date };

// Monday 1 March 2027, early: the populated job runs 1 to 3 March on Gable crew.
beforeEach(async () => {
  now = { value: new Date('2027-03-01T06:00:00Z') };
  provider = new ScenarioProvider(now);
  h = await createHarness({ forecastProvider: provider, geocoder: { locate: async () => ({ lat: 53.8, lon: -1.55 }) }, clock: () => now.value });
  h.now.value = now.value;
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Copse Row Masonry', 'owner@copse.example');
  ids = await populateFirm(h, owner);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const FROM = '2027-03-01';
const TO = '2027-03-19';
const read = (who: SignedIn = owner, headers: Record<string, string> = {}) => request(h.app).get('/api/board').query({ from: FROM, to: TO }).set(who.auth).set(headers);
const board = async (who: SignedIn = owner) => (await read(who).expect(200)).body as BoardDto;

describe('re-reading an unchanged board', () => {
  it('answers with the same ETag, and 304 to a reader who already holds it', async () => {
    const first = await read().expect(200);
    const second = await read().expect(200);
    expect(first.headers.etag).toBeTruthy();
    expect(second.headers.etag).toBe(first.headers.etag);
    expect(second.body).toEqual(first.body);
    const again = await read(owner, { 'If-None-Match': first.headers.etag! }).expect(304);
    expect(again.text).toBe('');
  });

  it('answers a reader who does not take gzip with the same JSON', async () => {
    const zipped = await read().expect(200);
    const plain = await read(owner, { 'Accept-Encoding': 'identity' }).expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body).toEqual(zipped.body);
  });

  it('gives the held ETag a full answer once a write has changed the board', async () => {
    const first = await read().expect(200);
    await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth).send({ crewId: ids.crewId, startDate: '2027-03-08', workingDays: 3, version: 1 }).expect(200);
    const after = await read(owner, { 'If-None-Match': first.headers.etag! }).expect(200);
    expect(after.headers.etag).not.toBe(first.headers.etag);
    expect((after.body as BoardDto).assignments[0]!.startDate).toBe('2027-03-08');
  });
});

type Write = () => Promise<unknown>;
type Check = (before: BoardDto, after: BoardDto) => void;

describe('every kind of board-affecting write shows on the next read', () => {
  const cases: Array<[string, Write, Check]> = [
    ['a move', () => request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-03-08', workingDays: 2, version: 1 }).expect(200),
    (_, after) => expect(after.assignments[0]).toMatchObject({ startDate: '2027-03-08', days: ['2027-03-08', '2027-03-09'] })],
    ['a removal back to the tray', () => request(h.app).delete(`/api/assignments/${ids.assignmentId}`).query({ version: 1 }).set(owner.auth).expect(200),
      (_, after) => {
        expect(after.assignments).toEqual([]);
        expect(after.trayJobIds).toEqual([ids.jobId]);
      }],
    ['a job edit', async () => {
      const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
      await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth).send({ ...job.body, title: 'Repoint barn gable and porch', version: job.body.version }).expect(200);
    }, (_, after) => expect(after.jobs[ids.jobId]!.title).toBe('Repoint barn gable and porch')],
    ['a job\'s target finish, which a rule reads', async () => {
      const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
      await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth).send({ ...job.body, targetFinish: '2027-03-02', version: job.body.version }).expect(200);
    }, (before, after) => {
      expect(before.conflicts.filter((c) => c.kind === 'after-target-finish')).toEqual([]);
      expect(after.conflicts.filter((c) => c.kind === 'after-target-finish').map((c) => c.jobId)).toEqual([ids.jobId]);
    }],
    ['a crew rename', async () => {
      const crew = await request(h.app).get(`/api/crews/${ids.crewId}`).set(owner.auth).expect(200);
      await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ ...crew.body, name: 'Ridge crew' }).expect(200);
    }, (_, after) => expect(after.crews[0]!.name).toBe('Ridge crew')],
    ['crew leave', () => request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'crew', crewId: ids.crewId, label: 'Course', startDate: '2027-03-10', endDate: '2027-03-10' }).expect(201),
    (_, after) => expect(after.crews[0]!.leave).toEqual([{ date: '2027-03-10', label: 'Course' }])],
    ['a firm closure', () => request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'firm', label: 'Yard closed', startDate: '2027-03-11', endDate: '2027-03-11' }).expect(201),
    (_, after) => expect(after.days.find((d) => d.date === '2027-03-11')).toEqual({ date: '2027-03-11', isWorkingDay: false, offReason: 'Yard closed' })],
    ['an access booking cancelled', () => request(h.app).post(`/api/access-bookings/${ids.bookingId}/state`).set(owner.auth).send({ state: 'cancelled', version: 1 }).expect(200),
      (before, after) => {
        expect(before.accessBands.map((b) => b.bookingId)).toEqual([ids.bookingId]);
        expect(after.accessBands).toEqual([]);
      }],
    ['a client rename', () => request(h.app).put(`/api/clients/${ids.clientId}`).set(owner.auth).send({ name: 'Marsh End Farm Ltd', version: 1 }).expect(200),
      (_, after) => expect(after.jobs[ids.jobId]!.clientName).toBe('Marsh End Farm Ltd')],
    ['a site address change', () => request(h.app).put(`/api/sites/${ids.siteId}`).set(owner.auth)
      .send({ clientId: ids.clientId, addressLine1: '4 Sheepwash Lane', town: 'Lowmoor', postcode: 'LM3 9QD' }).expect(200),
    (_, after) => expect(after.jobs[ids.jobId]!.siteAddress).toContain('4 Sheepwash Lane')],
    ['a stand-down', () => request(h.app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates: ['2027-03-02'], reason: 'rain' }).expect(201),
      (before, after) => {
        expect(before.jobs[ids.jobId]!.status).toBe('scheduled');
        expect(after.jobs[ids.jobId]!.status).toBe('stood-down');
      }],
  ];

  it.each(cases)('%s', async (_name, write, check) => {
    const before = await board();
    expect(await board()).toEqual(before);
    await write();
    const after = await board();
    expect(after).not.toEqual(before);
    check(before, after);
  });

  it('a forecast fetched by the timer, and then the firm\'s own wind limits', async () => {
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth)
      .send({ ...job.body, workTypes: ['chimney'], accessNeeds: ['scaffold'], version: job.body.version }).expect(200);
    await request(h.app).post(`/api/access-bookings/${ids.bookingId}/state`).set(owner.auth).send({ state: 'cancelled', version: 1 }).expect(200);
    expect((await board()).weather).toEqual([]);
    provider.scenario = 'calm-week';
    // The timer calls the service straight, with no request to move the version on.
    await h.services.forecasts.refreshAll();
    const fetched = await board();
    expect(fetched.weather.length).toBeGreaterThan(0);
    const strictest = await request(h.app).put('/api/weather/limits').set(owner.auth).send({ overrides: { scaffoldUseGustStopMs: 1 }, version: 0 }).expect(200);
    expect(strictest.body.version).toBeGreaterThan(0);
    const limited = await board();
    expect(limited.weather.some((day) => day.verdict === 'stop')).toBe(true);
    expect(limited.weather).not.toEqual(fetched.weather);
  });

  it('a failed forecast fetch marks the verdicts stale', async () => {
    await h.services.forecasts.refreshAll();
    expect((await board()).weather.every((day) => !day.isStale)).toBe(true);
    provider.isDown = true;
    await h.services.forecasts.refreshAll();
    const after = await board();
    expect(after.weather.length).toBeGreaterThan(0);
    expect(after.weather.every((day) => day.isStale)).toBe(true);
  });

  it('the day turning over, with no write at all', async () => {
    const before = await read().expect(200);
    now.value = new Date('2027-03-01T06:10:00Z');
    expect((await read().expect(200)).headers.etag).toBe(before.headers.etag);
    now.value = new Date('2027-03-02T06:00:00Z');
    const after = await read().expect(200);
    expect(after.headers.etag).not.toBe(before.headers.etag);
  });

  it('a crew member accepting their invitation under a new name, with their leave on the board', async () => {
    const invited = await request(h.app).post('/api/people/invite').set(owner.auth).send({ email: 'mason@copse.example', name: 'New mason', role: 'operative' }).expect(201);
    const crew = await request(h.app).get(`/api/crews/${ids.crewId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: crew.body.name, colour: crew.body.colour, memberIds: [invited.body.id] }).expect(200);
    await request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'member', memberId: invited.body.id, label: 'Dentist', startDate: '2027-03-03', endDate: '2027-03-03' }).expect(201);
    expect((await board()).crews[0]!.memberLeave.map((leave) => leave.name)).toEqual(['New mason']);
    await request(h.app).post('/api/auth/accept-invite').send({ token: inviteTokenFrom(h.mailer, 'mason@copse.example'), name: 'Ada Flintwick', password: PASSWORD }).expect(200);
    expect((await board()).crews[0]!.memberLeave.map((leave) => leave.name)).toEqual(['Ada Flintwick']);
  });
});

describe('a job edit of what no rule reads', () => {
  it('is taken into the cached board with no fresh read', async () => {
    const before = await board();
    const reads = vi.spyOn(h.services.schedule, 'board');
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth)
      .send({ ...job.body, title: 'Repoint barn gable and porch', priority: 'urgent', estimatedWorkingDays: 4, description: 'Both faces', version: job.body.version }).expect(200);
    const after = await board();
    expect(reads).not.toHaveBeenCalled();
    expect(after.jobs[ids.jobId]).toEqual({ ...before.jobs[ids.jobId], title: 'Repoint barn gable and porch', priority: 'urgent', estimatedWorkingDays: 4, version: job.body.version + 1 });
    expect(after).toEqual(JSON.parse(JSON.stringify(await h.services.schedule.board(await h.services.auth.authenticate(owner.token), { from: FROM, to: TO }))));
  });
});

describe('writes that change nothing a board shows keep it', () => {
  let other: SignedIn;
  const otherFirm = async () => {
    other = await signUpFirm(h, 'Tallow Yard Builders', 'owner@tallow.example');
    return populateFirm(h, other, 'Weir House');
  };
  const cases: Array<[string, Write, Write?]> = [
    ['a sign-in', () => signIn(h, 'owner@copse.example')],
    ['another firm signing up', () => signUpFirm(h, 'Tallow Yard Builders', 'owner@tallow.example')],
    ['another firm\'s job edit', async () => {
      const [theirJob] = (await request(h.app).get('/api/jobs').set(other.auth).expect(200)).body.items as Array<{ id: string }>;
      const job = await request(h.app).get(`/api/jobs/${theirJob!.id}`).set(other.auth).expect(200);
      await request(h.app).put(`/api/jobs/${theirJob!.id}`).set(other.auth).send({ ...job.body, title: 'Rebuild weir wall', version: job.body.version }).expect(200);
    }, otherFirm],
    ['a site note', () => request(h.app).post('/api/site-notes').set(owner.auth).send({ jobId: ids.jobId, body: 'Lime mortar bags under the lean-to' }).expect(201)],
    ['a price-list item', () => request(h.app).post('/api/materials').set(owner.auth)
      .send({ name: 'Hydraulic lime NHL 3.5', unit: 'bag', unitPricePence: 1_450, supplier: 'Kilnside Supplies' }).expect(201)],
  ];

  it.each(cases)('%s', async (_name, write, setUp) => {
    await setUp?.();
    const before = await read().expect(200);
    await write();
    const after = await read().expect(200);
    expect(after.headers.etag).toBe(before.headers.etag);
  });
});

describe('what each reader may see', () => {
  it('keeps a crew lead\'s board apart from the office\'s for the same range', async () => {
    const lead = await addPerson(h, owner, 'crew-lead', 'lead@copse.example');
    const office = await board();
    expect(office.trayJobIds).toBeDefined();
    const seen = await board(lead);
    expect(seen.crews).toEqual([]);
    expect(seen.assignments).toEqual([]);
    expect(await board()).toEqual(office);
  });
});
