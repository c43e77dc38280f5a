import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { defaultRuleSettings, type BoardDto, type CrewDaysDto, type WeatherLimitsDto, type WeatherOutlookDto } from '@hodboard/shared';
import { addPerson, countRows, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { ScenarioProvider } from './weather-fixtures.js';

let h: Harness;
let owner: SignedIn;
let office: SignedIn;
let lead: SignedIn;
let operative: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;

const DAY = '2027-03-25';

// Wednesday 24 March 2027, early. A chimney job from a scaffold on Thu 25 March: bricklaying and work at height.
beforeAll(async () => {
  const now = { value: new Date('2027-03-24T06:00:00Z') };
  h = await createHarness({ forecastProvider: new ScenarioProvider(now), geocoder: { locate: async () => ({ lat: 53.8, lon: -1.55 }) }, clock: () => now.value });
  h.now.value = now.value;
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Wold Top Masonry', 'owner@woldtop.example');
  ids = await populateFirm(h, owner);
  office = await addPerson(h, owner, 'office', 'office@woldtop.example');
  lead = await addPerson(h, owner, 'crew-lead', 'lead@woldtop.example');
  operative = await addPerson(h, owner, 'operative', 'op@woldtop.example');
  const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
  const leadId = people.find((p) => p.email === 'lead@woldtop.example')!.id;
  await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: 'Gable crew', colour: '#445566', leadMemberId: leadId, memberIds: [leadId] }).expect(200);
  await request(h.app).post(`/api/access-bookings/${ids.bookingId}/state`).set(owner.auth).send({ state: 'cancelled', version: 1 }).expect(200);
  const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
  await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth)
    .send({ ...job.body, workTypes: ['chimney'], accessNeeds: ['scaffold'], estimatedWorkingDays: 1, version: job.body.version }).expect(200);
  await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth).send({ crewId: ids.crewId, startDate: DAY, workingDays: 1, version: 1 }).expect(200);
  await request(h.app).post('/api/weather/refresh').set(owner.auth).send({}).expect(200);
});
beforeEach(async () => {
  await h.dataSource.query('TRUNCATE firm_weather_limits, audit_event');
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const limits = (who: SignedIn = owner) => request(h.app).get('/api/weather/limits').set(who.auth);
const save = (overrides: object, version: number, who: SignedIn = owner) => request(h.app).put('/api/weather/limits').set(who.auth).send({ overrides, version });

/** The day's verdict as the office board, the outlook and the crew lead's phone each show it. */
async function verdicts() {
  const board = (await request(h.app).get('/api/board').query({ from: '2027-03-22', to: '2027-03-28' }).set(owner.auth).expect(200)).body as BoardDto;
  const outlook = (await request(h.app).get('/api/weather/outlook').query({ days: 7 }).set(office.auth).expect(200)).body as WeatherOutlookDto;
  const phone = (await request(h.app).get('/api/crew-days').query({ from: DAY, days: 1 }).set(lead.auth).expect(200)).body as CrewDaysDto;
  const day = board.weather.find((d) => d.date === DAY);
  return {
    board: day?.verdict,
    outlook: outlook.days.find((d) => d.date === DAY)?.verdict,
    phone: phone.days.find((d) => d.date === DAY)?.weather?.verdict,
    reasons: day?.reasons ?? [],
    conflicts: board.conflicts.filter((c) => c.kind === 'weather-stop' && c.date === DAY),
  };
}

describe('a firm’s own weather limits', () => {
  it('starts from the defaults, never saved', async () => {
    const res = await limits(office).expect(200);
    expect(res.body).toEqual({ overrides: {}, effective: defaultRuleSettings, ignored: [], version: 0, updatedAt: null });
  });

  it('turns a calm day from go to stop on the board, the outlook and the crew phone when the owner lowers the scaffold gust limit, and back on reset', async () => {
    // Calm week: gusts 6 m/s through the working day (the scenario file), well under the 18 m/s default.
    expect(await verdicts()).toMatchObject({ board: 'go', outlook: 'go', phone: 'go', conflicts: [] });

    const saved = (await save({ scaffoldUseGustStopMs: 5 }, 0).expect(200)).body as WeatherLimitsDto;
    expect(saved).toMatchObject({ overrides: { scaffoldUseGustStopMs: 5 }, version: 1, ignored: [] });
    expect(saved.effective.scaffoldUseGustStopMs).toBe(5);
    expect(saved.effective.mewpGustStopMs).toBe(defaultRuleSettings.mewpGustStopMs);

    const lowered = await verdicts();
    expect(lowered).toMatchObject({ board: 'stop', outlook: 'stop', phone: 'stop' });
    const gust = lowered.reasons.find((r) => r.ruleId === 'wind.scaffold-use.gust');
    expect(gust).toMatchObject({ activity: 'work-at-height', verdict: 'stop' });
    expect(gust!.message).toMatch(/of 5\.0 m\/s/);
    expect(lowered.conflicts).toHaveLength(1);

    const reset = (await save({}, saved.version).expect(200)).body as WeatherLimitsDto;
    expect(reset).toMatchObject({ overrides: {}, version: 2 });
    expect(reset.effective).toEqual(defaultRuleSettings);
    expect(await verdicts()).toMatchObject({ board: 'go', outlook: 'go', phone: 'go' });
  });

  it('writes an audit line with the change and tells the firm’s screens', async () => {
    const seen: string[] = [];
    const stop = h.services.events.subscribe((event) => void seen.push(`${event.firmId}:${event.type}`));
    await save({ minUsableHours: 4 }, 0).expect(200);
    stop();
    expect(seen).toContain(`${owner.session.firm.id}:weather-limits:updated`);
    const [audit] = (await h.dataSource.query(`SELECT action, after FROM audit_event WHERE entity = 'weather-limits'`)) as Array<{ action: string; after: object }>;
    expect(audit).toEqual({ action: 'created', after: { minUsableHours: 4 } });
  });

  it.each([
    [{ scaffoldUseGustStopMs: -3 }, 'overrides.scaffoldUseGustStopMs'],
    [{ scaffoldUseGustStopMs: 'windy' }, 'overrides.scaffoldUseGustStopMs'],
    [{ rainStopProbability: 5 }, 'overrides.rainStopProbability'],
    [{ frostProtectionDays: 1.5 }, 'overrides.frostProtectionDays'],
    [{ practice: 'eu' }, 'overrides.practice'],
    [{ gustLimit: 12 }, 'overrides'],
    [{ cementFallingStopC: 0.5 }, 'overrides.cementRisingResumeC'],
  ])('refuses %j with 400 problem JSON naming %s and stores nothing', async (overrides, path) => {
    await save({ towerMeanStopMs: 7 }, 0).expect(200);
    const before = await countRows(h.dataSource);
    const res = await save({ towerMeanStopMs: 6, ...overrides }, 1).expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'validation-failed', status: 400 });
    expect((res.body.errors as Array<{ path: string }>).map((e) => e.path)).toContain(path);
    expect(await countRows(h.dataSource)).toEqual(before);
    expect((await limits().expect(200)).body).toMatchObject({ overrides: { towerMeanStopMs: 7 }, version: 1 });
  });

  it('refuses a save from a stale read with 409 and keeps the newer limits', async () => {
    await save({ mewpGustStopMs: 11 }, 0).expect(200);
    const stale = await save({ mewpGustStopMs: 9 }, 0).expect(409);
    expect(stale.body.code).toBe('stale-version');
    expect((await limits().expect(200)).body.overrides).toEqual({ mewpGustStopMs: 11 });
  });

  it.each([
    ['office', 'get', 200],
    ['office', 'put', 403],
    ['crew-lead', 'get', 403],
    ['crew-lead', 'put', 403],
    ['operative', 'get', 403],
    ['operative', 'put', 403],
  ] as const)('gives a %s %s → %i', async (role, method, status) => {
    const who = { office, 'crew-lead': lead, operative }[role];
    const res = method === 'get' ? await limits(who) : await save({ mewpGustStopMs: 5 }, 0, who);
    expect(res.status).toBe(status);
    if (status === 403) expect(res.body).toMatchObject({ code: 'forbidden', status: 403 });
    expect((await limits().expect(200)).body.version).toBe(0);
  });

  it('keeps each firm’s limits and verdicts to itself', async () => {
    const other = await signUpFirm(h, 'Sandstone Row Builders', 'owner@sandstone.example');
    await save({ scaffoldUseGustStopMs: 5 }, 0, other).expect(200);
    expect((await limits().expect(200)).body).toMatchObject({ overrides: {}, version: 0 });
    expect(await verdicts()).toMatchObject({ board: 'go', outlook: 'go', phone: 'go' });
    await save({ towerMeanStopMs: 4 }, 0).expect(200);
    expect((await limits(other).expect(200)).body.overrides).toEqual({ scaffoldUseGustStopMs: 5 });
  });
});
