import request from 'supertest';
import fc from 'fast-check';
import sharp from 'sharp';
import type { ZodType } from 'zod';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listResourceRoutes, type RouteInfo } from '../src/app.js';
import { addPerson, countRows, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { quoteFixture } from './quotes-helpers.js';
import { arbitraryOf, fieldsOf } from './proof/zod-arbitrary.js';

type Ids = Awaited<ReturnType<typeof populateFirm>>;

// Names only firm B has, so a body that shows one of them shows firm B's data.
const FIRM_B_NAME = 'Birch Builders';
const FIRM_B_CLIENT = 'Quillet Hollow Farm';

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
  ownerB = await signUpFirm(h, FIRM_B_NAME, 'owner@birch.example');
  idsA = await populateFirm(h, ownerA);
  idsB = await populateFirm(h, ownerB, FIRM_B_CLIENT);
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

/** Every id and unique name of firm B's: none may appear in anything firm A is answered. */
function firmBMarks(): string[] {
  return [
    ...Object.values(idsB), quotesB.quoteId, quotesB.materialId, crewPhoneB.photoId, crewPhoneB.feedId, holdB, inspectionB,
    ownerB.session.firm.id, ownerB.session.user.id, FIRM_B_NAME, FIRM_B_CLIENT,
  ];
}

function expectNoFirmBData(body: unknown, what: string): void {
  const text = JSON.stringify(body);
  expect(firmBMarks().filter((mark) => text.includes(mark)), what).toEqual([]);
}

/** Firm B's id for a query field named after what it points at (`crewId`, `jobIds`); a new name fails the sweep until added. */
function foreignIdFor(key: string): string {
  const byName: Record<string, string> = {
    ...Object.fromEntries(Object.entries(idsB).map(([name, id]) => [name, id])),
    quoteId: quotesB.quoteId, materialId: quotesB.materialId, photoId: crewPhoneB.photoId, holdId: holdB, inspectionId: inspectionB,
  };
  const id = byName[`${key.replace(/Ids?$/, '')}Id`];
  if (!id) throw new Error(`The sweep has no firm B id for the query field ${key}; add one`);
  return id;
}

const isIdField = (field: { key: string; kind: string }) => field.kind === 'id' || /Ids?$/.test(field.key);

// The window of firm B's rows: its job is placed from 2027-03-01 and its leave is on 2027-04-09.
const WINDOW = { start: '2027-02-22', end: '2027-04-30' };

/** A value the field accepts that reaches firm B's rows if anything does: the dates around them, else any valid sample. */
function sampleFor(key: string, schema: ZodType): unknown {
  const date = key === 'to' || /To$|Until$/.test(key) ? WINDOW.end : WINDOW.start;
  const candidates = [date, date.slice(0, 7), ...fc.sample(arbitraryOf(schema, { ids: [] }), { numRuns: 20, seed: 2027 })];
  const found = candidates.find((candidate) => schema.safeParse(candidate).success);
  if (found === undefined) throw new Error(`no valid sample for the query field ${key}`);
  return found;
}

/**
 * The queries a collection route is swept with: the required fields filled in, then each id-like field in turn
 * given firm B's id. Read from the route's shared schema, so a new route or field is swept without editing this list.
 */
function foreignQueries(route: RouteInfo): Array<Record<string, unknown>> {
  const schema = route.spec?.query;
  if (!schema) return [{}];
  const fields = fieldsOf(schema);
  const idFields = fields.filter(isIdField);
  // Event ids are one sequence across firms: a feed read from the very start would carry firm B's events if it leaked any.
  const foreignValue = (field: { key: string; kind: string }) => (field.kind === 'number' ? 0 : foreignIdFor(field.key));
  const base: Record<string, unknown> = {};
  // Only what the route cannot do without: a default (page 1, 25 a page) already reaches firm B's rows if anything does.
  for (const field of fields.filter((f) => !f.schema.safeParse(undefined).success)) {
    base[field.key] = isIdField(field) ? foreignValue(field) : sampleFor(field.key, field.schema);
  }
  const queries = idFields.length ? idFields.map((field) => ({ ...base, [field.key]: foreignValue(field) })) : [base];
  for (const query of queries) {
    const parsed = schema.safeParse(query);
    if (!parsed.success) throw new Error(`${route.method} ${route.path}: the sweep built an invalid query ${JSON.stringify(query)}`);
  }
  return queries;
}

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
    // Collection reads are swept through their query strings below; these writes are probed by the creates that follow.
    const collection = new Set(['POST /api/site-notes', 'POST /api/photos', 'PUT /api/photos/settings',
      'POST /api/calendar-feeds', 'POST /api/push/subscriptions', 'POST /api/push/subscriptions/remove', 'POST /api/quotes',
      'POST /api/materials', 'POST /api/materials/import', 'PUT /api/costing/settings', 'POST /api/people/invite',
      'POST /api/crews', 'POST /api/clients', 'POST /api/sites', 'POST /api/jobs', 'PUT /api/firm', 'POST /api/assignments',
      'POST /api/time-off', 'POST /api/suppliers', 'POST /api/access-bookings', 'POST /api/weather-holds',
      'POST /api/weather/refresh', 'PUT /api/weather/limits']);
    const uncovered = routes.filter((route) => !route.path.includes(':id') && route.method !== 'GET' && !collection.has(`${route.method} ${route.path}`));
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
      expectNoFirmBData(res.body, `${role} ${route.method} ${probe.url}`);
    }
    for (const create of foreignCreates()) {
      const res = await request(h.app).post(create.url).set(actor.auth).send(create.body);
      expect([403, 404], `${role} POST ${create.url} → ${res.status}`).toContain(res.status);
    }
    const quoted = await request(h.app).get(`/api/access-bookings/quoted-weeks?jobIds=${idsB.jobId}&accessType=scaffold`).set(actor.auth);
    expect([403, 404], `${role} GET quoted weeks of firm B's job → ${quoted.status}`).toContain(quoted.status);
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  it('derives the query sweep from the shared schemas, reaching every id-like field the audit named', () => {
    const collectionGets = listResourceRoutes(h.services).filter((route) => route.method === 'GET' && !route.path.includes(':'));
    const swept = collectionGets.flatMap((route) => foreignQueries(route).map((query) => `${route.path}?${Object.keys(query).sort().join('&')}`));
    // A few the audit named, to show the derivation reaches them; the sweep itself covers every route it finds.
    expect(swept).toEqual(expect.arrayContaining([
      '/api/board?crewId&from&to', '/api/jobs?clientId', '/api/jobs?crewId', '/api/sites?clientId', '/api/site-notes?jobId',
      '/api/photos?jobId', '/api/weather-holds?jobId', '/api/access-bookings/quoted-weeks?accessType&jobIds', '/api/board/changes?afterEventId',
      '/api/crew-days?', '/api/costing/report?from&to',
    ]));
  });

  it.each(['owner', 'office', 'crew-lead', 'operative'])(
    "gives a %s of firm A 403/404, or none of firm B's data, on every collection read with firm B's ids in the query",
    async (role) => {
      const actor = firmA[role]!;
      const before = await countRows(h.dataSource);
      let answered = 0;
      for (const route of listResourceRoutes(h.services).filter((r) => r.method === 'GET' && !r.path.includes(':'))) {
        for (const query of foreignQueries(route)) {
          const res = await request(h.app).get(route.path).query(query).set(actor.auth);
          const what = `${role} GET ${route.path}?${new URLSearchParams(query as Record<string, string>)} → ${res.status}`;
          expect([200, 403, 404], what).toContain(res.status);
          if (res.status === 200) answered += 1;
          else expect(res.headers['content-type'], what).toMatch(/application\/problem\+json/);
          expectNoFirmBData(res.type === 'application/json' || res.type === 'application/problem+json' ? res.body : res.text, what);
        }
      }
      // Every role reads some collections, so the "no firm B data" side of the sweep is exercised too.
      expect(answered).toBeGreaterThan(0);
      expect(await countRows(h.dataSource)).toEqual(before);
    },
  );

  it.each(['/api/quotes', '/api/materials', '/api/people', '/api/crews', '/api/clients', '/api/sites', '/api/jobs', '/api/time-off', '/api/suppliers', '/api/access-bookings', '/api/weather-holds', '/api/board?from=2027-02-22&to=2027-03-12'])('lists only firm A rows at %s', async (url) => {
    const res = await request(h.app).get(url).set(firmA.owner!.auth).expect(200);
    const body = res.body as { items?: Array<{ id: string }>; assignments?: Array<{ id: string }>; crews?: Array<{ id: string }> };
    const items = (Array.isArray(res.body) ? res.body : body.items ?? [...body.assignments!, ...body.crews!]) as Array<{ id: string }>;
    expect(items.length).toBeGreaterThan(0);
    const foreign = new Set([...Object.values(idsB), quotesB.quoteId, quotesB.materialId]);
    expect(items.filter((item) => foreign.has(item.id))).toEqual([]);
    expectNoFirmBData(res.body, url);
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
