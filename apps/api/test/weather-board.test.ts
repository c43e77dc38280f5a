import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import type { BoardDto, WeatherHoldDto, WeatherOutlookDto } from '@hodboard/shared';
import { scenarioHours, type ScenarioName } from '../src/fakes/weather-scenarios.js';
import { createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { chimneyJobOverEaster, ScenarioProvider } from './weather-fixtures.js';

const LAT = 53.8;
const LON = -1.55;

let h: Harness;
let provider: ScenarioProvider;
let owner: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;
const NOW = new Date('2027-03-24T06:00:00Z');

// Wednesday 24 March 2027; the chimney job runs Thu 25 March and, after Good Friday and Easter Monday, Tue 30 March.
beforeEach(async () => {
  const now = { value: NOW };
  provider = new ScenarioProvider(now);
  h = await createHarness({ forecastProvider: provider, geocoder: { locate: async () => ({ lat: LAT, lon: LON }) }, clock: () => now.value });
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Heather Lane Masonry', 'owner@heather.example');
  ids = await populateFirm(h, owner);
  await chimneyJobOverEaster(h, owner, ids);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const refresh = () => request(h.app).post('/api/weather/refresh').set(owner.auth).send({}).expect(200);
const board = async () => (await request(h.app).get('/api/board').query({ from: '2027-03-22', to: '2027-04-09' }).set(owner.auth).expect(200)).body as BoardDto;
/** The hour the scenario gives the site, worked out apart from the API. */
const scenarioHour = (scenario: ScenarioName, at: string) =>
  scenarioHours(scenario, LAT, LON, NOW.getTime() - 86_400_000, 10 * 24).find((hour) => hour.time === at);

describe('the reasons behind a verdict', () => {
  it('carries each wind rule\'s limit, the forecast gust it was judged on, its hour and the Beaufort force', async () => {
    provider.scenario = 'gale';
    await refresh();
    const day = (await board()).weather.find((d) => d.date === '2027-03-25')!;
    const gusts = day.reasons.filter((r) => r.ruleId.startsWith('wind.') && r.ruleId.endsWith('.gust') && r.verdict === 'stop');
    expect(gusts.length).toBeGreaterThan(0);
    for (const reason of gusts) {
      expect(reason.unit).toBe('m/s');
      expect(reason.threshold).toBeGreaterThan(0);
      expect(reason.observed).toBeGreaterThanOrEqual(reason.threshold);
      // The gale scenario blows 28 m/s gusts from 09:00 UTC (gale.json), the first such hour of the working day.
      expect(reason).toMatchObject({ observed: 28, at: '2027-03-25T09:00:00.000Z' });
      expect(scenarioHour('gale', reason.at!)?.windGustMs).toBe(reason.observed);
      expect(reason.beaufort).toEqual({ force: expect.any(Number), name: expect.any(String) });
      expect(reason.message).toContain(`force ${reason.beaufort!.force}`);
    }
  });

  it('carries the 3 °C limit and the coldest forecast hour of the bricklaying stop in a hard frost', async () => {
    provider.scenario = 'hard-frost';
    await refresh();
    const day = (await board()).weather.find((d) => d.date === '2027-03-25')!;
    const cold = day.reasons.find((r) => r.activity === 'bricklaying' && r.ruleId === 'cold.mortar.cement')!;
    // Source: NBS clause F10/185 and NHBC Standards 2023 §3.2.5: no laying at or below 3 °C and falling.
    expect(cold).toMatchObject({ verdict: 'stop', threshold: 3, unit: '°C', beaufort: null });
    expect(cold.observed).toBeLessThanOrEqual(3);
    expect(cold.at!.slice(0, 10)).toBe('2027-03-25');
    expect(scenarioHour('hard-frost', cold.at!)?.tempC).toBe(cold.observed);
    expect(day.reasons.find((r) => r.ruleId === 'day.usable-hours')).toMatchObject({ unit: 'h', at: null, observed: 0 });
  });
});

describe('look-ahead periods past the forecast', () => {
  it('notes the frost period the forecast does not reach yet, without lowering a calm day', async () => {
    provider.scenario = 'calm-week';
    // A feed that ends at midnight starting Mon 29 March: past the 48 h after Thu 25 March's working window, short of its six frost days.
    const feed = provider.hourly.bind(provider);
    provider.hourly = async (lat, lon, days) => (await feed(lat, lon, days)).filter((hour) => hour.time < '2027-03-29T00:00:00.000Z');
    await refresh();
    const day = (await board()).weather.find((d) => d.date === '2027-03-25')!;
    // Source: NHBC Standards 2023 §3.2.5, frost protection for up to six days; Hodboard rule: the part past the day and the next 48 h is a note
    expect(day.verdict).toBe('go');
    expect(day.reasons.filter((r) => r.ruleId.startsWith('forecast.reach.'))).toEqual([]);
    expect(day.notes).toEqual([{
      activities: ['bricklaying'],
      ruleId: 'forecast.reach.frost-protection',
      message: expect.stringMatching(/^The forecast reaches .* of the 6 days the frost-protection rule looks ahead \(none yet for 2027-03-29 00:00 UTC to 2027-03-31 \d\d:\d\d UTC\); check it again nearer the day\.$/),
      source: expect.stringMatching(/^Hodboard:/),
      uncovered: [{ from: '2027-03-29T00:00:00.000Z', to: expect.stringMatching(/^2027-03-31T/) }],
    }]);
  });

  it('still gives a caution when the forecast ends within the 48 h after the working day', async () => {
    provider.scenario = 'calm-week';
    await refresh();
    // The feed runs to 06:00 on Thu 1 April, before the 48 h after Tue 30 March's working window are out (Hodboard rule).
    const day = (await board()).weather.find((d) => d.date === '2027-03-30')!;
    expect(day.verdict).toBe('caution');
    expect(day.reasons).toContainEqual(expect.objectContaining({ activity: 'bricklaying', ruleId: 'forecast.reach.frost-protection', verdict: 'caution', unit: 'h', at: null }));
    expect(day.notes).toContainEqual(expect.objectContaining({ ruleId: 'forecast.reach.frost-protection', activities: ['bricklaying'] }));
  });
});

describe('stood-down days on the board', () => {
  const raise = (dates: string[], reason = 'wind') =>
    request(h.app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates, reason }).expect(201);

  it('marks a held day on the board read straight after the stand-down, and only on the crew that has the job', async () => {
    // Read first, so the board is cached; the stand-down must move the firm's board on.
    expect((await board()).holdDays).toEqual([]);
    const hold = (await raise(['2027-03-30'])).body as WeatherHoldDto;
    const view = await board();
    expect(view.holdDays).toEqual([{ holdId: hold.id, jobId: ids.jobId, date: '2027-03-30', reason: 'wind', status: 'open' }]);
    const other = await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Ridge crew', colour: '#335577' }).expect(201);
    const otherBoard = await request(h.app).get('/api/board').query({ from: '2027-03-22', to: '2027-04-09', crewId: other.body.id }).set(owner.auth).expect(200);
    expect((otherBoard.body as BoardDto).holdDays).toEqual([]);
    const outside = await request(h.app).get('/api/board').query({ from: '2027-04-05', to: '2027-04-09' }).set(owner.auth).expect(200);
    expect((outside.body as BoardDto).holdDays).toEqual([]);
  });

  it('leaves out a stand-down that was withdrawn', async () => {
    const hold = (await raise(['2027-03-25', '2027-03-30'], 'rain')).body as WeatherHoldDto;
    expect((await board()).holdDays.map((d) => d.date)).toEqual(['2027-03-25', '2027-03-30']);
    await h.dataSource.query(`UPDATE weather_hold SET status = 'withdrawn' WHERE id = $1`, [hold.id]);
    h.services.boards.invalidate();
    expect((await board()).holdDays).toEqual([]);
  });

  it('still shows the day lost once the stand-down is re-planned', async () => {
    const hold = (await raise(['2027-03-25'])).body as WeatherHoldDto;
    await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'none', version: hold.version }).expect(200);
    expect((await board()).holdDays).toEqual([{ holdId: hold.id, jobId: ids.jobId, date: '2027-03-25', reason: 'wind', status: 'replanned' }]);
  });
});

describe('the knock-on of an at-risk day in the outlook', () => {
  /** The chimney job promised for Tue 30 March, a garden wall booked after it on the same crew, and a confirmed scaffold. */
  async function setUp(): Promise<{ wallId: string; bookingId: string }> {
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth).send({ ...job.body, targetFinish: '2027-03-30', version: job.body.version }).expect(200);
    const wall = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Garden wall after the stack', workTypes: ['garden-wall'], estimatedWorkingDays: 2, targetFinish: '2027-04-05' }).expect(201);
    await request(h.app).post(`/api/jobs/${wall.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: wall.body.id, crewId: ids.crewId, startDate: '2027-03-31' }).expect(201);
    const supplier = await request(h.app).post('/api/suppliers').set(owner.auth)
      .send({ name: 'Steady Tube', email: 'desk@steadytube.example', weeklyRates: { scaffold: 12_000 }, minimumWeeks: 1 }).expect(201);
    const booking = await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [ids.jobId], accessType: 'scaffold', supplierId: supplier.body.id }).expect(201);
    await request(h.app).post(`/api/access-bookings/${booking.body.id}/state`).set(owner.auth)
      .send({ state: 'confirmed', confirmedErect: '2027-03-24', confirmedStrike: '2027-03-31', version: booking.body.version }).expect(200);
    return { wallId: wall.body.id as string, bookingId: booking.body.id as string };
  }
  const outlook = async () => (await request(h.app).get('/api/weather/outlook').query({ days: 7 }).set(owner.auth).expect(200)).body as WeatherOutlookDto;

  it('pushes the job a working day past Easter, ripples the next job, asks the scaffold supplier and prices the extra hire', async () => {
    const { wallId, bookingId } = await setUp();
    provider.scenario = 'gale';
    await refresh();
    const view = await outlook();
    const first = view.atRisk.find((r) => r.jobId === ids.jobId && r.date === '2027-03-25')!;
    const second = view.atRisk.find((r) => r.jobId === ids.jobId && r.date === '2027-03-30')!;
    // Worked by hand. The job is Thu 25 and Tue 30 March (Good Friday 26 and Easter Monday 29 March are bank holidays:
    // gov.uk bank holidays, England and Wales 2027). Losing Thu 25 moves its start to the next working day, Tue 30, and
    // it runs Tue 30 – Wed 31, a day past the promised Tue 30. The garden wall (Wed 31 – Thu 1 April) ripples to
    // Thu 1 – Fri 2 April, still inside its Mon 5 April promise.
    expect(first.knockOn!.job).toEqual({
      jobId: ids.jobId, reference: expect.any(String), finishNow: '2027-03-30', finishAfterPush: '2027-03-31', targetFinish: '2027-03-30', passesTargetFinish: true,
    });
    expect(first.knockOn!.laterJobs).toEqual([
      { jobId: wallId, reference: expect.any(String), finishNow: '2027-04-01', finishAfterPush: '2027-04-02', targetFinish: '2027-04-05', passesTargetFinish: false },
    ]);
    // The scaffold goes up the working day before the first job day (Thu 25, the day before Tue 30 over Easter) and
    // comes down the working day after the last (Thu 1 April). Hire Thu 25 Mar → Thu 1 Apr is 7 days, one week, as the
    // booked Wed 24 → Wed 31 March is: no extra hire, but the agreed dates change, so the supplier is asked.
    expect(first.knockOn!.access).toEqual([{
      bookingId, accessType: 'scaffold', state: 'confirmed', needsChangeRequest: true,
      fromErect: '2027-03-24', fromStrike: '2027-03-31', toErect: '2027-03-25', toStrike: '2027-04-01', extraHireWeeks: 0, extraHirePence: 0,
    }]);
    expect(first.knockOn!.extraHirePence).toBe(0);
    // Losing Tue 30 keeps Thu 25 and adds a day at the end: Thu 25, Tue 30, Wed 31. The scaffold stays up from Wed 24
    // and comes down Thu 1 April: 8 days, a part second week, so one week more at £120.00 (hire per week or part week).
    expect(second.knockOn!.job).toMatchObject({ finishNow: '2027-03-30', finishAfterPush: '2027-03-31', passesTargetFinish: true });
    expect(second.knockOn!.laterJobs.map((j) => [j.jobId, j.finishAfterPush])).toEqual([[wallId, '2027-04-02']]);
    expect(second.knockOn!.access).toEqual([expect.objectContaining({
      needsChangeRequest: true, fromErect: '2027-03-24', toErect: '2027-03-24', toStrike: '2027-04-01', extraHireWeeks: 1, extraHirePence: 12_000,
    })]);
    expect(second.knockOn!.extraHirePence).toBe(12_000);
  });

  it('works the knock-on out without writing: the board and the booking are as they were', async () => {
    const { bookingId } = await setUp();
    provider.scenario = 'gale';
    await refresh();
    const before = await board();
    expect((await outlook()).atRisk.some((r) => r.knockOn)).toBe(true);
    const after = await board();
    expect(after.assignments).toEqual(before.assignments);
    const booking = await request(h.app).get(`/api/access-bookings/${bookingId}`).set(owner.auth).expect(200);
    expect(booking.body).toMatchObject({ confirmedErect: '2027-03-24', confirmedStrike: '2027-03-31', pendingChange: null });
    expect(h.mailer.outbox.filter((m) => m.to === 'desk@steadytube.example')).toHaveLength(0);
  });
});
