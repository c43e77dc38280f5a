import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHarness, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

let h: Harness;
let owner: SignedIn;
const clientIds: Record<string, string> = {};

// Names whose order is the same byte-wise and by dictionary, so the test does not depend on the database's collation.
const CLIENTS = [
  { name: 'Cedar Lodge', contacts: [{ name: 'Rhian Cole', email: 'bookings@cedar.example' }] },
  { name: 'Alder Farm', contacts: [{ email: 'alder@farm.example' }, { name: 'Tobias Wren', role: 'Farm manager', phone: '07700 900123' }] },
  { name: 'Elm Cottage', contacts: [{ email: 'elm@cottage.example' }] },
  { name: 'Birch House', contacts: [{ email: 'office@birch.example' }, { name: 'Nell Okafor', role: 'Tenant' }] },
  { name: 'Damson Barn', contacts: [{ email: 'damson@barn.example' }] },
  { name: 'Lime 100% Mortars', contacts: [{ email: 'sales@lime.example' }] },
  { name: 'Under_Pinning Co', contacts: [{ email: 'info@underpinning.example' }] },
];
const mainEmail = (client: { contacts: Array<{ email?: string }> }) => client.contacts[0]!.email!;

const SITES = [
  { client: 'Alder Farm', addressLine1: '1 Orchard Way', town: 'Callowmere', postcode: 'CM1 1AB' },
  { client: 'Alder Farm', addressLine1: '2 Mill Lane', town: 'Saltby Cross', postcode: 'SX4 2CD' },
  { client: 'Birch House', addressLine1: '9 Kiln Row', town: 'Greenhythe', postcode: 'GH2 7EF' },
  { client: 'Cedar Lodge', addressLine1: '14 Quarry Row', town: 'Thornley Edge', postcode: 'TE3 5GH' },
  { client: 'Elm Cottage', addressLine1: '3 Chapel Walk', town: 'Callowmere', postcode: 'CM9 4JK' },
];

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Paging Masonry', 'owner@paging.example');
  for (const client of CLIENTS) {
    const res = await request(h.app).post('/api/clients').set(owner.auth).send(client).expect(201);
    clientIds[client.name] = res.body.id;
  }
  for (const { client, ...site } of SITES) {
    await request(h.app).post('/api/sites').set(owner.auth).send({ clientId: clientIds[client], ...site }).expect(201);
  }
  // Another firm with look-alike rows: none of them may appear in this firm's pages or totals.
  const other = await signUpFirm(h, 'Other Masonry', 'owner@other.example');
  const stranger = await request(h.app).post('/api/clients').set(other.auth).send({ name: 'Alder Farm Two', contacts: [{ name: 'Tobias Wren', email: 'alder@elsewhere.example' }] }).expect(201);
  await request(h.app).post('/api/sites').set(other.auth).send({ clientId: stranger.body.id, addressLine1: '1 Orchard Way', town: 'Callowmere', postcode: 'CM1 1AB' }).expect(201);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

async function list(path: string, query: Record<string, string | number>) {
  const res = await request(h.app).get(path).query(query).set(owner.auth).expect(200);
  return res.body as { items: Array<Record<string, unknown>>; total: number; page: number; pageSize: number };
}

const byName = [...CLIENTS.map((c) => c.name)].sort();

describe('clients table', () => {
  it('pages through the clients sorted by name', async () => {
    const first = await list('/api/clients', { page: 1, pageSize: 3, sort: 'name' });
    expect(first).toMatchObject({ total: CLIENTS.length, page: 1, pageSize: 3 });
    expect(first.items.map((c) => c.name)).toEqual(byName.slice(0, 3));
    const second = await list('/api/clients', { page: 2, pageSize: 3, sort: 'name' });
    expect(second.items.map((c) => c.name)).toEqual(byName.slice(3, 6));
    const last = await list('/api/clients', { page: 3, pageSize: 3, sort: 'name' });
    expect(last.items.map((c) => c.name)).toEqual(byName.slice(6));
    const beyond = await list('/api/clients', { page: 4, pageSize: 3, sort: 'name' });
    expect(beyond).toMatchObject({ items: [], total: CLIENTS.length, page: 4 });
  });

  it('sorts descending, by e-mail and by creation', async () => {
    expect((await list('/api/clients', { sort: 'name', order: 'desc' })).items.map((c) => c.name)).toEqual([...byName].reverse());
    // By the main contact's e-mail.
    const byEmail = (await list('/api/clients', { sort: 'email' })).items as Array<{ contacts: Array<{ email: string }> }>;
    expect(byEmail.map(mainEmail)).toEqual(CLIENTS.map(mainEmail).sort());
    expect((await list('/api/clients', { sort: 'createdAt', order: 'desc', pageSize: 2 })).items.map((c) => c.name)).toEqual(['Under_Pinning Co', 'Lime 100% Mortars']);
  });

  it('searches name and every contact without regard to case, and counts only the matches', async () => {
    const byNamePart = await list('/api/clients', { q: 'cOTTAGE' });
    expect(byNamePart).toMatchObject({ total: 1 });
    expect(byNamePart.items.map((c) => c.name)).toEqual(['Elm Cottage']);
    const byEmail = await list('/api/clients', { q: 'office@' });
    expect(byEmail.items.map((c) => c.name)).toEqual(['Birch House']);
    // A second contact's name, role and phone are found too.
    expect((await list('/api/clients', { q: 'tobias' })).items.map((c) => c.name)).toEqual(['Alder Farm']);
    expect((await list('/api/clients', { q: 'tenant' })).items.map((c) => c.name)).toEqual(['Birch House']);
    expect((await list('/api/clients', { q: '900123' })).items.map((c) => c.name)).toEqual(['Alder Farm']);
    // The field names inside the stored contacts are not text to find.
    expect(await list('/api/clients', { q: 'phone' })).toMatchObject({ items: [], total: 0 });
    const paged = await list('/api/clients', { q: 'AR', sort: 'name', pageSize: 2, page: 2 });
    // Alder Farm, bookings@cedar…, Damson Barn, Lime 100% Mortars.
    expect(paged.total).toBe(4);
    expect(paged.items.map((c) => c.name)).toEqual(['Damson Barn', 'Lime 100% Mortars']);
  });

  it('takes % and _ in a search literally', async () => {
    const percent = await list('/api/clients', { q: '%' });
    expect(percent.items.map((c) => c.name)).toEqual(['Lime 100% Mortars']);
    const underscore = await list('/api/clients', { q: '_' });
    expect(underscore.items.map((c) => c.name)).toEqual(['Under_Pinning Co']);
    expect(await list('/api/clients', { q: 'no such client' })).toMatchObject({ items: [], total: 0 });
  });

  it.each([
    [{ sort: 'firmId' }, 'query.sort'],
    [{ pageSize: 500 }, 'query.pageSize'],
    [{ page: 0 }, 'query.page'],
    [{ order: 'sideways' }, 'query.order'],
  ])('refuses %o with 400 naming %s', async (query, field) => {
    const res = await request(h.app).get('/api/clients').query(query).set(owner.auth).expect(400);
    expect(res.body.code).toBe('validation-failed');
    expect((res.body.errors as Array<{ path: string }>).map((e) => e.path)).toContain(field);
  });
});

describe('sites table', () => {
  it('pages through the sites sorted by postcode by default', async () => {
    const postcodes = SITES.map((s) => s.postcode).sort();
    const first = await list('/api/sites', { page: 1, pageSize: 2 });
    expect(first).toMatchObject({ total: SITES.length, page: 1, pageSize: 2 });
    expect(first.items.map((s) => s.postcode)).toEqual(postcodes.slice(0, 2));
    const third = await list('/api/sites', { page: 3, pageSize: 2 });
    expect(third.items.map((s) => s.postcode)).toEqual(postcodes.slice(4));
  });

  it('sorts by town, then keeps a stable order between equal towns', async () => {
    const asc = await list('/api/sites', { sort: 'town' });
    expect(asc.items.map((s) => s.town)).toEqual(SITES.map((s) => s.town).sort());
    const desc = await list('/api/sites', { sort: 'town', order: 'desc' });
    expect(desc.items.map((s) => s.town)).toEqual(SITES.map((s) => s.town).sort().reverse());
    // The two Callowmere sites come in the same order on every call, so a page boundary between them cannot repeat or drop one.
    const again = await list('/api/sites', { sort: 'town' });
    expect(again.items.map((s) => s.id)).toEqual(asc.items.map((s) => s.id));
  });

  it('searches address, town, postcode and the client name', async () => {
    expect((await list('/api/sites', { q: 'kiln' })).items.map((s) => s.addressLine1)).toEqual(['9 Kiln Row']);
    expect((await list('/api/sites', { q: 'callowmere', sort: 'postcode' })).items.map((s) => s.postcode)).toEqual(['CM1 1AB', 'CM9 4JK']);
    expect((await list('/api/sites', { q: 'te3' })).items.map((s) => s.town)).toEqual(['Thornley Edge']);
    const ofClient = await list('/api/sites', { q: 'alder farm', sort: 'postcode' });
    expect(ofClient).toMatchObject({ total: 2 });
    expect(ofClient.items.map((s) => s.clientName)).toEqual(['Alder Farm', 'Alder Farm']);
  });

  it('filters by client and pages within the filter', async () => {
    const res = await list('/api/sites', { clientId: clientIds['Alder Farm']!, pageSize: 1, page: 2, sort: 'postcode' });
    expect(res).toMatchObject({ total: 2, page: 2, pageSize: 1 });
    expect(res.items.map((s) => s.postcode)).toEqual(['SX4 2CD']);
  });
});

describe('jobs table', () => {
  const crewIds: Record<string, string> = {};
  const jobIds: Record<string, string> = {};
  const references: Record<string, string> = {};
  // Placed ones: North from Mon 1 March (2 days), South from Mon 15 March (3 days), North again from Mon 5 April (2 days).
  const JOBS = [
    { key: 'orchard', client: 'Alder Farm', site: '1 Orchard Way', title: 'Rebuild orchard wall', workTypes: ['garden-wall'], place: { crew: 'North', startDate: '2027-03-01', workingDays: 2 } },
    { key: 'mill', client: 'Alder Farm', site: '2 Mill Lane', title: 'Repoint mill gable', workTypes: ['repointing', 'brickwork'], place: { crew: 'South', startDate: '2027-03-15', workingDays: 3 } },
    { key: 'chimney', client: 'Birch House', site: '9 Kiln Row', title: 'Chimney rebuild', workTypes: ['chimney'], place: { crew: 'North', startDate: '2027-04-05', workingDays: 2 } },
    { key: 'porch', client: 'Cedar Lodge', site: '14 Quarry Row', title: 'Render porch', workTypes: ['rendering'], status: 'enquiry' },
    { key: 'steps', client: 'Elm Cottage', site: '3 Chapel Walk', title: 'Brick garden steps', workTypes: ['brickwork'], status: 'quoted' },
  ] as const;
  const keysOf = (page: { items: Array<Record<string, unknown>> }) =>
    page.items.map((item) => Object.keys(jobIds).find((key) => jobIds[key] === item.id) ?? `foreign ${String(item.id)}`);
  const jobs = (query: Record<string, string | number>) => list('/api/jobs', { sort: 'title', ...query });

  beforeAll(async () => {
    const sites = await list('/api/sites', { pageSize: 50 });
    const siteIds = Object.fromEntries(sites.items.map((site) => [site.addressLine1 as string, site.id as string]));
    for (const [name, colour] of [['North', '#225588'], ['South', '#885522']] as const) {
      crewIds[name] = (await request(h.app).post('/api/crews').set(owner.auth).send({ name: `${name} crew`, colour }).expect(201)).body.id;
    }
    for (const job of JOBS) {
      const created = await request(h.app).post('/api/jobs').set(owner.auth)
        .send({ clientId: clientIds[job.client], siteId: siteIds[job.site], title: job.title, workTypes: job.workTypes, estimatedWorkingDays: 2 }).expect(201);
      jobIds[job.key] = created.body.id;
      references[job.key] = created.body.reference;
      const status = 'place' in job ? 'booked' : job.status;
      if (status !== 'enquiry') await request(h.app).post(`/api/jobs/${created.body.id}/status`).set(owner.auth).send({ status }).expect(200);
      if ('place' in job) {
        await request(h.app).post('/api/assignments').set(owner.auth)
          .send({ jobId: created.body.id, crewId: crewIds[job.place.crew], startDate: job.place.startDate, workingDays: job.place.workingDays }).expect(201);
      }
    }
  });

  it('pages through every job by reference by default, with the total on every page', async () => {
    const first = await list('/api/jobs', { pageSize: 2 });
    expect(first).toMatchObject({ total: 5, page: 1, pageSize: 2 });
    expect(keysOf(first)).toEqual(['orchard', 'mill']);
    expect(keysOf(await list('/api/jobs', { pageSize: 2, page: 2 }))).toEqual(['chimney', 'porch']);
    const last = await list('/api/jobs', { pageSize: 2, page: 3 });
    expect(last).toMatchObject({ total: 5, page: 3 });
    expect(keysOf(last)).toEqual(['steps']);
    expect(await list('/api/jobs', { pageSize: 2, page: 4 })).toMatchObject({ items: [], total: 5 });
  });

  it('sorts by title and by start date, either way', async () => {
    expect(keysOf(await jobs({}))).toEqual(['steps', 'chimney', 'orchard', 'porch', 'mill']);
    expect(keysOf(await jobs({ order: 'desc' }))).toEqual(['mill', 'porch', 'orchard', 'chimney', 'steps']);
    const byStart = keysOf(await list('/api/jobs', { sort: 'startDate', status: 'scheduled' }));
    expect(byStart).toEqual(['orchard', 'mill', 'chimney']);
    expect(keysOf(await list('/api/jobs', { sort: 'startDate', order: 'desc', status: 'scheduled' }))).toEqual(['chimney', 'mill', 'orchard']);
  });

  it('filters by status, crew and work type', async () => {
    expect(keysOf(await jobs({ status: 'scheduled' }))).toEqual(['chimney', 'orchard', 'mill']);
    expect(keysOf(await jobs({ status: 'enquiry' }))).toEqual(['porch']);
    expect(keysOf(await jobs({ status: 'quoted' }))).toEqual(['steps']);
    expect(await jobs({ status: 'invoiced' })).toMatchObject({ items: [], total: 0 });
    expect(keysOf(await jobs({ crewId: crewIds.North! }))).toEqual(['chimney', 'orchard']);
    expect(keysOf(await jobs({ crewId: crewIds.South! }))).toEqual(['mill']);
    expect(keysOf(await jobs({ workType: 'brickwork' }))).toEqual(['steps', 'mill']);
    expect(keysOf(await jobs({ workType: 'chimney' }))).toEqual(['chimney']);
    expect(await jobs({ clientId: clientIds['Alder Farm']! })).toMatchObject({ total: 2 });
  });

  it('keeps the jobs whose days overlap the date range, counting both ends', async () => {
    expect(keysOf(await jobs({ from: '2027-03-02', to: '2027-03-02' }))).toEqual(['orchard']);
    expect(keysOf(await jobs({ from: '2027-03-03', to: '2027-03-12' }))).toEqual([]);
    expect(keysOf(await jobs({ from: '2027-03-12', to: '2027-03-15' }))).toEqual(['mill']);
    expect(keysOf(await jobs({ from: '2027-03-01', to: '2027-04-30' }))).toEqual(['chimney', 'orchard', 'mill']);
    expect(keysOf(await jobs({ from: '2027-03-16' }))).toEqual(['chimney', 'mill']);
    expect(keysOf(await jobs({ to: '2027-03-15' }))).toEqual(['orchard', 'mill']);
  });

  it('searches the reference, the client name and the site address without regard to case', async () => {
    expect(keysOf(await jobs({ q: references.chimney!.toLowerCase() }))).toEqual(['chimney']);
    expect(keysOf(await jobs({ q: 'CEDAR lodge' }))).toEqual(['porch']);
    expect(keysOf(await jobs({ q: 'alder farm' }))).toEqual(['orchard', 'mill']);
    expect(keysOf(await jobs({ q: 'chapel walk' }))).toEqual(['steps']);
    expect(keysOf(await jobs({ q: 'kiln' }))).toEqual(['chimney']);
    expect(await jobs({ q: 'no such place' })).toMatchObject({ items: [], total: 0 });
  });

  it('combines filters, and pages within them', async () => {
    expect(keysOf(await jobs({ status: 'scheduled', crewId: crewIds.North!, workType: 'chimney' }))).toEqual(['chimney']);
    expect(keysOf(await jobs({ crewId: crewIds.North!, from: '2027-03-01', to: '2027-03-31' }))).toEqual(['orchard']);
    expect(keysOf(await jobs({ q: 'alder', workType: 'brickwork' }))).toEqual(['mill']);
    expect(keysOf(await jobs({ crewId: crewIds.South!, workType: 'chimney' }))).toEqual([]);
    const paged = await jobs({ status: 'scheduled', q: 'alder', pageSize: 1, page: 2 });
    expect(paged).toMatchObject({ total: 2, page: 2, pageSize: 1 });
    expect(keysOf(paged)).toEqual(['mill']);
  });

  it.each([
    ['status', { status: 'underway' }],
    ['crewId', { crewId: 'north' }],
    ['workType', { workType: 'plumbing' }],
    ['from', { from: '2027-02-30' }],
  ])('answers a bad %s with a problem naming it', async (field, query) => {
    const res = await request(h.app).get('/api/jobs').query(query).set(owner.auth).expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect((res.body.errors as Array<{ path: string }>).map((e) => e.path)).toContain(`query.${field}`);
  });

  it.each(['scheduled', 'on-site'])('refuses to mark a booked job %s while it has no days on the board', async (status) => {
    const job = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: clientIds['Cedar Lodge'], siteId: (await list('/api/sites', { q: 'quarry row' })).items[0]!.id, title: 'Lime pointing', workTypes: ['repointing'], estimatedWorkingDays: 1 })
      .expect(201);
    await request(h.app).post(`/api/jobs/${job.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    const res = await request(h.app).post(`/api/jobs/${job.body.id}/status`).set(owner.auth).send({ status }).expect(409);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ status: 409, code: 'illegal-transition', type: expect.any(String), title: expect.any(String) });
    expect(res.body.detail).toMatch(/board/);
    expect((await request(h.app).get(`/api/jobs/${job.body.id}`).set(owner.auth).expect(200)).body.status).toBe('booked');
  });
});
