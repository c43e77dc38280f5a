import { createECDH, randomBytes } from 'node:crypto';
import request from 'supertest';
import webpush from 'web-push';
import { afterAll, afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { AccessBookingDto, BoardDto, CrewDto, PushMessageDto, ReplanPreviewDto, WeatherHoldDto } from '@hodboard/shared';
import { createWeatherFake } from '../src/fakes/weather-fake.js';
import { HttpForecastProvider, HttpGeocoder } from '../src/services/weather/forecast-provider.js';
import { addPerson, countRows, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { chimneyJobOverEaster, ScenarioProvider } from './weather-fixtures.js';

let h: Harness;
let provider: ScenarioProvider;
/** Every phone push sent, as the push service handed it over; the crews' phones subscribe to made-up endpoints. */
let pushes: Array<{ endpoint: string; message: PushMessageDto }>;
const vapid = { ...webpush.generateVAPIDKeys(), subject: 'mailto:office@heather.example' };
let owner: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;

// Wednesday 24 March 2027, early; the job runs Thu 25 March and, after Good Friday and Easter Monday, Tue 30 March.
beforeEach(async () => {
  const now = { value: new Date('2027-03-24T06:00:00Z') };
  provider = new ScenarioProvider(now);
  pushes = [];
  h = await createHarness({
    forecastProvider: provider, geocoder: { locate: async () => ({ lat: 53.8, lon: -1.55 }) }, clock: () => now.value, vapid,
    pushSender: async (target, payload) => {
      pushes.push({ endpoint: target.endpoint, message: JSON.parse(payload) as PushMessageDto });
      return { statusCode: 201 };
    },
  });
  // The harness clock is this one, so a test can move time through h.now.
  h.now = now;
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Heather Lane Masonry', 'owner@heather.example');
  ids = await populateFirm(h, owner);
  await chimneyJobOverEaster(h, owner, ids);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const refresh = () => request(h.app).post('/api/weather/refresh').set(owner.auth).send({}).expect(200);

/** A crew lead added to the crew, with a phone subscribed to pushes at https://push.example/<email>. */
async function leadWithPhone(email: string, crewId: string): Promise<SignedIn> {
  const lead = await addPerson(h, owner, 'crew-lead', email);
  const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
  const memberId = people.find((p) => p.email === email)!.id;
  const crew = (await request(h.app).get(`/api/crews/${crewId}`).set(owner.auth).expect(200)).body as CrewDto;
  await request(h.app).put(`/api/crews/${crewId}`).set(owner.auth)
    .send({ name: crew.name, colour: crew.colour, leadMemberId: memberId, memberIds: [...crew.members.map((m) => m.memberId), memberId], version: crew.version }).expect(200);
  const ecdh = createECDH('prime256v1');
  ecdh.generateKeys();
  await request(h.app).post('/api/push/subscriptions').set(lead.auth)
    .send({ endpoint: `https://push.example/${email}`, keys: { p256dh: ecdh.getPublicKey().toString('base64url'), auth: randomBytes(16).toString('base64url') } }).expect(204);
  return lead;
}

/** The phone pushes sent once every announcement started so far is out. */
async function pushesSent(): Promise<Array<{ endpoint: string; message: PushMessageDto }>> {
  await h.services.push.idle();
  return pushes;
}
const board = async () => (await request(h.app).get('/api/board').query({ from: '2027-03-22', to: '2027-04-09' }).set(owner.auth).expect(200)).body as BoardDto;

describe('forecasts on the board', () => {
  it('turns a scaffold job-day to stop in a gale, with wind reasons that name the Beaufort force and defer to the competent person', async () => {
    provider.scenario = 'gale';
    expect((await refresh()).body).toEqual({ refreshed: 1, failed: 0 });
    const view = await board();
    const day = view.weather.find((d) => d.date === '2027-03-25');
    expect(day?.verdict).toBe('stop');
    const wind = day!.reasons.filter((r) => r.ruleId.startsWith('wind.') && r.verdict === 'stop');
    expect(wind.length).toBeGreaterThan(0);
    expect(wind.some((r) => /force \d+|Beaufort/i.test(r.message))).toBe(true);
    expect(day!.advice.join(' ')).toMatch(/competent person/i);
    expect(view.conflicts).toContainEqual(expect.objectContaining({ kind: 'weather-stop', date: '2027-03-25', severity: 'stop' }));
  });

  it('keeps the marker of a stop day once it has passed, but no longer counts it as an issue to act on', async () => {
    provider.scenario = 'gale';
    await refresh();
    h.now.value = new Date('2027-03-26T09:00:00Z');
    const view = await board();
    expect(view.weather.find((d) => d.date === '2027-03-25')?.verdict).toBe('stop');
    expect(view.conflicts.filter((c) => c.kind === 'weather-stop' && c.date === '2027-03-25')).toEqual([]);
  });

  it('stops bricklaying in a hard frost by the 3 °C-and-falling rule', async () => {
    provider.scenario = 'hard-frost';
    await refresh();
    const day = (await board()).weather.find((d) => d.date === '2027-03-25')!;
    // Source: NBS clause F10/185 and NHBC Standards 2023 §3.2.5: no laying at or below 3 °C and falling.
    expect(day.reasons).toContainEqual(expect.objectContaining({ activity: 'bricklaying', ruleId: 'cold.mortar.cement', verdict: 'stop' }));
  });

  it('fetches the forecast of a site never forecast as soon as a job there is placed in the coming week', async () => {
    provider.scenario = 'gale';
    const stop = h.services.forecasts.followPlacements(h.services.events);
    try {
      expect((await board()).weather.find((d) => d.date === '2027-03-25')).toBeUndefined();
      await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth)
        .send({ crewId: ids.crewId, startDate: '2027-03-29', workingDays: 2, version: 2 }).expect(200);
      await h.services.forecasts.idle();
      const view = await board();
      expect(view.weather.find((d) => d.date === '2027-03-30')).toMatchObject({ verdict: 'stop', isStale: false });

      // Once forecast, the site waits for the scheduled refresh: a second move fetches nothing.
      provider.isDown = true;
      await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth)
        .send({ crewId: ids.crewId, startDate: '2027-03-25', workingDays: 2, version: 3 }).expect(200);
      await h.services.forecasts.idle();
      expect((await board()).weather.find((d) => d.date === '2027-03-25')).toMatchObject({ verdict: 'stop', isStale: false });
    } finally {
      stop();
    }
  });

  it('leaves a placement beyond the forecast alone', async () => {
    const stop = h.services.forecasts.followPlacements(h.services.events);
    try {
      await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth)
        .send({ crewId: ids.crewId, startDate: '2027-04-12', workingDays: 2, version: 2 }).expect(200);
      await h.services.forecasts.idle();
      expect((await countRows(h.dataSource)).forecast_fetch).toBe(0);
    } finally {
      stop();
    }
  });

  it('keeps the last good forecast and marks it stale when the service is down', async () => {
    provider.scenario = 'calm-week';
    await refresh();
    expect((await board()).weather.find((d) => d.date === '2027-03-25')).toMatchObject({ verdict: 'go', isStale: false });
    provider.isDown = true;
    expect((await refresh()).body).toEqual({ refreshed: 0, failed: 1 });
    const day = (await board()).weather.find((d) => d.date === '2027-03-25')!;
    expect(day).toMatchObject({ verdict: 'go', isStale: true });
    expect(day.forecastFetchedAt).toBe('2027-03-24T06:00:00.000Z');
  });
});

describe('stand-downs and re-plans', () => {
  async function followingJob(): Promise<string> {
    const res = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Garden wall after the stack', workTypes: ['garden-wall'], estimatedWorkingDays: 2 }).expect(201);
    await request(h.app).post(`/api/jobs/${res.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: res.body.id, crewId: ids.crewId, startDate: '2027-03-31' }).expect(201);
    return res.body.id as string;
  }
  const raise = (body: object = { jobId: ids.jobId, dates: ['2027-03-25'], reason: 'wind', notes: 'Gusting over the ridge' }) =>
    request(h.app).post('/api/weather-holds').set(owner.auth).send(body);

  it('stands the job down, and the same idempotency key twice stores it once', async () => {
    const first = await raise({ jobId: ids.jobId, dates: ['2027-03-25'], reason: 'wind', idempotencyKey: 'phone-queue-0001' }).expect(201);
    const again = await raise({ jobId: ids.jobId, dates: ['2027-03-25'], reason: 'wind', idempotencyKey: 'phone-queue-0001' }).expect(200);
    expect(again.body.id).toBe(first.body.id);
    expect((await request(h.app).get('/api/weather-holds').set(owner.auth).expect(200)).body).toHaveLength(1);
    expect((await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200)).body.status).toBe('stood-down');
  });

  it('refuses a day that is not one of the job\'s days', async () => {
    const res = await raise({ jobId: ids.jobId, dates: ['2027-03-26'], reason: 'rain' }).expect(400);
    expect(res.body.errors[0].path).toBe('dates');
  });

  it('previews a push with ripple over Easter and commits exactly what it previewed, telling each client once', async () => {
    const nextJob = await followingJob();
    const hold = (await raise().expect(201)).body as WeatherHoldDto;
    const preview = (await request(h.app).post(`/api/weather-holds/${hold.id}/preview`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    // Source: gov.uk bank holidays, England and Wales 2027 (Good Friday 26 March, Easter Monday 29 March).
    expect(preview.moves.map((m) => [m.jobId, m.toDays])).toEqual([
      [ids.jobId, ['2027-03-30', '2027-03-31']],
      [nextJob, ['2027-04-01', '2027-04-02']],
    ]);
    const committed = (await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    expect(committed.moves).toEqual(preview.moves);
    const view = await board();
    expect(view.assignments.find((a) => a.jobId === ids.jobId)!.days).toEqual(['2027-03-30', '2027-03-31']);
    expect(view.assignments.find((a) => a.jobId === nextJob)!.days).toEqual(['2027-04-01', '2027-04-02']);
    expect((await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200)).body.status).toBe('scheduled');
    // One client, two jobs moved: one e-mail listing both.
    const clientMails = h.mailer.outbox.filter((m) => m.to === 'farm@example.org');
    expect(clientMails).toHaveLength(1);
    expect(clientMails[0]!.subject).toMatch(/^New dates for your jobs \S+ and \S+$/);
    expect(clientMails[0]!.text).toContain('now starting on Tuesday 30 March and expected to finish on Wednesday 31 March');
    expect(clientMails[0]!.text).toContain('now starting on Thursday 1 April and expected to finish on Friday 2 April');
    await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(409);
    expect(h.mailer.outbox.filter((m) => m.to === 'farm@example.org')).toHaveLength(1);
  });

  it('plans the commit in its own transaction: a previewed plan the board no longer allows is refused, and the e-mail gives the dates applied', async () => {
    const nextJob = await followingJob();
    const hold = (await raise().expect(201)).body as WeatherHoldDto;
    const preview = (await request(h.app).post(`/api/weather-holds/${hold.id}/preview`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    expect(preview.moves.map((m) => m.jobId)).toEqual([ids.jobId, nextJob]);
    // The following job is moved on by hand after the preview, so the ripple is no longer needed.
    const next = (await board()).assignments.find((a) => a.jobId === nextJob)!;
    await request(h.app).put(`/api/assignments/${next.id}`).set(owner.auth).send({ crewId: ids.crewId, startDate: '2027-04-05', workingDays: 2, version: next.version }).expect(200);
    const before = await countRows(h.dataSource);
    const refused = await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth)
      .send({ mode: 'push-and-ripple', version: hold.version, planKey: preview.planKey }).expect(409);
    expect(refused.body).toMatchObject({ code: 'conflict', status: 409 });
    expect(await countRows(h.dataSource)).toEqual(before);
    expect(h.mailer.outbox.filter((m) => m.to === 'farm@example.org')).toHaveLength(0);

    const fresh = (await request(h.app).post(`/api/weather-holds/${hold.id}/preview`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    expect(fresh.planKey).not.toBe(preview.planKey);
    const committed = (await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth)
      .send({ mode: 'push-and-ripple', version: hold.version, planKey: fresh.planKey }).expect(200)).body as ReplanPreviewDto;
    expect(committed).toEqual(fresh);
    expect(committed.moves.map((m) => [m.jobId, m.toDays])).toEqual([[ids.jobId, ['2027-03-30', '2027-03-31']]]);
    const view = await board();
    expect(view.assignments.find((a) => a.jobId === nextJob)!.days).toEqual(['2027-04-05', '2027-04-06']);
    const mails = h.mailer.outbox.filter((m) => m.to === 'farm@example.org');
    expect(mails).toHaveLength(1);
    expect(mails[0]!.text).toContain('Tuesday 30 March');
    expect(mails[0]!.text).not.toContain('April');
  });

  it('e-mails each client once with every job of theirs that moved, and the client of a rippled job too', async () => {
    const nextJob = await followingJob();
    const otherClient = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Ash Row Cottages', contacts: [{ name: 'Robin Ash', email: 'robin@ashrow.example' }] }).expect(201);
    const site = await request(h.app).post('/api/sites').set(owner.auth).send({ clientId: otherClient.body.id, addressLine1: '4 Ash Row', town: 'Lowmoor', postcode: 'LM3 9QF' }).expect(201);
    const third = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: otherClient.body.id, siteId: site.body.id, title: 'Rebed ridge tiles', workTypes: ['roofing'], estimatedWorkingDays: 1 }).expect(201);
    await request(h.app).post(`/api/jobs/${third.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: third.body.id, crewId: ids.crewId, startDate: '2027-04-02' }).expect(201);
    const hold = (await raise().expect(201)).body as WeatherHoldDto;
    const committed = (await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    // Source: gov.uk bank holidays, England and Wales 2027 (Good Friday 26 March, Easter Monday 29 March).
    expect(committed.moves.map((m) => [m.jobId, m.toDays])).toEqual([
      [ids.jobId, ['2027-03-30', '2027-03-31']],
      [nextJob, ['2027-04-01', '2027-04-02']],
      [third.body.id, ['2027-04-05']],
    ]);
    expect(committed.clientsToTell.sort()).toEqual(['Ash Row Cottages', 'Marsh End Farm']);
    const farm = h.mailer.outbox.filter((m) => m.to === 'farm@example.org');
    const ash = h.mailer.outbox.filter((m) => m.to === 'robin@ashrow.example');
    expect([farm.length, ash.length]).toEqual([1, 1]);
    expect(ash[0]!.text).toContain('Dear Robin Ash');
    expect(ash[0]!.text).toContain('another job of ours');
    expect(ash[0]!.text).toContain('rebed ridge tiles at 4 Ash Row');
    expect(ash[0]!.text).toContain('now on Monday 5 April');
    expect(ash[0]!.text).not.toContain('repoint');
    const keys = (await h.dataSource.query(`SELECT dedupe_key FROM notification WHERE dedupe_key LIKE 'replan:%' ORDER BY dedupe_key`)) as Array<{ dedupe_key: string }>;
    expect(keys).toEqual([
      { dedupe_key: `replan:${hold.id}:client:${otherClient.body.id}` },
      { dedupe_key: `replan:${hold.id}:client:${ids.clientId}` },
    ].sort((a, b) => a.dedupe_key.localeCompare(b.dedupe_key)));
  });

  it('lets only one of two simultaneous re-plans through, and tells the client, the supplier and the crew once', async () => {
    await leadWithPhone('lead@heather.example', ids.crewId);
    const supplier = await request(h.app).post('/api/suppliers').set(owner.auth).send({ name: 'Steady Tube', email: 'desk@steadytube.example', weeklyRates: { scaffold: 12_000 } }).expect(201);
    const booking = await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [ids.jobId], accessType: 'scaffold', supplierId: supplier.body.id }).expect(201);
    await request(h.app).post(`/api/access-bookings/${booking.body.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.body.version }).expect(200);
    const hold = (await raise().expect(201)).body as WeatherHoldDto;
    await pushesSent();
    pushes.length = 0;
    const [a, b] = await Promise.all([
      request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push', version: hold.version }),
      request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push', version: hold.version }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const history = await request(h.app).get(`/api/jobs/${ids.jobId}/history`).set(owner.auth).expect(200);
    expect((history.body as Array<{ action: string }>).filter((e) => e.action === 'replanned')).toHaveLength(2); // one move + one hold line
    expect(h.mailer.outbox.filter((m) => m.to === 'farm@example.org')).toHaveLength(1);
    expect(h.mailer.outbox.filter((m) => m.to === 'desk@steadytube.example')).toHaveLength(1);
    expect((await h.dataSource.query(`SELECT count(*)::int AS n FROM access_change_request`))[0].n).toBe(1);
    const sent = await pushesSent();
    expect(sent.map((p) => p.endpoint)).toEqual(['https://push.example/lead@heather.example']);
    expect(sent[0]!.message.body).toContain('Tue 30 Mar to Wed 31 Mar');
  });

  it('lets one of two re-plans of stand-downs on the same crew through at once; the other is refused until previewed again', async () => {
    const nextJob = await followingJob();
    await leadWithPhone('lead@heather.example', ids.crewId);
    const first = (await raise().expect(201)).body as WeatherHoldDto;
    const second = (await raise({ jobId: nextJob, dates: ['2027-03-31'], reason: 'rain' }).expect(201)).body as WeatherHoldDto;
    const previewOf = async (hold: WeatherHoldDto) =>
      (await request(h.app).post(`/api/weather-holds/${hold.id}/preview`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    const commitOf = (hold: WeatherHoldDto, preview: ReplanPreviewDto) =>
      request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version, planKey: preview.planKey });
    const [p1, p2] = [await previewOf(first), await previewOf(second)];
    await pushesSent();
    pushes.length = 0;
    const results = await Promise.all([commitOf(first, p1), commitOf(second, p2)]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    const winner = results.find((r) => r.status === 200)!.body as ReplanPreviewDto;
    const loser = results.find((r) => r.status === 409)!;
    expect(loser.body.code).toBe('conflict');
    // One e-mail for the client of both jobs, one push per job the winner moved.
    expect(h.mailer.outbox.filter((m) => m.to === 'farm@example.org')).toHaveLength(1);
    expect((await pushesSent()).length).toBe(winner.moves.length);

    const loserHold = winner.holdId === first.id ? second : first;
    await commitOf(loserHold, await previewOf(loserHold)).expect(200);
    // Either order ends the same: the stack on 30–31 March, the wall after it on 1–2 April.
    // Source: gov.uk bank holidays, England and Wales 2027 (Good Friday 26 March, Easter Monday 29 March).
    const view = await board();
    expect(view.assignments.find((a) => a.jobId === ids.jobId)!.days).toEqual(['2027-03-30', '2027-03-31']);
    expect(view.assignments.find((a) => a.jobId === nextJob)!.days).toEqual(['2027-04-01', '2027-04-02']);
  });

  it("ripples the crew's next job across the crew's leave", async () => {
    await request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'crew', crewId: ids.crewId, label: 'First aid course', startDate: '2027-04-01', endDate: '2027-04-01' }).expect(201);
    const nextJob = await followingJob();
    expect((await board()).assignments.find((a) => a.jobId === nextJob)!.days).toEqual(['2027-03-31', '2027-04-02']);
    const hold = (await raise().expect(201)).body as WeatherHoldDto;
    const preview = (await request(h.app).post(`/api/weather-holds/${hold.id}/preview`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    // Source: gov.uk bank holidays, England and Wales 2027: Easter Monday is 29 March, so Friday 2 and Monday 5 April are
    // working days; the crew is off on Thursday 1 April.
    expect(preview.moves.map((m) => [m.jobId, m.toDays])).toEqual([
      [ids.jobId, ['2027-03-30', '2027-03-31']],
      [nextJob, ['2027-04-02', '2027-04-05']],
    ]);
    await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push-and-ripple', version: hold.version, planKey: preview.planKey }).expect(200);
    expect((await board()).assignments.find((a) => a.jobId === nextJob)!.days).toEqual(['2027-04-02', '2027-04-05']);
  });

  it('previews exactly the booking changes the commit makes, a scaffold shared with a job on another crew included', async () => {
    const porchCrew = (await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Porch crew', colour: '#553344' }).expect(201)).body.id as string;
    const neighbour = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Porch roof next door', workTypes: ['roofing'], estimatedWorkingDays: 2 }).expect(201);
    await request(h.app).post(`/api/jobs/${neighbour.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: neighbour.body.id, crewId: porchCrew, startDate: '2027-04-06' }).expect(201);
    const book = async (jobIds: string[], accessType: string, states: string[]) => {
      let booking = (await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds, accessType, supplierId: ids.supplierId }).expect(201)).body as AccessBookingDto;
      for (const state of states) booking = (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state, version: booking.version }).expect(200)).body as AccessBookingDto;
      return booking.id;
    };
    const shared = await book([ids.jobId, neighbour.body.id], 'scaffold', ['confirmed']);
    const tower = await book([ids.jobId], 'tower', []);
    const edge = await book([ids.jobId], 'edge-protection', ['confirmed', 'erected']);
    const hold = (await raise().expect(201)).body as WeatherHoldDto;
    const preview = (await request(h.app).post(`/api/weather-holds/${hold.id}/preview`).set(owner.auth).send({ mode: 'push', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    const byBooking = (id: string) => preview.accessChanges.find((c) => c.bookingId === id);
    // Source: gov.uk bank holidays, England and Wales 2027 (Good Friday 26 March, Easter Monday 29 March): the job moves to
    // 30–31 March, so access goes up on Thursday 25 March; the shared scaffold stays for the porch (6–7 April) until 8 April.
    expect(byBooking(shared)).toMatchObject({ effect: 'asks-supplier', fromErect: '2027-03-24', fromStrike: '2027-04-08', toErect: '2027-03-25', toStrike: '2027-04-08' });
    expect(byBooking(tower)).toMatchObject({ effect: 'follows', fromErect: '2027-03-24', fromStrike: '2027-03-31', toErect: '2027-03-25', toStrike: '2027-04-01' });
    // Erected on 24 March (today): only its strike can move.
    expect(byBooking(edge)).toMatchObject({ effect: 'asks-supplier', toErect: '2027-03-24', toStrike: '2027-04-01' });
    expect(preview.accessChanges).toHaveLength(3);

    await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push', version: hold.version }).expect(200);
    const after = (await request(h.app).get('/api/access-bookings').query({ jobId: ids.jobId }).set(owner.auth).expect(200)).body as AccessBookingDto[];
    const made = after.filter((b) => b.state !== 'cancelled').map((b) => ({
      bookingId: b.id,
      effect: b.state === 'requested' ? 'follows' : 'asks-supplier',
      toErect: b.state === 'requested' ? b.requestedErect : b.pendingChange?.newErect,
      toStrike: b.state === 'requested' ? b.requestedStrike : b.pendingChange?.newStrike,
    }));
    const previewed = preview.accessChanges.map((c) => ({ bookingId: c.bookingId, effect: c.effect, toErect: c.toErect, toStrike: c.toStrike }));
    const order = (rows: Array<{ bookingId: string }>) => [...rows].sort((a, b) => a.bookingId.localeCompare(b.bookingId));
    expect(order(made)).toEqual(order(previewed));
    const requests = (await h.dataSource.query(`SELECT booking_id FROM access_change_request WHERE status = 'pending'`)) as Array<{ booking_id: string }>;
    expect(requests.map((r) => r.booking_id).sort()).toEqual([shared, edge].sort());
  });

  it('asks a confirmed scaffold supplier once when a re-plan moves the job', async () => {
    const supplier = await request(h.app).post('/api/suppliers').set(owner.auth).send({ name: 'Steady Tube', email: 'desk@steadytube.example', weeklyRates: { scaffold: 12_000 } }).expect(201);
    const booking = await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [ids.jobId], accessType: 'scaffold', supplierId: supplier.body.id }).expect(201);
    await request(h.app).post(`/api/access-bookings/${booking.body.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.body.version }).expect(200);
    const hold = (await raise().expect(201)).body as WeatherHoldDto;
    const preview = (await request(h.app).post(`/api/weather-holds/${hold.id}/preview`).set(owner.auth).send({ mode: 'push', version: hold.version }).expect(200)).body as ReplanPreviewDto;
    expect(preview.accessChanges).toEqual([expect.objectContaining({ effect: 'asks-supplier', toErect: '2027-03-25', toStrike: '2027-04-01' })]);
    await request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode: 'push', version: hold.version }).expect(200);
    expect(h.mailer.outbox.filter((m) => m.to === 'desk@steadytube.example')).toHaveLength(1);
  });
});

describe('settling a stand-down', () => {
  const raise = (dates: string[], auth = owner.auth) => request(h.app).post('/api/weather-holds').set(auth).send({ jobId: ids.jobId, dates, reason: 'wind' });
  const jobStatus = async () => (await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200)).body.status as string;
  const commit = (hold: WeatherHoldDto, mode: string) => request(h.app).post(`/api/weather-holds/${hold.id}/commit`).set(owner.auth).send({ mode, version: hold.version });
  const withdraw = (hold: WeatherHoldDto, auth = owner.auth, version = hold.version) =>
    request(h.app).post(`/api/weather-holds/${hold.id}/withdraw`).set(auth).send({ version, reason: 'The wind dropped' });
  const summary = async () => (await request(h.app).get('/api/weather-holds/summary').set(owner.auth).expect(200)).body as { byJob: Array<{ jobId: string; days: number }>; byCrew: Array<{ crewId: string; days: number }> };

  it('puts a job that was on site back on site once the re-plan is committed', async () => {
    await request(h.app).post(`/api/jobs/${ids.jobId}/status`).set(owner.auth).send({ status: 'on-site' }).expect(200);
    const hold = (await raise(['2027-03-30']).expect(201)).body as WeatherHoldDto;
    expect(await jobStatus()).toBe('stood-down');
    await commit(hold, 'push').expect(200);
    expect(await jobStatus()).toBe('on-site');
  });

  it('keeps the job stood down with nothing moved only while a held day is today or ahead', async () => {
    const hold = (await raise(['2027-03-25']).expect(201)).body as WeatherHoldDto;
    await commit(hold, 'none').expect(200);
    expect(await jobStatus()).toBe('stood-down');
    expect(await h.services.weather.releasePassedStandDowns()).toBe(0);
    h.now.value = new Date('2027-03-25T18:00:00Z');
    expect(await h.services.weather.releasePassedStandDowns()).toBe(0);
    h.now.value = new Date('2027-03-26T07:00:00Z');
    expect(await h.services.weather.releasePassedStandDowns()).toBe(1);
    expect(await jobStatus()).toBe('scheduled');
    expect(await h.services.weather.releasePassedStandDowns()).toBe(0);
    const history = (await request(h.app).get(`/api/jobs/${ids.jobId}/history`).set(owner.auth).expect(200)).body as Array<{ action: string }>;
    expect(history.map((e) => e.action)).toContain('stand-down-ended');
  });

  it('withdraws a stand-down: the job goes back to work, the days stop counting, the crew is told, and it is written down', async () => {
    const seen: Array<{ type: string; crewIds?: string[] }> = [];
    const stop = h.services.events.subscribe((event) => void seen.push({ type: event.type, crewIds: event.crewIds }));
    const hold = (await raise(['2027-03-25']).expect(201)).body as WeatherHoldDto;
    expect((await summary()).byJob).toEqual([{ jobId: ids.jobId, days: 1 }]);
    await withdraw(hold, owner.auth, hold.version + 1).expect(409);
    const withdrawn = (await withdraw(hold).expect(200)).body as WeatherHoldDto;
    stop();
    expect(withdrawn).toMatchObject({ status: 'withdrawn', version: hold.version + 1 });
    expect(await jobStatus()).toBe('scheduled');
    expect((await summary()).byJob).toEqual([]);
    expect(seen).toContainEqual({ type: 'hold:withdrawn', crewIds: [ids.crewId] });
    const history = (await request(h.app).get(`/api/jobs/${ids.jobId}/history`).set(owner.auth).expect(200)).body as Array<{ action: string }>;
    expect(history.map((e) => e.action)).toContain('stand-down-withdrawn');
    const again = await withdraw(withdrawn).expect(409);
    expect(again.headers['content-type']).toMatch(/application\/problem\+json/);
    // Withdrawn, its day can be stood down again.
    await raise(['2027-03-25']).expect(201);
  });

  it('refuses to withdraw a stand-down whose re-plan moved jobs', async () => {
    const hold = (await raise(['2027-03-25']).expect(201)).body as WeatherHoldDto;
    const replanned = (await commit(hold, 'push').expect(200), (await request(h.app).get('/api/weather-holds').set(owner.auth).expect(200)).body[0] as WeatherHoldDto);
    expect(replanned).toMatchObject({ status: 'replanned', replanMode: 'push' });
    const res = await withdraw(replanned).expect(409);
    expect(res.body.code).toBe('conflict');
  });

  it('lets a crew lead withdraw on their own crew only, and never an operative', async () => {
    const lead = await addPerson(h, owner, 'crew-lead', 'lead@heather.example');
    const operative = await addPerson(h, owner, 'operative', 'op@heather.example');
    const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
    const member = (email: string) => people.find((p) => p.email === email)!.id;
    const hold = (await raise(['2027-03-25']).expect(201)).body as WeatherHoldDto;
    await withdraw(hold, operative.auth).expect(403);
    await withdraw(hold, lead.auth).expect(404);
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth)
      .send({ name: 'Gable crew', colour: '#445566', leadMemberId: member('lead@heather.example'), memberIds: [member('lead@heather.example'), member('op@heather.example')] }).expect(200);
    await withdraw(hold, operative.auth).expect(403);
    await withdraw(hold, lead.auth).expect(200);
  });

  it('refuses a second stand-down of days already stood down with 409 and stores nothing', async () => {
    await raise(['2027-03-25']).expect(201);
    const before = await countRows(h.dataSource);
    const res = await raise(['2027-03-25', '2027-03-30']).expect(409);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'conflict', status: 409 });
    expect(res.body.detail).toMatch(/already stood down on Thu 25 Mar/);
    expect(await countRows(h.dataSource)).toEqual(before);
    await raise(['2027-03-30']).expect(201);
    expect((await summary()).byJob).toEqual([{ jobId: ids.jobId, days: 2 }]);
  });

  it('stores one of two stand-downs of the same day sent at once and refuses the other', async () => {
    const [a, b] = await Promise.all([raise(['2027-03-25']), raise(['2027-03-25'])]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    expect((await request(h.app).get('/api/weather-holds').set(owner.auth).expect(200)).body).toHaveLength(1);
  });

  it('counts a job-day once in the days lost however many stand-downs name it', async () => {
    const hold = (await raise(['2027-03-25']).expect(201)).body as WeatherHoldDto;
    // A second stand-down of the same day, as stored before overlaps were refused.
    await h.dataSource.query(
      `INSERT INTO weather_hold (firm_id, job_id, crew_id, dates, reason, raised_from, status, version) SELECT firm_id, job_id, crew_id, dates, 'rain', 'office', 'open', 1 FROM weather_hold WHERE id = $1`,
      [hold.id],
    );
    expect(await summary()).toEqual({ byJob: [{ jobId: ids.jobId, days: 1 }], byCrew: [{ crewId: ids.crewId, days: 1 }] });
  });

  it('records when the forecast seen at the stand-down was fetched', async () => {
    await refresh();
    const hold = (await raise(['2027-03-25']).expect(201)).body as WeatherHoldDto;
    expect(hold).toMatchObject({ forecastFetchedAt: '2027-03-24T06:00:00.000Z', forecastWasStale: false });
    expect(hold.forecastSeen.length).toBeGreaterThan(0);
  });
});

// The job moved to Monday 24 to Friday 28 May 2027 and stood down on its third day, Wednesday 26 May.
// Source: gov.uk bank holidays, England and Wales 2027: Spring bank holiday Monday 31 May.
describe('a stand-down in the middle of a job', () => {
  const week = ['2027-05-24', '2027-05-25', '2027-05-26', '2027-05-27', '2027-05-28'];
  beforeEach(async () => {
    await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth).send({ crewId: ids.crewId, startDate: week[0], workingDays: 5, version: 2 }).expect(200);
  });

  async function placeJob(title: string, crewId: string, startDate: string, days: number): Promise<string> {
    const res = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title, workTypes: ['garden-wall'], estimatedWorkingDays: days }).expect(201);
    await request(h.app).post(`/api/jobs/${res.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: res.body.id, crewId, startDate, confirmDoubleBooking: true }).expect(201);
    return res.body.id as string;
  }
  const newCrew = async (name: string) => (await request(h.app).post('/api/crews').set(owner.auth).send({ name, colour: '#335577' }).expect(201)).body.id as string;
  const standDown = async (dates = ['2027-05-26']) =>
    (await request(h.app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates, reason: 'rain' }).expect(201)).body as WeatherHoldDto;
  const replan = (step: 'preview' | 'commit', hold: WeatherHoldDto, body: object) =>
    request(h.app).post(`/api/weather-holds/${hold.id}/${step}`).set(owner.auth).send({ version: hold.version, ...body });
  const placed = async (jobId: string) => {
    const view = (await request(h.app).get('/api/board').query({ from: '2027-05-17', to: '2027-06-18' }).set(owner.auth).expect(200)).body as BoardDto;
    return view.assignments.find((a) => a.jobId === jobId)!;
  };

  it('keeps the start and the days worked, and adds the lost day after the bank holiday', async () => {
    const hold = await standDown();
    const preview = (await replan('preview', hold, { mode: 'push' }).expect(200)).body as ReplanPreviewDto;
    expect(preview.moves.map((m) => [m.jobId, m.toDays])).toEqual([[ids.jobId, [...week, '2027-06-01']]]);
    const committed = (await replan('commit', hold, { mode: 'push' }).expect(200)).body as ReplanPreviewDto;
    expect(committed.moves).toEqual(preview.moves);
    expect(await placed(ids.jobId)).toMatchObject({ crewId: ids.crewId, startDate: '2027-05-24', workingDays: 6, days: [...week, '2027-06-01'] });
  });

  it("ripples the crew's next job past the new end and leaves the one after a gap", async () => {
    const next = await placeJob('Coping stones', ids.crewId, '2027-06-01', 2);
    const afterGap = await placeJob('Gate piers', ids.crewId, '2027-06-04', 1);
    const hold = await standDown();
    const preview = (await replan('preview', hold, { mode: 'push-and-ripple' }).expect(200)).body as ReplanPreviewDto;
    expect(preview.moves.map((m) => [m.jobId, m.toDays])).toEqual([
      [ids.jobId, [...week, '2027-06-01']],
      [next, ['2027-06-02', '2027-06-03']],
    ]);
    await replan('commit', hold, { mode: 'push-and-ripple' }).expect(200);
    expect((await placed(next)).days).toEqual(['2027-06-02', '2027-06-03']);
    expect((await placed(afterGap)).days).toEqual(['2027-06-04']);
  });

  it('gives another crew only the days left and keeps the days worked in the history', async () => {
    const ridge = await newCrew('Ridge crew');
    const hold = await standDown();
    const early = await replan('preview', hold, { mode: 'move-crew', crewId: ridge, startDate: '2027-05-25' }).expect(400);
    expect(early.body.errors[0].path).toBe('startDate');
    const preview = (await replan('preview', hold, { mode: 'move-crew', crewId: ridge, startDate: '2027-05-26' }).expect(200)).body as ReplanPreviewDto;
    expect(preview.workedDays).toEqual(['2027-05-24', '2027-05-25']);
    expect(preview.moves).toEqual([expect.objectContaining({ jobId: ids.jobId, fromCrewId: ids.crewId, toCrewId: ridge, fromDays: week, toDays: ['2027-05-26', '2027-05-27', '2027-05-28'] })]);
    await replan('commit', hold, { mode: 'move-crew', crewId: ridge, startDate: '2027-05-26' }).expect(200);
    expect(await placed(ids.jobId)).toMatchObject({ crewId: ridge, workingDays: 3, days: ['2027-05-26', '2027-05-27', '2027-05-28'] });
    const history = (await request(h.app).get(`/api/jobs/${ids.jobId}/history`).set(owner.auth).expect(200)).body as Array<{ action: string; before: { crewId?: string; days?: string[] } | null }>;
    expect(history.find((e) => e.action === 'replanned' && e.before?.days)?.before).toEqual({ crewId: ids.crewId, days: week });
  });

  it("plans the move onto the other crew's bookings: after the job it has begun, rippling its later job, all in the preview", async () => {
    const ridge = await newCrew('Ridge crew');
    const underWay = await placeJob('Chimney stack', ridge, '2027-05-25', 2);
    const booked = await placeJob('Lintel over the door', ridge, '2027-05-28', 1);
    const clear = await placeJob('Soakaway', ridge, '2027-06-10', 1);
    const hold = await standDown();
    const body = { mode: 'move-crew', crewId: ridge, startDate: '2027-05-26' };
    const preview = (await replan('preview', hold, body).expect(200)).body as ReplanPreviewDto;
    // Ridge crew is on the chimney until Wednesday 26 May, so it takes the three days left from Thursday 27 May, over the
    // Spring bank holiday (Monday 31 May), and its lintel job moves to Wednesday 2 June.
    expect(preview.moves.map((m) => [m.jobId, m.fromCrewId, m.toCrewId, m.toDays])).toEqual([
      [ids.jobId, ids.crewId, ridge, ['2027-05-27', '2027-05-28', '2027-06-01']],
      [booked, ridge, ridge, ['2027-06-02']],
    ]);
    expect(preview.warnings.join(' ')).toMatch(/Ridge crew is still on .* on Wed 26 May, so they start on Thu 27 May/);
    const committed = (await replan('commit', hold, body).expect(200)).body as ReplanPreviewDto;
    expect(committed.moves).toEqual(preview.moves);
    expect((await placed(ids.jobId)).days).toEqual(['2027-05-27', '2027-05-28', '2027-06-01']);
    expect((await placed(booked)).days).toEqual(['2027-06-02']);
    expect((await placed(underWay)).days).toEqual(['2027-05-25', '2027-05-26']);
    expect((await placed(clear)).days).toEqual(['2027-06-10']);
  });

  it("tells both crews' phones when the job moves from one to the other", async () => {
    const ridge = await newCrew('Ridge crew');
    await leadWithPhone('gable-lead@heather.example', ids.crewId);
    await leadWithPhone('ridge-lead@heather.example', ridge);
    const hold = await standDown();
    await pushesSent();
    pushes.length = 0;
    const moved: string[][] = [];
    const stop = h.services.events.subscribe((event) => {
      if (event.type === 'assignment:moved') moved.push([...(event.crewIds ?? [])].sort());
    });
    await replan('commit', hold, { mode: 'move-crew', crewId: ridge, startDate: '2027-05-26' }).expect(200);
    stop();
    expect(moved).toEqual([[ids.crewId, ridge].sort()]);
    const sent = await pushesSent();
    expect(sent.map((p) => p.endpoint).sort()).toEqual(['https://push.example/gable-lead@heather.example', 'https://push.example/ridge-lead@heather.example']);
    expect(sent.every((p) => p.message.body.includes('Wed 26 May to Fri 28 May'))).toBe(true);
  });
});

describe('who may stand down and re-plan', () => {
  const raiseAs = (who: SignedIn, jobId = ids.jobId) => request(h.app).post('/api/weather-holds').set(who.auth).send({ jobId, dates: ['2027-03-25'], reason: 'wind' });

  it('refuses an operative a stand-down with 403 and stores nothing', async () => {
    const operative = await addPerson(h, owner, 'operative', 'op@heather.example');
    const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth)
      .send({ name: 'Gable crew', colour: '#445566', memberIds: [people.find((p) => p.email === 'op@heather.example')!.id] }).expect(200);
    const before = await countRows(h.dataSource);
    const res = await raiseAs(operative).expect(403);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'forbidden', status: 403 });
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  it("lets a crew lead stand down their own crew's job from site, and answers 404 for another crew's", async () => {
    const lead = await leadWithPhone('lead@heather.example', ids.crewId);
    const porchCrew = (await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Porch crew', colour: '#553344' }).expect(201)).body.id as string;
    const porch = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Porch roof', workTypes: ['roofing'], estimatedWorkingDays: 1 }).expect(201);
    await request(h.app).post(`/api/jobs/${porch.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: porch.body.id, crewId: porchCrew, startDate: '2027-03-25' }).expect(201);
    const before = await countRows(h.dataSource);
    const other = await raiseAs(lead, porch.body.id).expect(404);
    expect(other.body.code).toBe('not-found');
    expect(await countRows(h.dataSource)).toEqual(before);
    expect((await raiseAs(lead).expect(201)).body).toMatchObject({ raisedFrom: 'crew', crewId: ids.crewId, status: 'open' });
  });

  it('refuses a crew lead the preview and the commit with 403 and moves nothing', async () => {
    const lead = await leadWithPhone('lead@heather.example', ids.crewId);
    const hold = (await raiseAs(lead).expect(201)).body as WeatherHoldDto;
    for (const step of ['preview', 'commit']) {
      const res = await request(h.app).post(`/api/weather-holds/${hold.id}/${step}`).set(lead.auth).send({ mode: 'push', version: hold.version }).expect(403);
      expect(res.body.code).toBe('forbidden');
    }
    expect((await board()).assignments.find((a) => a.jobId === ids.jobId)!.days).toEqual(['2027-03-25', '2027-03-30']);
    expect((await request(h.app).get('/api/weather-holds').set(owner.auth).expect(200)).body[0]).toMatchObject({ id: hold.id, status: 'open' });
  });
});

describe('the hosted-service adapters against the local fake', () => {
  const fake = createWeatherFake({ port: 0, scenario: 'showers' });
  beforeEach(async () => {
    await fake.start();
  });
  afterEach(async () => {
    await fake.stop();
  });

  it('reads hourly forecasts in m/s and probabilities as fractions', async () => {
    const hours = await new HttpForecastProvider(fake.url()).hourly(53.8, -1.55, 2);
    expect(hours.length).toBeGreaterThanOrEqual(48);
    const wet = hours.find((hour) => hour.precipMm > 0)!;
    expect(wet).toMatchObject({ precipMm: 2.5, precipProbability: 0.85 });
    expect(wet.time).toMatch(/Z$/);
  });

  it('looks up a postcode and answers null for one that does not exist', async () => {
    const geocoder = new HttpGeocoder(fake.url());
    const found = await geocoder.locate('LS6 2AB');
    expect(found!.lat).toBeGreaterThan(49);
    expect(await geocoder.locate('NOT A CODE')).toBeNull();
  });
});
