import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { can, roles, type Permission, type Role } from '@hodboard/shared';
import { addPerson, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

let h: Harness;
let people: Record<Role, SignedIn>;
let ids: Awaited<ReturnType<typeof populateFirm>>;
/** A job on no crew: crew roles must not see it. */
let otherJobId: string;

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  const owner = await signUpFirm(h, 'Cedar Brickwork', 'owner@cedar.example');
  ids = await populateFirm(h, owner);
  people = {
    owner,
    office: await addPerson(h, owner, 'office', 'office@cedar.example'),
    'crew-lead': await addPerson(h, owner, 'crew-lead', 'lead@cedar.example'),
    operative: await addPerson(h, owner, 'operative', 'op@cedar.example'),
  };
  // The crew lead leads, and the operative works on, the crew the firm's job is placed on.
  const members = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
  const memberId = (email: string) => members.find((member) => member.email === email)!.id;
  const crew = await request(h.app).get(`/api/crews/${ids.crewId}`).set(owner.auth).expect(200);
  await request(h.app)
    .put(`/api/crews/${ids.crewId}`)
    .set(owner.auth)
    .send({ name: crew.body.name, colour: crew.body.colour, leadMemberId: memberId('lead@cedar.example'), memberIds: [memberId('op@cedar.example')], version: crew.body.version })
    .expect(200);
  const other = await request(h.app)
    .post('/api/jobs')
    .set(owner.auth)
    .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Rebuild garden wall', workTypes: ['garden-wall'], estimatedWorkingDays: 2 })
    .expect(201);
  otherJobId = other.body.id;
});
afterAll(async () => {
  await h.dataSource.destroy();
});

type Case = [Role, 'get' | 'post' | 'put' | 'patch' | 'delete', string, () => object | undefined, number];
const site = () => ({ clientId: ids.clientId, addressLine1: '5 Kiln Row', town: 'Lowmoor', postcode: 'LM1 2AB' });
const job = () => ({ clientId: ids.clientId, siteId: ids.siteId, title: 'New job', workTypes: ['brickwork'], estimatedWorkingDays: 2 });

// Source: the role table of the Foundation issue (owner: everything; office: jobs, schedule, clients; crew roles: own crew's jobs).
const cases: Case[] = [
  ['owner', 'put', '/api/firm', () => ({ name: 'Cedar Brickwork Ltd' }), 200],
  ['office', 'get', '/api/firm', () => undefined, 200],
  ['office', 'put', '/api/firm', () => ({ name: 'Office tries' }), 403],
  ['crew-lead', 'get', '/api/firm', () => undefined, 200],
  ['crew-lead', 'put', '/api/firm', () => ({ name: 'Lead tries' }), 403],
  ['operative', 'get', '/api/firm', () => undefined, 200],
  ['operative', 'put', '/api/firm', () => ({ name: 'Operative tries' }), 403],
  ['owner', 'get', '/api/people', () => undefined, 200],
  ['owner', 'post', '/api/people/invite', () => ({ email: 'partner@cedar.example', name: 'Partner', role: 'owner' }), 201],
  ['office', 'get', '/api/people', () => undefined, 200],
  ['office', 'post', '/api/people/invite', () => ({ email: 'boss@cedar.example', name: 'Boss', role: 'owner' }), 403],
  ['crew-lead', 'get', '/api/people', () => undefined, 403],
  ['crew-lead', 'post', '/api/people/invite', () => ({ email: 'y@cedar.example', name: 'Y', role: 'operative' }), 403],
  ['operative', 'get', '/api/people', () => undefined, 403],
  ['operative', 'post', '/api/people/invite', () => ({ email: 'x@cedar.example', name: 'X', role: 'operative' }), 403],
  ['owner', 'post', '/api/crews', () => ({ name: 'Owner crew', colour: '#123456' }), 201],
  ['office', 'post', '/api/crews', () => ({ name: 'Office crew', colour: '#abcdef' }), 201],
  ['crew-lead', 'get', '/api/crews', () => undefined, 200],
  ['crew-lead', 'post', '/api/crews', () => ({ name: 'Lead crew', colour: '#abcdef' }), 403],
  ['operative', 'get', '/api/crews', () => undefined, 200],
  ['operative', 'delete', '/api/crews/:crew', () => undefined, 403],
  ['owner', 'get', '/api/clients', () => undefined, 200],
  ['owner', 'post', '/api/clients', () => ({ name: 'Owner client' }), 201],
  ['office', 'get', '/api/clients', () => undefined, 200],
  ['office', 'post', '/api/clients', () => ({ name: 'Office client' }), 201],
  ['crew-lead', 'get', '/api/clients', () => undefined, 403],
  ['crew-lead', 'get', '/api/clients/:client', () => undefined, 403],
  ['operative', 'get', '/api/clients', () => undefined, 403],
  ['operative', 'post', '/api/clients', () => ({ name: 'Op client' }), 403],
  ['owner', 'get', '/api/sites', () => undefined, 200],
  ['owner', 'post', '/api/sites', site, 201],
  ['office', 'post', '/api/sites', site, 201],
  ['crew-lead', 'get', '/api/sites', () => undefined, 403],
  ['crew-lead', 'post', '/api/sites', site, 403],
  ['operative', 'get', '/api/sites/:site', () => undefined, 403],
  ['operative', 'post', '/api/sites', site, 403],
  ['owner', 'get', '/api/jobs/:otherJob', () => undefined, 200],
  ['owner', 'post', '/api/jobs', job, 201],
  ['office', 'post', '/api/jobs', job, 201],
  ['office', 'get', '/api/jobs/:otherJob', () => undefined, 200],
  ['crew-lead', 'get', '/api/jobs', () => undefined, 200],
  ['crew-lead', 'get', '/api/jobs/:job', () => undefined, 200],
  ['crew-lead', 'get', '/api/jobs/:otherJob', () => undefined, 404],
  ['crew-lead', 'post', '/api/jobs', job, 403],
  ['operative', 'get', '/api/jobs/:job', () => undefined, 200],
  ['operative', 'get', '/api/jobs/:otherJob', () => undefined, 404],
  ['operative', 'put', '/api/jobs/:job', job, 403],
];

/** The permissions behind each resource's routes; reading the firm needs none. */
const resources: Record<string, { prefix: string; read: Permission | null; manage: Permission }> = {
  firm: { prefix: '/api/firm', read: null, manage: 'firm:manage' },
  people: { prefix: '/api/people', read: 'people:read', manage: 'people:manage' },
  crews: { prefix: '/api/crews', read: 'crews:read', manage: 'crews:manage' },
  clients: { prefix: '/api/clients', read: 'clients:read', manage: 'clients:manage' },
  sites: { prefix: '/api/sites', read: 'clients:read', manage: 'clients:manage' },
  jobs: { prefix: '/api/jobs', read: 'jobs:read', manage: 'jobs:manage' },
};

describe('role permissions', () => {
  it.each(cases)('%s %s %s → %i', async (role, method, path, body, expected) => {
    const url = path
      .replace(':crew', ids.crewId)
      .replace(':client', ids.clientId)
      .replace(':site', ids.siteId)
      .replace(':otherJob', otherJobId)
      .replace(':job', ids.jobId);
    const res = await request(h.app)[method](url).set(people[role].auth).send(body());
    expect(res.status).toBe(expected);
    if (expected === 403) expect(res.body).toMatchObject({ code: 'forbidden', status: 403 });
    if (expected === 404) expect(res.body).toMatchObject({ code: 'not-found', status: 404 });
  });

  // Allowed where the role holds one of the resource's permissions; denied where it cannot manage the resource (crew roles
  // are also held to their own crews' jobs). The owner holds every permission, so it has no denied cell; the last-owner
  // rule below is its only refusal.
  it.each(Object.entries(resources).flatMap(([name, resource]) => roles.map((role) => [name, role, resource] as const)))(
    'covers %s for %s with an allowed and a denied case where the role table has them',
    (_name, role, resource) => {
      const mine = cases.filter(([caseRole, , path]) => caseRole === role && (path === resource.prefix || path.startsWith(`${resource.prefix}/`)));
      const mayDoSome = resource.read === null || can(role, resource.read) || can(role, resource.manage);
      const isLimited = !can(role, resource.manage);
      if (mayDoSome) expect(mine.some(([, , , , status]) => status < 300)).toBe(true);
      if (isLimited) expect(mine.some(([, , , , status]) => status === 403 || status === 404)).toBe(true);
    },
  );

  it('keeps at least one owner: the last owner cannot be demoted', async () => {
    const list = await request(h.app).get('/api/people').set(people.owner.auth).expect(200);
    const owner = (list.body as Array<{ id: string; role: Role }>).find((p) => p.role === 'owner')!;
    const res = await request(h.app).patch(`/api/people/${owner.id}`).set(people.owner.auth).send({ role: 'office' }).expect(409);
    expect(res.body.detail).toMatch(/at least one owner/);
  });
});
