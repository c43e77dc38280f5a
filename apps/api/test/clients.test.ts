import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { ClientContacts1796245300000 } from '../src/db/migrations/1796245300000-client-contacts.js';
import { Client } from '../src/entities/index.js';
import { countRows, createHarness, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

let h: Harness;
let owner: SignedIn;

beforeEach(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Tarn Edge Builders', 'owner@tarnedge.example');
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const contacts = [
  { name: 'Hazel Quarrie', role: 'Owner', email: 'Hazel@Quarrie.example', phone: '07700 900211' },
  { name: 'Ivo Quarrie', role: null, email: null, phone: '07700 900212' },
  { name: null, role: 'Letting agent', email: 'lets@quarrie-homes.example', phone: null },
];

describe('client contacts', () => {
  it('keeps several contacts in the order given, the first one as the main contact', async () => {
    const created = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Quarrie Homes', contacts }).expect(201);
    expect(created.body.contacts).toEqual([{ ...contacts[0], email: 'hazel@quarrie.example' }, contacts[1], contacts[2]]);
    const fetched = await request(h.app).get(`/api/clients/${created.body.id}`).set(owner.auth).expect(200);
    expect(fetched.body.contacts.map((c: { name: string | null }) => c.name)).toEqual(['Hazel Quarrie', 'Ivo Quarrie', null]);
    expect(fetched.body).not.toHaveProperty('email');
  });

  it('replaces the list on an update: contacts removed, added and reordered', async () => {
    const created = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Quarrie Homes', contacts }).expect(201);
    const updated = await request(h.app)
      .put(`/api/clients/${created.body.id}`)
      .set(owner.auth)
      .send({ name: 'Quarrie Homes', contacts: [contacts[2], { name: 'Wyn Ellery', phone: '07700 900299' }], version: created.body.version })
      .expect(200);
    expect(updated.body.contacts).toEqual([contacts[2], { name: 'Wyn Ellery', role: null, email: null, phone: '07700 900299' }]);
    const cleared = await request(h.app).put(`/api/clients/${created.body.id}`).set(owner.auth).send({ name: 'Quarrie Homes', contacts: [], version: updated.body.version }).expect(200);
    expect(cleared.body.contacts).toEqual([]);
  });

  it('treats empty fields as absent and a client without contacts as fine', async () => {
    const res = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Quiet Client', contacts: [{ name: ' ', email: '', phone: '07700 900300' }] }).expect(201);
    expect(res.body.contacts).toEqual([{ name: null, role: null, email: null, phone: '07700 900300' }]);
    const bare = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'No Contacts Ltd' }).expect(201);
    expect(bare.body.contacts).toEqual([]);
  });

  it('refuses a bad contact with 400 naming it and changes nothing', async () => {
    const created = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Quarrie Homes', contacts }).expect(201);
    const before = await countRows(h.dataSource);
    const res = await request(h.app)
      .put(`/api/clients/${created.body.id}`)
      .set(owner.auth)
      .send({ name: 'Quarrie Homes', contacts: [contacts[0], { name: 'Bad Phone', phone: 'call me' }], version: created.body.version })
      .expect(400);
    expect(res.body.errors).toEqual([{ path: 'contacts.1.phone', message: 'Use digits, spaces and + ( ) - only' }]);
    expect(await countRows(h.dataSource)).toEqual(before);
    const fetched = await request(h.app).get(`/api/clients/${created.body.id}`).set(owner.auth).expect(200);
    expect(fetched.body.contacts).toHaveLength(3);
  });

  it('addresses mail to the main contact', async () => {
    const client = await request(h.app).post('/api/clients').set(owner.auth).send({ name: 'Quarrie Homes', contacts }).expect(201);
    const stored = await h.dataSource.query(`SELECT contacts FROM client WHERE id = $1`, [client.body.id]);
    expect(stored[0].contacts[0].email).toBe('hazel@quarrie.example');
    const entity = await h.dataSource.manager.findOneByOrFail(Client, { id: client.body.id });
    expect([entity.contactName, entity.email, entity.phone]).toEqual(['Hazel Quarrie', 'hazel@quarrie.example', '07700 900211']);
  });
});

describe('the contacts migration', () => {
  it('moves each client\'s one contact into the list, and back on the way down', async () => {
    const migration = new ClientContacts1796245300000();
    const runner = h.dataSource.createQueryRunner();
    await runner.connect();
    await runner.startTransaction();
    try {
      const [firm] = await runner.query(`SELECT id FROM firm LIMIT 1`);
      await migration.down(runner);
      await runner.query(
        `INSERT INTO client (firm_id, name, contact_name, email, phone, version) VALUES
           ($1, 'Full Contact', 'Mair Pugh', 'mair@pugh.example', '07700 900401', 1),
           ($1, 'Email Only', NULL, 'only@email.example', NULL, 1),
           ($1, 'Nobody', NULL, NULL, '', 1)`,
        [firm.id],
      );
      await migration.up(runner);
      const rows: Array<{ name: string; contacts: unknown }> = await runner.query(`SELECT name, contacts FROM client ORDER BY name`);
      expect(rows).toEqual([
        { name: 'Email Only', contacts: [{ name: null, role: null, email: 'only@email.example', phone: null }] },
        { name: 'Full Contact', contacts: [{ name: 'Mair Pugh', role: null, email: 'mair@pugh.example', phone: '07700 900401' }] },
        { name: 'Nobody', contacts: [] },
      ]);
      await migration.down(runner);
      const back = await runner.query(`SELECT name, contact_name, email, phone FROM client ORDER BY name`);
      expect(back).toEqual([
        { name: 'Email Only', contact_name: null, email: 'only@email.example', phone: null },
        { name: 'Full Contact', contact_name: 'Mair Pugh', email: 'mair@pugh.example', phone: '07700 900401' },
        { name: 'Nobody', contact_name: null, email: null, phone: null },
      ]);
    } finally {
      await runner.rollbackTransaction();
      await runner.release();
    }
  });
});
