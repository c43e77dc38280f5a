import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { pino } from 'pino';
import sharp from 'sharp';
import request from 'supertest';
import { io as connect, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DomainEvent } from '../../src/lib/event-bus.js';
import { attachRealtime, crewRoom, officeRoom, type RealtimeServer } from '../../src/realtime/socket-server.js';
import { addPerson, createHarness, populateFirm, signIn, signUpFirm, truncateAll, type Harness, type SignedIn } from '../harness.js';
import { quoteFixture } from '../quotes-helpers.js';

let h: Harness;
let server: Server;
let url: string;
let io: RealtimeServer;
const sockets: Socket[] = [];

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  server = createServer(h.app);
  io = attachRealtime(server, h.services.auth, h.services.events, pino({ level: 'silent' }));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  for (const socket of sockets) socket.disconnect();
  await new Promise((resolve) => server.close(resolve));
  await h.dataSource.destroy();
});

async function listen(who: SignedIn): Promise<{ socket: Socket; heard: Array<{ event: string; message: { type: string; id?: string } }> }> {
  const socket = connect(url, { auth: { token: who.token }, transports: ['websocket'], reconnection: false });
  sockets.push(socket);
  await new Promise<void>((resolve, reject) => {
    socket.on('connect', () => resolve());
    socket.on('connect_error', reject);
  });
  const heard: Array<{ event: string; message: { type: string; id?: string } }> = [];
  socket.onAny((event: string, message: { type: string; id?: string }) => heard.push({ event, message }));
  return { socket, heard };
}

async function personId(owner: SignedIn, email: string): Promise<string> {
  const people = await request(h.app).get('/api/people').set(owner.auth).expect(200);
  return (people.body as Array<{ id: string; email: string }>).find((person) => person.email === email)!.id;
}

/** Firm B at work: most of what a firm does in a week, so most kinds of event are published. */
async function busyWeek(owner: SignedIn): Promise<void> {
  const app = h.app;
  const ids = await populateFirm(h, owner);
  const quote = await quoteFixture(h, owner, ids.jobId);
  const ok = (res: { status: number; body: unknown }, what: string) => expect(res.status, `${what}: ${JSON.stringify(res.body)}`).toBeLessThan(300);
  ok(await request(app).put('/api/firm').set(owner.auth).send({ name: 'Birch Builders Ltd' }), 'firm');
  ok(await request(app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: 'Gable crew two', colour: '#335577' }), 'crew');
  ok(await request(app).put(`/api/clients/${ids.clientId}`).set(owner.auth).send({ name: 'Marsh End Farm Ltd' }), 'client');
  ok(await request(app).put(`/api/jobs/${ids.jobId}`).set(owner.auth).send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Repoint the barn gable', workTypes: ['repointing'], estimatedWorkingDays: 3 }), 'job');
  ok(await request(app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth).send({ crewId: ids.crewId, startDate: '2027-03-08', workingDays: 3, version: 1 }), 'move');
  ok(await request(app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates: ['2027-03-09'], reason: 'wind' }), 'hold');
  ok(await request(app).post('/api/site-notes').set(owner.auth).send({ jobId: ids.jobId, body: 'Gate code changed' }), 'note');
  const jpeg = await sharp({ create: { width: 8, height: 8, channels: 3, background: '#777' } }).jpeg().toBuffer();
  ok(await request(app).post('/api/photos').set(owner.auth).field('jobId', ids.jobId).attach('photo', jpeg, 'gable.jpg'), 'photo');
  ok(await request(app).put(`/api/materials/${quote.materialId}`).set(owner.auth).send({ name: 'Class B brick', unit: 'brick', unitPricePence: 80 }), 'material');
  const booking = await request(app).get(`/api/access-bookings/${ids.bookingId}`).set(owner.auth);
  ok(await request(app).post(`/api/access-bookings/${ids.bookingId}/state`).set(owner.auth).send({ state: 'cancelled', version: booking.body.version }), 'booking');
  ok(await request(app).post('/api/sites').set(owner.auth).send({ clientId: ids.clientId, addressLine1: '3 Sheepwash Lane', town: 'Lowmoor', postcode: 'LM3 9QE' }), 'site');
  await addPerson(h, owner, 'crew-lead', 'lead2@birch.example');
  ok(await request(app).patch(`/api/people/${await personId(owner, 'lead2@birch.example')}`).set(owner.auth).send({ role: 'operative' }), 'person');
  ok(await request(app).delete(`/api/assignments/${ids.assignmentId}?version=2`).set(owner.auth), 'remove');
}

describe('live pushes across firms', () => {
  it("never delivers one firm's events to any socket of another firm, whatever its role", async () => {
    const ownerA = await signUpFirm(h, 'Alder Masonry', 'owner@alder.example');
    const idsA = await populateFirm(h, ownerA);
    const firmA = {
      owner: ownerA,
      office: await addPerson(h, ownerA, 'office', 'office@alder.example'),
      'crew-lead': await addPerson(h, ownerA, 'crew-lead', 'lead@alder.example'),
      operative: await addPerson(h, ownerA, 'operative', 'op@alder.example'),
    };
    await request(h.app).put(`/api/crews/${idsA.crewId}`).set(ownerA.auth)
      .send({ name: 'Gable crew', colour: '#445566', memberIds: [await personId(ownerA, 'lead@alder.example'), await personId(ownerA, 'op@alder.example')] })
      .expect(200);
    const ownerB = await signUpFirm(h, 'Birch Builders', 'owner@birch.example');

    const listeners = await Promise.all(Object.values(firmA).map((who) => listen(who)));
    // Asking to join another firm's room must do nothing: the server only ever joins rooms itself.
    for (const { socket } of listeners) socket.emit('join', `firm:${ownerB.session.firm.id}:office`);
    const seenByB = await listen(ownerB);

    const published: DomainEvent[] = [];
    const stop = h.services.events.subscribe((event) => published.push(event));
    await busyWeek(ownerB);
    stop();

    expect(published.every((event) => event.firmId === ownerB.session.firm.id)).toBe(true);
    const kinds = new Set(published.map((event) => event.type));
    expect(kinds.size, [...kinds].join(', ')).toBeGreaterThanOrEqual(12);
    // The control: firm B's own office hears each of them, once.
    await expect.poll(() => seenByB.heard.length, { timeout: 5_000 }).toBe(published.length);
    await new Promise((resolve) => setTimeout(resolve, 300));
    for (const [i, { heard }] of listeners.entries()) {
      expect(heard, `${Object.keys(firmA)[i]} of firm A`).toEqual([]);
    }
  });
});

/** Whether the server has this client's socket in a room: a reseat after a change is asynchronous, so tests wait on it. */
async function isInRoom(socket: Socket, room: string): Promise<boolean> {
  return (await io.in(room).fetchSockets()).some((member) => member.id === socket.id);
}

describe('live pushes after a change of role or membership', () => {
  it('takes a demoted office user out of the office room at once, and closes the socket of a removed crew lead', async () => {
    const owner = await signUpFirm(h, 'Hazel Yard Builders', 'owner@hazelyard.example');
    const ids = await populateFirm(h, owner, 'Tithe Barn Cottage');
    const office = await addPerson(h, owner, 'office', 'office@hazelyard.example');
    await addPerson(h, owner, 'crew-lead', 'lead@hazelyard.example');
    const leadId = await personId(owner, 'lead@hazelyard.example');
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: 'Gable crew', colour: '#445566', leadMemberId: leadId }).expect(200);
    const leadAgain = await signIn(h, 'lead@hazelyard.example');
    const firmId = owner.session.firm.id;

    const byOwner = await listen(owner);
    const byOffice = await listen(office);
    const byLead = await listen(leadAgain);
    expect(await isInRoom(byOffice.socket, officeRoom(firmId))).toBe(true);
    expect(await isInRoom(byLead.socket, crewRoom(ids.crewId))).toBe(true);

    await request(h.app).patch(`/api/people/${await personId(owner, 'office@hazelyard.example')}`).set(owner.auth).send({ role: 'operative' }).expect(200);
    await expect.poll(() => isInRoom(byOffice.socket, officeRoom(firmId)), { timeout: 3_000 }).toBe(false);
    expect(byOffice.socket.connected).toBe(true);
    byOwner.heard.length = 0;
    byOffice.heard.length = 0;
    await request(h.app).put(`/api/clients/${ids.clientId}`).set(owner.auth).send({ name: 'Tithe Barn Cottage Ltd' }).expect(200);
    await expect.poll(() => byOwner.heard.filter((entry) => entry.message.type === 'client:updated').length, { timeout: 3_000 }).toBe(1);

    await request(h.app).delete(`/api/people/${leadId}`).set(owner.auth).expect(204);
    await expect.poll(() => byLead.socket.connected, { timeout: 3_000 }).toBe(false);
    byLead.heard.length = 0;
    await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth).send({ crewId: ids.crewId, startDate: '2027-03-08', workingDays: 3, version: 1 }).expect(200);
    await expect.poll(() => byOwner.heard.filter((entry) => entry.message.type === 'assignment:moved').length, { timeout: 3_000 }).toBe(1);

    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(byOffice.heard, 'the demoted office user').toEqual([]);
    expect(byLead.heard, 'the removed crew lead').toEqual([]);
  });

  it("moves an open socket out of a crew's room when the crew's line-up drops that person", async () => {
    const owner = await signUpFirm(h, 'Rowan Gate Masonry', 'owner@rowangate.example');
    const ids = await populateFirm(h, owner, 'Cold Harbour Mill');
    const operative = await addPerson(h, owner, 'operative', 'op@rowangate.example');
    const operativeId = await personId(owner, 'op@rowangate.example');
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: 'Gable crew', colour: '#445566', memberIds: [operativeId] }).expect(200);
    const byOwner = await listen(owner);
    const byOperative = await listen(operative);
    expect(await isInRoom(byOperative.socket, crewRoom(ids.crewId))).toBe(true);

    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: 'Gable crew', colour: '#445566', memberIds: [] }).expect(200);
    await expect.poll(() => isInRoom(byOperative.socket, crewRoom(ids.crewId)), { timeout: 3_000 }).toBe(false);
    byOperative.heard.length = 0;
    await request(h.app).put(`/api/assignments/${ids.assignmentId}`).set(owner.auth).send({ crewId: ids.crewId, startDate: '2027-03-08', workingDays: 3, version: 1 }).expect(200);
    await expect.poll(() => byOwner.heard.filter((entry) => entry.message.type === 'assignment:moved').length, { timeout: 3_000 }).toBe(1);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(byOperative.heard).toEqual([]);
    expect(byOperative.socket.connected).toBe(true);
  });
});
