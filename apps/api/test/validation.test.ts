import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { countRows, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

let h: Harness;
let owner: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Damson Walls', 'owner@damson.example');
  ids = await populateFirm(h, owner);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const huge = 'x'.repeat(10_000);
type Case = [string, 'post' | 'put', string, () => unknown, string];
const cases: Case[] = [
  ['a client with no name', 'post', '/api/clients', () => ({ name: '' }), 'name'],
  ['a client with a 10,000-character name', 'post', '/api/clients', () => ({ name: huge }), 'name'],
  ['a client contact with a malformed e-mail', 'post', '/api/clients', () => ({ name: 'Ok', contacts: [{ name: 'Al' }, { email: 'not-an-email' }] }), 'contacts.1.email'],
  ['a client contact with nothing to reach them by', 'post', '/api/clients', () => ({ name: 'Ok', contacts: [{ role: 'Tenant' }] }), 'contacts.0.name'],
  ['a client with 21 contacts', 'post', '/api/clients', () => ({ name: 'Ok', contacts: Array.from({ length: 21 }, (_, i) => ({ name: `Person ${i}` })) }), 'contacts'],
  ['a site with a malformed postcode', 'post', '/api/sites', () => ({ clientId: ids.clientId, addressLine1: '1 Road', town: 'T', postcode: '12345' }), 'postcode'],
  ['a site with a client id that is not an id', 'post', '/api/sites', () => ({ clientId: 'abc', addressLine1: '1 Road', town: 'T', postcode: 'LM1 1AA' }), 'clientId'],
  ['a site with a latitude of 200', 'post', '/api/sites', () => ({ clientId: ids.clientId, addressLine1: '1 Road', town: 'T', postcode: 'LM1 1AA', lat: 200 }), 'lat'],
  ['a crew with a colour name instead of a code', 'post', '/api/crews', () => ({ name: 'Red', colour: 'red' }), 'colour'],
  ['a job with negative days', 'post', '/api/jobs', () => ({ clientId: ids.clientId, siteId: ids.siteId, title: 'J', workTypes: ['repairs'], estimatedWorkingDays: -3 }), 'estimatedWorkingDays'],
  ['a job with days as text', 'post', '/api/jobs', () => ({ clientId: ids.clientId, siteId: ids.siteId, title: 'J', workTypes: ['repairs'], estimatedWorkingDays: 'three' }), 'estimatedWorkingDays'],
  ['a job finishing before it starts', 'post', '/api/jobs', () => ({ clientId: ids.clientId, siteId: ids.siteId, title: 'J', workTypes: ['repairs'], estimatedWorkingDays: 1, earliestStart: '2027-05-10', targetFinish: '2027-05-01' }), 'targetFinish'],
  ['a job with an impossible date', 'post', '/api/jobs', () => ({ clientId: ids.clientId, siteId: ids.siteId, title: 'J', workTypes: ['repairs'], estimatedWorkingDays: 1, earliestStart: '2027-02-30' }), 'earliestStart'],
  ['a job with an unknown work type', 'post', '/api/jobs', () => ({ clientId: ids.clientId, siteId: ids.siteId, title: 'J', workTypes: ['juggling'], estimatedWorkingDays: 1 }), 'workTypes.0'],
  ['firm settings with no working days', 'put', '/api/firm', () => ({ name: 'Damson', workingWeekdays: [] }), 'workingWeekdays'],
  ['a sign-up with a short password', 'post', '/api/auth/sign-up', () => ({ firmName: 'F', ownerName: 'O', email: 'o@example.org', password: 'short' }), 'password'],
];

describe('bad input', () => {
  it.each(cases)('rejects %s with 400 naming the field and writes nothing', async (_name, method, url, body, field) => {
    const before = await countRows(h.dataSource);
    const res = await request(h.app)[method](url).set(owner.auth).send(body() as object);
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'validation-failed', status: 400, title: expect.any(String) });
    expect((res.body.errors as Array<{ path: string }>).map((e) => e.path)).toContain(field);
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  // Under the 100 kB JSON body limit, so the field's own length limit is what answers.
  const oversized = 'z'.repeat(100_000);
  const oversizedCases: Array<[string, 'post' | 'put', () => string, () => object, string]> = [
    ['client notes', 'post', () => '/api/clients', () => ({ name: 'Long Notes Farm', notes: oversized }), 'notes'],
    ['site hazards', 'post', () => '/api/sites', () => ({ clientId: ids.clientId, addressLine1: '1 Road', town: 'Lowmoor', postcode: 'LM1 1AA', hazards: oversized }), 'hazards'],
    ['crew name', 'post', () => '/api/crews', () => ({ name: oversized, colour: '#445566' }), 'name'],
    ['job description', 'post', () => '/api/jobs', () => ({ clientId: ids.clientId, siteId: ids.siteId, title: 'J', workTypes: ['repairs'], estimatedWorkingDays: 1, description: oversized }), 'description'],
    ['job title on an update', 'put', () => `/api/jobs/${ids.jobId}`, () => ({ clientId: ids.clientId, siteId: ids.siteId, title: oversized, workTypes: ['repairs'], estimatedWorkingDays: 1 }), 'title'],
    ['firm name', 'put', () => '/api/firm', () => ({ name: oversized }), 'name'],
    ['an invited person\'s name', 'post', () => '/api/people/invite', () => ({ email: 'long@damson.example', name: oversized, role: 'operative' }), 'name'],
  ];

  it.each(oversizedCases)('rejects a 100,000-character %s with 400 naming the field and writes nothing', async (_name, method, url, body, field) => {
    const before = await countRows(h.dataSource);
    const payload = body();
    expect(Buffer.byteLength(JSON.stringify(payload))).toBeLessThan(100 * 1024);
    const res = await request(h.app)[method](url()).set(owner.auth).send(payload);
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ type: '/problems/validation-failed', code: 'validation-failed', status: 400 });
    expect(res.body.errors).toContainEqual({ path: field, message: expect.stringMatching(/^At most \d+ characters$/) });
    expect(await countRows(h.dataSource)).toEqual(before);
    expect(h.mailer.outbox.filter((mail) => mail.to === 'long@damson.example')).toHaveLength(0);
  });

  it('rejects a body that is not JSON with 400', async () => {
    const res = await request(h.app).post('/api/clients').set(owner.auth).set('Content-Type', 'application/json').send('{"name": ');
    expect(res.status).toBe(400);
    expect(res.body.code).toBe('validation-failed');
  });

  it('rejects a body over the size limit with 413 problem JSON and writes nothing', async () => {
    const before = await countRows(h.dataSource);
    const res = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Big', notes: 'y'.repeat(200_000) });
    expect(res.status).toBe(413);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toEqual({ type: '/problems/payload-too-large', title: expect.any(String), status: 413, detail: expect.any(String), code: 'payload-too-large' });
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  it('rejects a malformed id in the path with 400', async () => {
    const res = await request(h.app).get('/api/clients/not-a-uuid').set(owner.auth).expect(400);
    expect(res.body.errors[0].path).toBe('params.id');
  });

  it('strips unknown keys instead of storing them', async () => {
    const res = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Quince Farm', firmId: '00000000-0000-4000-8000-000000000000', isAdmin: true }).expect(201);
    expect(res.body).not.toHaveProperty('isAdmin');
    const fetched = await request(h.app).get(`/api/clients/${res.body.id}`).set(owner.auth).expect(200);
    expect(fetched.body.name).toBe('Quince Farm');
  });

  it('returns 409 stale-version when a client was changed since it was read', async () => {
    const first = await request(h.app).put(`/api/clients/${ids.clientId}`).set(owner.auth).send({ name: 'Marsh End Farm Ltd', version: 1 }).expect(200);
    expect(first.body.version).toBe(2);
    const stale = await request(h.app).put(`/api/clients/${ids.clientId}`).set(owner.auth).send({ name: 'Lost update', version: 1 }).expect(409);
    expect(stale.body.code).toBe('stale-version');
  });

  it('refuses an illegal status change with 409', async () => {
    const res = await request(h.app).post(`/api/jobs/${ids.jobId}/status`).set(owner.auth).send({ status: 'invoiced' }).expect(409);
    expect(res.body.code).toBe('illegal-transition');
  });
});
