import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@hodboard/shared';
import { addPerson, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

let h: Harness;
let people: Record<Role, SignedIn>;
let ids: Awaited<ReturnType<typeof populateFirm>>;

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
  ['office', 'put', '/api/firm', () => ({ name: 'Office tries' }), 403],
  ['crew-lead', 'put', '/api/firm', () => ({ name: 'Lead tries' }), 403],
  ['operative', 'get', '/api/firm', () => undefined, 200],
  ['office', 'get', '/api/people', () => undefined, 200],
  ['crew-lead', 'get', '/api/people', () => undefined, 403],
  ['operative', 'post', '/api/people/invite', () => ({ email: 'x@cedar.example', name: 'X', role: 'operative' }), 403],
  ['office', 'post', '/api/people/invite', () => ({ email: 'boss@cedar.example', name: 'Boss', role: 'owner' }), 403],
  ['office', 'post', '/api/crews', () => ({ name: 'Office crew', colour: '#abcdef' }), 201],
  ['crew-lead', 'get', '/api/crews', () => undefined, 200],
  ['crew-lead', 'post', '/api/crews', () => ({ name: 'Lead crew', colour: '#abcdef' }), 403],
  ['operative', 'delete', '/api/crews/:crew', () => undefined, 403],
  ['office', 'get', '/api/clients', () => undefined, 200],
  ['office', 'post', '/api/clients', () => ({ name: 'Office client' }), 201],
  ['crew-lead', 'get', '/api/clients', () => undefined, 403],
  ['operative', 'post', '/api/clients', () => ({ name: 'Op client' }), 403],
  ['office', 'post', '/api/sites', site, 201],
  ['crew-lead', 'get', '/api/sites', () => undefined, 403],
  ['operative', 'post', '/api/sites', site, 403],
  ['office', 'post', '/api/jobs', job, 201],
  ['crew-lead', 'get', '/api/jobs', () => undefined, 200],
  ['crew-lead', 'post', '/api/jobs', job, 403],
  ['operative', 'put', '/api/jobs/:job', job, 403],
];

describe('role permissions', () => {
  it.each(cases)('%s %s %s → %i', async (role, method, path, body, expected) => {
    const url = path.replace(':crew', ids.crewId).replace(':job', ids.jobId);
    const res = await request(h.app)[method](url).set(people[role].auth).send(body());
    expect(res.status).toBe(expected);
    if (expected === 403) expect(res.body).toMatchObject({ code: 'forbidden', status: 403 });
  });

  it('keeps at least one owner: the last owner cannot be demoted', async () => {
    const list = await request(h.app).get('/api/people').set(people.owner.auth).expect(200);
    const owner = (list.body as Array<{ id: string; role: Role }>).find((p) => p.role === 'owner')!;
    const res = await request(h.app).patch(`/api/people/${owner.id}`).set(people.owner.auth).send({ role: 'office' }).expect(409);
    expect(res.body.detail).toMatch(/at least one owner/);
  });
});
