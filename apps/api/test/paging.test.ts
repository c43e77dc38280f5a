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
