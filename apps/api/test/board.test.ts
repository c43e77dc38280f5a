import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { io as connect, type Socket } from 'socket.io-client';
import request from 'supertest';
import { afterAll, afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { BoardDto, ScheduleChangedMessage } from '@hodboard/shared';
import { attachRealtime } from '../src/realtime/socket-server.js';
import { pino } from 'pino';
import { addPerson, createHarness, populateFirm, signIn, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

let h: Harness;
let owner: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;

beforeEach(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Elm Street Masonry', 'owner@elm.example');
  ids = await populateFirm(h, owner);
  // Start each test from a booked job that is not yet on the board.
  await request(h.app).delete(`/api/assignments/${ids.assignmentId}`).query({ version: 1 }).set(owner.auth).expect(200);
  await request(h.app).delete(`/api/time-off/${ids.timeOffId}`).set(owner.auth).expect(204);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const place = (body: object, who = owner) => request(h.app).post('/api/assignments').set(who.auth).send(body);
const board = async (from: string, to: string, who = owner) =>
  (await request(h.app).get('/api/board').query({ from, to }).set(who.auth).expect(200)).body as BoardDto;

async function newBookedJob(title: string, days = 2): Promise<string> {
  const res = await request(h.app).post('/api/jobs').set(owner.auth)
    .send({ clientId: ids.clientId, siteId: ids.siteId, title, workTypes: ['brickwork'], estimatedWorkingDays: days }).expect(201);
  await request(h.app).post(`/api/jobs/${res.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
  return res.body.id as string;
}

describe('placing a job', () => {
  // Source: gov.uk bank holidays, England and Wales 2027: spring bank holiday Monday 31 May 2027.
  it('books the working days from the drop day, skipping the weekend and the bank holiday', async () => {
    const res = await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-05-27' }).expect(201);
    expect(res.body.assignment.days).toEqual(['2027-05-27', '2027-05-28', '2027-06-01']);
    expect(res.body.job.status).toBe('scheduled');
    const view = await board('2027-05-24', '2027-06-04');
    expect(view.days.find((d) => d.date === '2027-05-31')).toEqual({ date: '2027-05-31', isWorkingDay: false, offReason: 'Spring bank holiday' });
    expect(view.days.find((d) => d.date === '2027-05-29')?.offReason).toBe('Weekend');
    expect(view.trayJobIds).not.toContain(ids.jobId);
  });

  it("skips the crew's every-other-Friday leave, and shows it on the crew's row", async () => {
    await request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'crew', crewId: ids.crewId, label: 'Alternate Fridays', startDate: '2027-05-28', endDate: '2027-05-28', repeats: 'fortnightly' })
      .expect(201);
    const res = await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-05-27' }).expect(201);
    expect(res.body.assignment.days).toEqual(['2027-05-27', '2027-06-01', '2027-06-02']);
    const view = await board('2027-05-24', '2027-06-18');
    expect(view.crews[0]!.leave).toEqual([
      { date: '2027-05-28', label: 'Alternate Fridays' },
      { date: '2027-06-11', label: 'Alternate Fridays' },
    ]);
  });

  it('starts on the next working day when dropped on a Saturday', async () => {
    const res = await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-06' }).expect(201);
    expect(res.body.assignment.days[0]).toBe('2027-03-08');
  });

  it('refuses to schedule a job that is only an enquiry', async () => {
    const enquiry = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Maybe', workTypes: ['repairs'], estimatedWorkingDays: 1 }).expect(201);
    const res = await place({ jobId: enquiry.body.id, crewId: ids.crewId, startDate: '2027-03-01' }).expect(409);
    expect(res.body.code).toBe('illegal-transition');
  });
});

describe('moving, resizing and removing', () => {
  it('moves to another day, lengthens, then returns the job to the tray, with each step in its history', async () => {
    const placed = (await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201)).body;
    const moved = await request(h.app).put(`/api/assignments/${placed.assignment.id}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-03-04', workingDays: 3, version: placed.assignment.version }).expect(200);
    expect(moved.body.assignment.days).toEqual(['2027-03-04', '2027-03-05', '2027-03-08']);
    const longer = await request(h.app).put(`/api/assignments/${placed.assignment.id}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-03-04', workingDays: 5, version: moved.body.assignment.version }).expect(200);
    expect(longer.body.assignment.days).toHaveLength(5);
    const removed = await request(h.app).delete(`/api/assignments/${placed.assignment.id}`).query({ version: longer.body.assignment.version }).set(owner.auth).expect(200);
    expect(removed.body.job.status).toBe('booked');
    expect((await board('2027-03-01', '2027-03-12')).trayJobIds).toContain(ids.jobId);
    const history = await request(h.app).get(`/api/jobs/${ids.jobId}/history`).set(owner.auth).expect(200);
    expect((history.body as Array<{ action: string }>).map((e) => e.action).slice(0, 4)).toEqual(['unscheduled', 'rescheduled', 'rescheduled', 'scheduled']);
    // The history reads in words: dates as the office says them, not as stored.
    const summaries = (history.body as Array<{ summary: string }>).map((e) => e.summary).slice(0, 4);
    expect(summaries[0]).toBe('Taken off the board');
    expect(summaries[2]).toBe('Dates changed: Thu 4 Mar to Mon 8 Mar');
    expect(summaries[3]).toMatch(/^Put on .+, Mon 1 Mar to Wed 3 Mar$/);
  });

  it('answers a stale version with 409, the current state and who changed it', async () => {
    const placed = (await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201)).body;
    await request(h.app).put(`/api/assignments/${placed.assignment.id}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-03-02', workingDays: 3, version: 1 }).expect(200);
    const stale = await request(h.app).put(`/api/assignments/${placed.assignment.id}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-03-09', workingDays: 3, version: 1 }).expect(409);
    expect(stale.body).toMatchObject({ code: 'stale-version', changedBy: 'Elm Street Masonry Owner', current: { version: 2, startDate: '2027-03-02' } });
  });

  it('applies exactly one of many simultaneous moves of the same job and logs only that one', async () => {
    const placed = (await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201)).body;
    const starts = ['2027-03-02', '2027-03-03', '2027-03-04', '2027-03-05', '2027-03-08', '2027-03-09', '2027-03-10', '2027-03-11'];
    const results = await Promise.all(starts.map((startDate) =>
      request(h.app).put(`/api/assignments/${placed.assignment.id}`).set(owner.auth).send({ crewId: ids.crewId, startDate, workingDays: 3, version: 1 })));
    const statuses = results.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(starts.length - 1);
    const winner = results.find((r) => r.status === 200)!;
    const view = await board('2027-03-01', '2027-03-31');
    expect(view.assignments[0]!.startDate).toBe(winner.body.assignment.startDate);
    const history = await request(h.app).get(`/api/jobs/${ids.jobId}/history`).set(owner.auth).expect(200);
    expect((history.body as Array<{ action: string }>).filter((e) => e.action === 'rescheduled')).toHaveLength(1);
  });
});

describe('conflicts', () => {
  it('asks before double-booking a crew, then saves and flags it once confirmed', async () => {
    await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201);
    const second = await newBookedJob('Second job on the same days');
    const asked = await place({ jobId: second, crewId: ids.crewId, startDate: '2027-03-03' }).expect(409);
    expect(asked.body).toMatchObject({ code: 'needs-confirmation', days: ['2027-03-03'] });
    const confirmed = await place({ jobId: second, crewId: ids.crewId, startDate: '2027-03-03', confirmDoubleBooking: true }).expect(201);
    expect(confirmed.body.conflicts.filter((c: { kind: string }) => c.kind === 'double-booked')).toHaveLength(2);
    const view = await board('2027-03-01', '2027-03-12');
    expect(view.conflicts.filter((c) => c.kind === 'double-booked').map((c) => c.date)).toEqual(['2027-03-03', '2027-03-03']);
  });

  it('saves but flags a job placed before its earliest start', async () => {
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/jobs/${ids.jobId}`).set(owner.auth)
      .send({ ...job.body, earliestStart: '2027-03-10', version: job.body.version }).expect(200);
    const res = await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201);
    expect(res.body.conflicts).toEqual([expect.objectContaining({ kind: 'before-earliest-start', message: 'Starts before the earliest start of 2027-03-10' })]);
  });

  it("flags the days a crew member is on leave", async () => {
    const crew = await request(h.app).get(`/api/crews/${ids.crewId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ ...crew.body, memberIds: [ids.memberId] }).expect(200);
    await request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'member', memberId: ids.memberId, label: 'Holiday', startDate: '2027-03-02', endDate: '2027-03-02' }).expect(201);
    const res = await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201);
    expect(res.body.conflicts).toEqual([expect.objectContaining({ kind: 'member-on-leave', date: '2027-03-02' })]);
  });
});

describe('editing leave and closures', () => {
  // Each probe is a new job on the same crew, so the earlier probes' days are booked already: that double-booking is confirmed.
  const daysOfNewJob = async (title: string, startDate: string) =>
    (await place({ jobId: await newBookedJob(title, 3), crewId: ids.crewId, startDate, confirmDoubleBooking: true }).expect(201)).body.assignment.days as string[];
  const leaveOn = async (from: string, to: string) => (await board(from, to)).crews[0]!.leave;

  it("moves the crew's leave rows and the days of a job placed next when the entry's repeat and dates change, and gives them back when it is deleted", async () => {
    const created = await request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'crew', crewId: ids.crewId, label: 'Alternate Fridays', startDate: '2027-05-28', endDate: '2027-05-28', repeats: 'fortnightly' })
      .expect(201);
    expect(await leaveOn('2027-05-24', '2027-06-18')).toEqual([
      { date: '2027-05-28', label: 'Alternate Fridays' },
      { date: '2027-06-11', label: 'Alternate Fridays' },
    ]);
    // Fortnightly, Friday 4 June is a working day.
    expect(await daysOfNewJob('Before the edit', '2027-06-03')).toEqual(['2027-06-03', '2027-06-04', '2027-06-07']);

    const weekly = await request(h.app).put(`/api/time-off/${created.body.id}`).set(owner.auth)
      .send({ scope: 'crew', crewId: ids.crewId, label: 'Fridays off', startDate: '2027-05-28', endDate: '2027-05-28', repeats: 'weekly', version: created.body.version })
      .expect(200);
    expect(await leaveOn('2027-05-24', '2027-06-18')).toEqual(
      ['2027-05-28', '2027-06-04', '2027-06-11', '2027-06-18'].map((date) => ({ date, label: 'Fridays off' })),
    );
    expect(await daysOfNewJob('After the weekly edit', '2027-06-03')).toEqual(['2027-06-03', '2027-06-07', '2027-06-08']);

    await request(h.app).put(`/api/time-off/${created.body.id}`).set(owner.auth)
      .send({ scope: 'crew', crewId: ids.crewId, label: 'Thursdays off', startDate: '2027-06-03', endDate: '2027-06-03', repeats: 'weekly', repeatUntil: '2027-06-10', version: weekly.body.version })
      .expect(200);
    expect(await leaveOn('2027-05-24', '2027-06-25')).toEqual([
      { date: '2027-06-03', label: 'Thursdays off' },
      { date: '2027-06-10', label: 'Thursdays off' },
    ]);
    expect(await daysOfNewJob('After the date edit', '2027-06-03')).toEqual(['2027-06-04', '2027-06-07', '2027-06-08']);
    expect(await daysOfNewJob('Past the last repeat', '2027-06-17')).toEqual(['2027-06-17', '2027-06-18', '2027-06-21']);

    await request(h.app).delete(`/api/time-off/${created.body.id}`).set(owner.auth).expect(204);
    expect(await leaveOn('2027-05-24', '2027-06-25')).toEqual([]);
    expect(await daysOfNewJob('After the delete', '2027-06-03')).toEqual(['2027-06-03', '2027-06-04', '2027-06-07']);
  });

  it('moves a firm closure on the board and out of the next job when its dates change, and opens the day again when deleted', async () => {
    const day = async (date: string) => (await board('2027-03-01', '2027-03-05')).days.find((d) => d.date === date);
    const closure = await request(h.app).post('/api/time-off').set(owner.auth)
      .send({ scope: 'firm', label: 'Yard stocktake', startDate: '2027-03-03', endDate: '2027-03-03' }).expect(201);
    expect(await day('2027-03-03')).toEqual({ date: '2027-03-03', isWorkingDay: false, offReason: 'Yard stocktake' });
    expect(await daysOfNewJob('Around the stocktake', '2027-03-02')).toEqual(['2027-03-02', '2027-03-04', '2027-03-05']);

    await request(h.app).put(`/api/time-off/${closure.body.id}`).set(owner.auth)
      .send({ scope: 'firm', label: 'Yard stocktake', startDate: '2027-03-04', endDate: '2027-03-05', version: closure.body.version }).expect(200);
    expect(await day('2027-03-03')).toEqual({ date: '2027-03-03', isWorkingDay: true, offReason: null });
    expect(await day('2027-03-05')).toEqual({ date: '2027-03-05', isWorkingDay: false, offReason: 'Yard stocktake' });
    expect(await daysOfNewJob('After the stocktake moved', '2027-03-02')).toEqual(['2027-03-02', '2027-03-03', '2027-03-08']);

    await request(h.app).delete(`/api/time-off/${closure.body.id}`).set(owner.auth).expect(204);
    expect(await day('2027-03-05')).toEqual({ date: '2027-03-05', isWorkingDay: true, offReason: null });
    expect(await daysOfNewJob('With no stocktake', '2027-03-02')).toEqual(['2027-03-02', '2027-03-03', '2027-03-04']);
  });
});

describe('crew roles on the board', () => {
  it("shows a crew lead only their own crew's row and jobs, and refuses them moves", async () => {
    const otherCrew = await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Other crew', colour: '#aa3300' }).expect(201);
    await addPerson(h, owner, 'crew-lead', 'lead@elm.example');
    const crew = await request(h.app).get(`/api/crews/${ids.crewId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ ...crew.body, leadMemberId: await memberIdOf('lead@elm.example') }).expect(200);
    await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201);
    const other = await newBookedJob('Other crew job');
    await place({ jobId: other, crewId: otherCrew.body.id, startDate: '2027-03-01' }).expect(201);
    // Signing in again picks up the crew the lead now runs.
    const leadAgain = await signIn(h, 'lead@elm.example');
    const view = await board('2027-03-01', '2027-03-05', leadAgain);
    expect(view.crews.map((c) => c.id)).toEqual([ids.crewId]);
    expect(Object.keys(view.jobs)).toEqual([ids.jobId]);
    const jobs = await request(h.app).get('/api/jobs').set(leadAgain.auth).expect(200);
    expect(jobs.body.items.map((j: { id: string }) => j.id)).toEqual([ids.jobId]);
    await request(h.app).get(`/api/jobs/${other}`).set(leadAgain.auth).expect(404);
    await place({ jobId: other, crewId: ids.crewId, startDate: '2027-03-08' }, leadAgain).expect(403);
    const asked = await request(h.app).get('/api/board').query({ from: '2027-03-01', to: '2027-03-05', crewId: otherCrew.body.id }).set(leadAgain.auth).expect(200);
    expect(asked.body.crews).toEqual([]);
    expect(asked.body.assignments).toEqual([]);
  });
});

async function memberIdOf(email: string): Promise<string> {
  const people = await request(h.app).get('/api/people').set(owner.auth).expect(200);
  return (people.body as Array<{ id: string; email: string }>).find((p) => p.email === email)!.id;
}

describe('live pushes', () => {
  let server: Server;
  let url: string;
  const sockets: Socket[] = [];

  beforeEach(async () => {
    server = createServer(h.app);
    attachRealtime(server, h.services.auth, h.services.events, pino({ level: 'silent' }));
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  });
  afterEach(async () => {
    for (const socket of sockets.splice(0)) socket.disconnect();
    await new Promise((resolve) => server.close(resolve));
  });

  async function listen(who: SignedIn): Promise<ScheduleChangedMessage[]> {
    const socket = connect(url, { auth: { token: who.token }, transports: ['websocket'], reconnection: false });
    sockets.push(socket);
    await new Promise<void>((resolve, reject) => {
      socket.on('connect', () => resolve());
      socket.on('connect_error', reject);
    });
    const received: ScheduleChangedMessage[] = [];
    socket.on('schedule:changed', (message) => received.push(message));
    return received;
  }

  it("pushes a move to the firm's office and to nobody in another firm", async () => {
    const otherFirm = await signUpFirm(h, 'Fir Tree Builders', 'owner@fir.example');
    const office = await addPerson(h, owner, 'office', 'office@elm.example');
    const seenByOffice = await listen(office);
    const seenByOtherFirm = await listen(otherFirm);
    await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201);
    await expect.poll(() => seenByOffice.length, { timeout: 3000 }).toBe(1);
    expect(seenByOffice[0]).toMatchObject({ type: 'assignment:created', change: { job: { id: ids.jobId }, assignment: { crewId: ids.crewId } } });
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(seenByOtherFirm).toEqual([]);
  });

  it("pushes a move between crews to both crews' leads and not to a third crew's", async () => {
    const leads: Record<string, SignedIn> = {};
    const crewIds: Record<string, string> = { from: ids.crewId };
    for (const name of ['from', 'to', 'bystander']) leads[name] = await addPerson(h, owner, 'crew-lead', `${name}-lead@elm.example`);
    const crew = await request(h.app).get(`/api/crews/${ids.crewId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ ...crew.body, leadMemberId: await memberIdOf('from-lead@elm.example') }).expect(200);
    for (const [name, colour] of [['to', '#3366aa'], ['bystander', '#aa6633']] as const) {
      const created = await request(h.app).post('/api/crews').set(owner.auth)
        .send({ name: `Crew ${name}`, colour, leadMemberId: await memberIdOf(`${name}-lead@elm.example`) }).expect(201);
      crewIds[name] = created.body.id;
    }
    const placed = await place({ jobId: ids.jobId, crewId: crewIds.from, startDate: '2027-03-01' }).expect(201);
    const heard = { from: await listen(leads.from!), to: await listen(leads.to!), bystander: await listen(leads.bystander!) };

    await request(h.app).put(`/api/assignments/${placed.body.assignment.id}`).set(owner.auth)
      .send({ crewId: crewIds.to, startDate: '2027-03-08', workingDays: 3, version: placed.body.assignment.version }).expect(200);
    for (const name of ['from', 'to'] as const) {
      await expect.poll(() => heard[name].length, { timeout: 3000 }).toBe(1);
      expect(heard[name][0], name).toMatchObject({ type: 'assignment:moved', change: { job: { id: ids.jobId }, assignment: { crewId: crewIds.to, startDate: '2027-03-08' } } });
    }
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(heard.bystander).toEqual([]);
  });

  it('refuses a socket without a valid token', async () => {
    const socket = connect(url, { auth: { token: 'nonsense' }, transports: ['websocket'], reconnection: false });
    sockets.push(socket);
    const error = await new Promise<Error>((resolve) => socket.on('connect_error', resolve));
    expect(error.message).toBe('unauthenticated');
  });

  it('replays changes after the last event a reconnecting client saw', async () => {
    const before = await board('2027-03-01', '2027-03-12');
    await place({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-01' }).expect(201);
    const changes = await request(h.app).get('/api/board/changes').query({ afterEventId: before.lastEventId }).set(owner.auth).expect(200);
    expect(changes.body).toEqual([expect.objectContaining({ type: 'assignment:created', payload: expect.objectContaining({ job: expect.objectContaining({ id: ids.jobId }) }) })]);
  });
});
