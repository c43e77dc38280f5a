import request from 'supertest';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listResourceRoutes } from '../src/app.js';
import { addPerson, countRows, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { quoteFixture } from './quotes-helpers.js';

type Ids = Awaited<ReturnType<typeof populateFirm>>;

let h: Harness;
let firmA: Record<string, SignedIn>;
let idsA: Ids;
let idsB: Ids;
let ownerB: SignedIn;
let crewPhoneB: { photoId: string; feedId: string };
let holdB: string;
let inspectionB: string;
let quotesB: Awaited<ReturnType<typeof quoteFixture>>;

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  const ownerA = await signUpFirm(h, 'Alder Masonry', 'owner@alder.example');
  ownerB = await signUpFirm(h, 'Birch Builders', 'owner@birch.example');
  idsA = await populateFirm(h, ownerA);
  idsB = await populateFirm(h, ownerB);
  const jpeg = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#777' } }).jpeg().toBuffer();
  crewPhoneB = {
    photoId: (await request(h.app).post('/api/photos').set(ownerB.auth).field('jobId', idsB.jobId).attach('photo', jpeg, 'b.jpg').expect(201)).body.id,
    feedId: (await request(h.app).post('/api/calendar-feeds').set(ownerB.auth).expect(201)).body.id,
  };
  await request(h.app).post('/api/weather-holds').set(ownerA.auth).send({ jobId: idsA.jobId, dates: ['2027-03-02'], reason: 'wind' }).expect(201);
  holdB = (await request(h.app).post('/api/weather-holds').set(ownerB.auth).send({ jobId: idsB.jobId, dates: ['2027-03-01'], reason: 'rain' }).expect(201)).body.id;
  // Firm B's booking goes up and is inspected once, so the inspection routes have a foreign id to probe.
  const confirmedB = await request(h.app).post(`/api/access-bookings/${idsB.bookingId}/state`).set(ownerB.auth).send({ state: 'confirmed', version: 1 }).expect(200);
  await request(h.app).post(`/api/access-bookings/${idsB.bookingId}/state`).set(ownerB.auth).send({ state: 'erected', version: confirmedB.body.version }).expect(200);
  inspectionB = (await request(h.app).post(`/api/access-bookings/${idsB.bookingId}/inspections`).set(ownerB.auth)
    .send({ inspectedAt: new Date(Date.now() - 60_000).toISOString(), inspectorName: 'Birch inspector', result: 'safe' }).expect(201)).body.id;
  await quoteFixture(h, ownerA, idsA.jobId);
  quotesB = await quoteFixture(h, ownerB, idsB.jobId);
  firmA = {
    owner: ownerA,
    office: await addPerson(h, ownerA, 'office', 'office@alder.example'),
    'crew-lead': await addPerson(h, ownerA, 'crew-lead', 'lead@alder.example'),
    operative: await addPerson(h, ownerA, 'operative', 'op@alder.example'),
  };
});
afterAll(async () => {
  await h.dataSource.destroy();
});

/** Which of firm B's ids each id route is probed with, and a body valid apart from the foreign ids. */
function probeFor(method: string, path: string): { url: string; body?: object } | null {
  const resource = path.split('/')[2];
  const idOf: Record<string, string> = {
    photos: crewPhoneB.photoId, 'calendar-feeds': crewPhoneB.feedId,
    quotes: quotesB.quoteId, materials: quotesB.materialId, costing: idsB.jobId,
    people: idsB.memberId, crews: idsB.crewId, clients: idsB.clientId, sites: idsB.siteId, jobs: idsB.jobId,
    assignments: idsB.assignmentId, 'time-off': idsB.timeOffId, suppliers: idsB.supplierId, 'access-bookings': idsB.bookingId,
    'weather-holds': holdB,
  };
  const url = path.replace(':id', idOf[resource ?? ''] ?? 'missing').replace(':inspectionId', inspectionB);
  const bodies: Record<string, object> = {
    'POST /api/weather-holds/:id/preview': { mode: 'push', version: 1 },
    'POST /api/weather-holds/:id/commit': { mode: 'push', version: 1 },
    'POST /api/weather-holds/:id/withdraw': { version: 1 },
    'POST /api/assignments/:id/progress': { date: '2027-03-01', remainingWorkingDays: 1, version: 1 },
    'PUT /api/quotes/:id': { content: quotesB.content, version: 1 },
    'POST /api/quotes/:id/send': { version: 1 },
    'POST /api/quotes/:id/revise': { version: 1 },
    'PUT /api/materials/:id': { name: 'Taken over', unit: 'each', unitPricePence: 1 },
    'PUT /api/costing/actuals/:id': { extraMaterialsPence: 0 },
    'PATCH /api/people/:id': { role: 'operative' },
    'PUT /api/crews/:id': { name: 'Taken over', colour: '#112233' },
    'PUT /api/clients/:id': { name: 'Taken over' },
    'PUT /api/sites/:id': { clientId: idsA.clientId, addressLine1: '1 Other Road', town: 'Elsewhere', postcode: 'EL1 1SE' },
    'PUT /api/jobs/:id': { clientId: idsA.clientId, siteId: idsA.siteId, title: 'Taken over', workTypes: ['repairs'], estimatedWorkingDays: 1 },
    'POST /api/jobs/:id/status': { status: 'quoted' },
    'PUT /api/assignments/:id': { crewId: idsA.crewId, startDate: '2027-03-08', workingDays: 2, version: 1 },
    'PUT /api/time-off/:id': { scope: 'firm', label: 'Taken over', startDate: '2027-04-01', endDate: '2027-04-01' },
    'PUT /api/suppliers/:id': { name: 'Taken over' },
    'POST /api/access-bookings/:id/state': { state: 'cancelled', version: 1 },
    'POST /api/access-bookings/:id/inspections': { inspectedAt: '2027-03-01T08:00:00Z', inspectorName: 'Intruder', result: 'safe' },
    'PUT /api/access-bookings/:id/handover': { handedOverOn: '2027-03-01', handedOverBy: 'Intruder', competentPersonName: 'Intruder', version: 1 },
  };
  if (method === 'DELETE' && path === '/api/assignments/:id') return { url: `${url}?version=1` };
  if (!path.includes(':id')) return null;
  return { url, body: bodies[`${method} ${path}`] };
}

/** Creates that point at another firm's rows must not find them. */
const foreignCreates = () => [
  { url: '/api/site-notes', body: { jobId: idsB.jobId, body: 'Borrowed note' } },
  { url: '/api/quotes', body: { jobId: idsB.jobId, content: quotesB.content } },
  { url: '/api/sites', body: { clientId: idsB.clientId, addressLine1: '9 Far Lane', town: 'Yonder', postcode: 'YO1 1AA' } },
  { url: '/api/jobs', body: { clientId: idsB.clientId, siteId: idsB.siteId, title: 'Borrowed', workTypes: ['repairs'], estimatedWorkingDays: 1 } },
  { url: '/api/crews', body: { name: 'Poached crew', colour: '#123456', memberIds: [idsB.memberId] } },
  { url: '/api/assignments', body: { jobId: idsB.jobId, crewId: idsA.crewId, startDate: '2027-05-03' } },
  { url: '/api/assignments', body: { jobId: idsA.jobId, crewId: idsB.crewId, startDate: '2027-05-03' } },
  { url: '/api/time-off', body: { scope: 'crew', crewId: idsB.crewId, label: 'Poached', startDate: '2027-05-03', endDate: '2027-05-03' } },
  { url: '/api/time-off', body: { scope: 'member', memberId: idsB.memberId, label: 'Poached', startDate: '2027-05-03', endDate: '2027-05-03' } },
  { url: '/api/access-bookings', body: { jobIds: [idsB.jobId], accessType: 'scaffold', supplierId: idsA.supplierId } },
  { url: '/api/weather-holds', body: { jobId: idsB.jobId, dates: ['2027-03-01'], reason: 'wind' } },
  { url: '/api/access-bookings', body: { jobIds: [idsA.jobId], accessType: 'scaffold', supplierId: idsB.supplierId } },
];

describe('firm isolation', () => {
  it('covers every resource route in this sweep', () => {
    const routes = listResourceRoutes(h.services);
    const collection = new Set(['GET /api/crew-days', 'GET /api/site-notes', 'POST /api/site-notes', 'GET /api/photos', 'POST /api/photos',
      'GET /api/photos/settings', 'PUT /api/photos/settings', 'GET /api/calendar-feeds', 'POST /api/calendar-feeds',
      'GET /api/push/config', 'POST /api/push/subscriptions', 'POST /api/push/subscriptions/remove',
      'GET /api/quotes', 'POST /api/quotes', 'GET /api/materials', 'POST /api/materials',
      'GET /api/materials/export', 'POST /api/materials/import', 'GET /api/costing/settings', 'PUT /api/costing/settings', 'GET /api/costing/report',
      'GET /api/people', 'POST /api/people/invite', 'GET /api/crews', 'POST /api/crews', 'GET /api/clients',
      'POST /api/clients', 'GET /api/sites', 'POST /api/sites', 'GET /api/jobs', 'POST /api/jobs', 'GET /api/firm', 'PUT /api/firm',
      'GET /api/board', 'GET /api/board/changes', 'POST /api/assignments', 'GET /api/time-off', 'POST /api/time-off',
      'GET /api/suppliers', 'POST /api/suppliers', 'GET /api/access-bookings', 'POST /api/access-bookings', 'GET /api/access-bookings/quoted-weeks',
      'GET /api/weather-holds', 'POST /api/weather-holds', 'GET /api/weather-holds/summary', 'GET /api/weather/outlook', 'POST /api/weather/refresh',
      'GET /api/weather/limits', 'PUT /api/weather/limits']);
    const uncovered = routes.filter((route) => !route.path.includes(':id') && !collection.has(`${route.method} ${route.path}`));
    expect(uncovered).toEqual([]);
    expect(routes.filter((route) => route.path.includes(':id')).length).toBeGreaterThanOrEqual(14);
  });

  it.each(['owner', 'office', 'crew-lead', 'operative'])('gives a %s of firm A 403/404 on every id of firm B and changes nothing', async (role) => {
    const actor = firmA[role]!;
    const before = await countRows(h.dataSource);
    for (const route of listResourceRoutes(h.services)) {
      const probe = probeFor(route.method, route.path);
      if (!probe) continue;
      const res = await request(h.app)[route.method.toLowerCase() as 'get'](probe.url).set(actor.auth).send(probe.body);
      expect([403, 404], `${role} ${route.method} ${probe.url} → ${res.status}`).toContain(res.status);
      expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
      expect(JSON.stringify(res.body)).not.toContain('Marsh End');
    }
    for (const create of foreignCreates()) {
      const res = await request(h.app).post(create.url).set(actor.auth).send(create.body);
      expect([403, 404], `${role} POST ${create.url} → ${res.status}`).toContain(res.status);
    }
    const quoted = await request(h.app).get(`/api/access-bookings/quoted-weeks?jobIds=${idsB.jobId}&accessType=scaffold`).set(actor.auth);
    expect([403, 404], `${role} GET quoted weeks of firm B's job → ${quoted.status}`).toContain(quoted.status);
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  it.each(['/api/quotes', '/api/materials', '/api/people', '/api/crews', '/api/clients', '/api/sites', '/api/jobs', '/api/time-off', '/api/suppliers', '/api/access-bookings', '/api/weather-holds', '/api/board?from=2027-02-22&to=2027-03-12'])('lists only firm A rows at %s', async (url) => {
    const res = await request(h.app).get(url).set(firmA.owner!.auth).expect(200);
    const body = res.body as { items?: Array<{ id: string }>; assignments?: Array<{ id: string }>; crews?: Array<{ id: string }> };
    const items = (Array.isArray(res.body) ? res.body : body.items ?? [...body.assignments!, ...body.crews!]) as Array<{ id: string }>;
    expect(items.length).toBeGreaterThan(0);
    const foreign = new Set([...Object.values(idsB), quotesB.quoteId, quotesB.materialId]);
    expect(items.filter((item) => foreign.has(item.id))).toEqual([]);
  });

  it("leaves firm B's settings alone when firm A saves its own", async () => {
    const before = await request(h.app).get('/api/firm').set(ownerB.auth).expect(200);
    await request(h.app).put('/api/firm').set(firmA.owner!.auth).send({ name: 'Alder Masonry Ltd' }).expect(200);
    const after = await request(h.app).get('/api/firm').set(ownerB.auth).expect(200);
    expect(after.body).toEqual(before.body);
  });

  it("leaves firm B's weather limits alone when firm A saves its own, and shows each firm only its own", async () => {
    await request(h.app).put('/api/weather/limits').set(ownerB.auth).send({ overrides: { towerMeanStopMs: 6 }, version: 0 }).expect(200);
    const before = await request(h.app).get('/api/weather/limits').set(ownerB.auth).expect(200);
    await request(h.app).put('/api/weather/limits').set(firmA.owner!.auth).send({ overrides: { mewpGustStopMs: 9 }, version: 0 }).expect(200);
    for (const role of ['owner', 'office']) {
      expect((await request(h.app).get('/api/weather/limits').set(firmA[role]!.auth).expect(200)).body.overrides).toEqual({ mewpGustStopMs: 9 });
    }
    expect((await request(h.app).get('/api/weather/limits').set(ownerB.auth).expect(200)).body).toEqual(before.body);
  });
});
