import request from 'supertest';
import sharp from 'sharp';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import type { AccessBookingDto, BoardDto, JobHistoryEntryDto, PhotoDto, ScaffoldInspectionDto } from '@hodboard/shared';
import { ForecastHourRow, ScaffoldInspection } from '../src/entities/index.js';
import { createMailCatcher, type CaughtMail, type MailCatcher } from '../src/fakes/mail-catcher.js';
import { scenarioHours } from '../src/fakes/weather-scenarios.js';
import { SmtpMailer } from '../src/services/mailer.js';
import { addPerson, createHarness, populateFirm, signIn, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { binaryParser, pdfText } from './quotes-helpers.js';

let h: Harness;
let owner: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;
let supplierId: string;

// populateFirm places its job on 2027-03-01 for 3 working days: Mon 1 – Wed 3 March 2027.
beforeEach(async () => {
  h = await createHarness();
  h.now.value = new Date('2027-02-01T09:00:00Z');
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Gorse Hill Builders', 'owner@gorse.example');
  ids = await populateFirm(h, owner);
  // Each test makes its own booking with its own supplier; the one populateFirm made is set aside.
  await request(h.app).post(`/api/access-bookings/${ids.bookingId}/state`).set(owner.auth).send({ state: 'cancelled', version: 1 }).expect(200);
  const supplier = await request(h.app).post('/api/suppliers').set(owner.auth)
    .send({ name: 'Lofty Poles Scaffolding', contactName: 'Dana', email: 'hire@loftypoles.example', leadTimeWorkingDays: 3, minimumWeeks: 2, weeklyRates: { scaffold: 18_000 } })
    .expect(201);
  supplierId = supplier.body.id;
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const book = () => request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [ids.jobId], accessType: 'scaffold', supplierId }).expect(201);
const moveJob = async (startDate: string, workingDays = 3) => {
  const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
  return request(h.app).put(`/api/assignments/${job.body.assignment.id}`).set(owner.auth)
    .send({ crewId: ids.crewId, startDate, workingDays, version: job.body.assignment.version }).expect(200);
};
const bookingNow = async (id: string) => (await request(h.app).get(`/api/access-bookings/${id}`).set(owner.auth).expect(200)).body as AccessBookingDto;
/** The token of the answer page linked from the last e-mail to this supplier, read from the URL as a mail client would. */
const mailedLinkToken = (to: string) => {
  const mail = h.mailer.lastTo(to);
  const href = mail && /https?:\/\/\S+/.exec(mail.text)?.[0];
  if (!href) throw new Error(`no link mailed to ${to}`);
  const url = new URL(href);
  expect(url.pathname).toBe('/supplier-response');
  const token = url.searchParams.get('token');
  if (!token) throw new Error('the mailed link has no token');
  return token;
};
const linkToken = () => mailedLinkToken('hire@loftypoles.example');

describe('a booking that is only requested', () => {
  it('takes the window the job needs: up the working day before, down the working day after', async () => {
    const booking = (await book()).body as AccessBookingDto;
    // Source: accessWindowFor (erect one working day before the first job day, strike the working day after the last).
    expect(booking).toMatchObject({ state: 'requested', requestedErect: '2027-02-26', requestedStrike: '2027-03-04', weeklyRate: 18_000, minimumWeeks: 2 });
  });

  it('follows the job when it moves, without mailing the supplier', async () => {
    const booking = (await book()).body as AccessBookingDto;
    await moveJob('2027-03-10');
    expect(await bookingNow(booking.id)).toMatchObject({ requestedErect: '2027-03-09', requestedStrike: '2027-03-15', pendingChange: null });
    expect(h.mailer.outbox.filter((m) => m.to === 'hire@loftypoles.example')).toHaveLength(0);
  });
});

describe("the job's history", () => {
  const historyOf = async (jobId: string) => (await request(h.app).get(`/api/jobs/${jobId}/history`).set(owner.auth).expect(200)).body as JobHistoryEntryDto[];

  it("tells what became of the job's access beside the job's own changes, in words", async () => {
    const booking = (await book()).body as AccessBookingDto;
    await moveJob('2027-03-10');
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: (await bookingNow(booking.id)).version }).expect(200);

    const history = await historyOf(ids.jobId);
    expect(history.filter((entry) => entry.about === 'access').map((entry) => entry.summary).slice(0, 3)).toEqual([
      'Scaffold agreed with the supplier',
      'Scaffold dates moved with the job, Tue 9 Mar to Mon 15 Mar',
      'Scaffold asked for',
    ]);
    expect(history.filter((entry) => entry.about === 'job').map((entry) => entry.action)).toContain('rescheduled');
  });

  it("leaves out access booked only for another job", async () => {
    const before = (await historyOf(ids.jobId)).length;
    const other = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Rebuild chimney stack', workTypes: ['chimney'], estimatedWorkingDays: 2, accessNeeds: ['scaffold'] })
      .expect(201);
    await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [other.body.id], accessType: 'scaffold', supplierId }).expect(201);
    expect(await historyOf(ids.jobId)).toHaveLength(before);
    expect((await historyOf(other.body.id)).map((entry) => entry.summary)).toContain('Scaffold asked for');
  });
});

describe('the lead time a supplier needs', () => {
  const notConfirmed = async () =>
    ((await request(h.app).get('/api/board').query({ from: '2027-03-01', to: '2027-03-05' }).set(owner.auth).expect(200)).body as BoardDto).conflicts.filter((c) => c.kind === 'access-not-confirmed');

  it('flags a request not confirmed by the working day the supplier needs, until it is confirmed', async () => {
    const booking = (await book()).body as AccessBookingDto;
    // Up Fri 26 Feb with 3 working days' notice: confirm by Tue 23 Feb.
    h.now.value = new Date('2027-02-22T12:00:00Z');
    expect(await notConfirmed()).toEqual([]);
    h.now.value = new Date('2027-02-23T08:00:00Z');
    expect(await notConfirmed()).toEqual([expect.objectContaining({
      jobId: ids.jobId, severity: 'warning', date: null,
      message: "Scaffold not confirmed; Lofty Poles Scaffolding needs 3 working days' notice (by Tue 23 Feb)",
    })]);
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    expect(await notConfirmed()).toEqual([]);
  });
});

describe('a confirmed booking', () => {
  async function confirmed(): Promise<AccessBookingDto> {
    const booking = (await book()).body as AccessBookingDto;
    const res = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    return res.body as AccessBookingDto;
  }

  describe('mailed through the local SMTP catcher', () => {
    let catcher: MailCatcher;
    beforeAll(async () => {
      catcher = createMailCatcher({ smtpPort: 0, httpPort: 0 });
      await catcher.start();
    });
    afterAll(() => catcher.stop());
    beforeEach(() => {
      catcher.clear();
      // The same app over the same database, but sending its mail over SMTP as it does in development.
      const now = h.now.value;
      return createHarness({ mailer: new SmtpMailer({ host: '127.0.0.1', port: catcher.ports().smtp }, 'Hodboard <office@hodboard.example>') }).then((smtp) => {
        h = smtp;
        h.now.value = now;
      });
    });
    const caughtFor = async (to: string) => {
      const res = await fetch(`http://127.0.0.1:${catcher.ports().http}/messages?to=${encodeURIComponent(to)}`);
      expect(res.status).toBe(200);
      return (await res.json()) as CaughtMail[];
    };
    const requestCount = async (bookingId: string) =>
      Number(((await h.dataSource.query(`SELECT COUNT(*)::int AS n FROM access_change_request WHERE booking_id = $1`, [bookingId])) as Array<{ n: number }>)[0]!.n);

    it('raises exactly one change request and one e-mail when the job moves, and the mailed link accepts once', async () => {
      const booking = await confirmed();
      await moveJob('2027-03-10');
      const mails = await caughtFor('hire@loftypoles.example');
      expect(mails).toHaveLength(1);
      expect(await requestCount(booking.id)).toBe(1);
      const [mail] = mails;
      expect(mail!.text).toContain('up 2027-02-26, down 2027-03-04');
      expect(mail!.text).toContain('up 2027-03-09, down 2027-03-15');
      const pending = await bookingNow(booking.id);
      expect(pending.pendingChange).toMatchObject({ status: 'pending', newErect: '2027-03-09', newStrike: '2027-03-15' });
      expect(pending.confirmedErect).toBe('2027-02-26');

      // The link as the supplier's mail client shows it, the same in the text and the HTML part.
      const href = /https?:\/\/\S+/.exec(mail!.text)?.[0];
      expect(href).toBeDefined();
      expect(mail!.html).toContain(`href="${href!.replace(/&/g, '&amp;')}"`);
      const link = new URL(href!);
      expect(`${link.origin}${link.pathname}`).toBe('http://localhost:3000/supplier-response');
      // The answer page sends the token from its address to the public API, as followed here.
      const token = link.searchParams.get('token')!;
      const seen = await request(h.app).get(`/api/public/supplier-links/${encodeURIComponent(token)}`).expect(200);
      expect(seen.body).toMatchObject({ firmName: 'Gorse Hill Builders', supplierName: 'Lofty Poles Scaffolding', newErect: '2027-03-09', status: 'pending' });
      await request(h.app).post(`/api/public/supplier-links/${encodeURIComponent(token)}`).send({ answer: 'accept' }).expect(200);
      expect(await bookingNow(booking.id)).toMatchObject({ confirmedErect: '2027-03-09', confirmedStrike: '2027-03-15', pendingChange: null });
      const again = await request(h.app).post(`/api/public/supplier-links/${encodeURIComponent(token)}`).send({ answer: 'accept' }).expect(401);
      expect(again.body.code).toBe('token-invalid');
      // Answering mails nobody and raises no further request.
      expect(await caughtFor('hire@loftypoles.example')).toHaveLength(1);
      expect(await requestCount(booking.id)).toBe(1);
    });
  });

  it('does not mail again when the job moves back to dates already asked for', async () => {
    await confirmed();
    await moveJob('2027-03-10');
    await moveJob('2027-03-10', 3);
    expect(h.mailer.outbox.filter((m) => m.to === 'hire@loftypoles.example')).toHaveLength(1);
  });

  it("takes the supplier's counter-proposal as the booking's dates", async () => {
    const booking = await confirmed();
    await moveJob('2027-03-10');
    await request(h.app).post(`/api/public/supplier-links/${linkToken()}`)
      .send({ answer: 'propose', erectDate: '2027-03-08', strikeDate: '2027-03-16', note: 'Crew free Monday only' }).expect(200);
    const after = await bookingNow(booking.id);
    expect(after).toMatchObject({ confirmedErect: '2027-03-08', confirmedStrike: '2027-03-16' });
    expect(after.pendingChange).toMatchObject({ status: 'countered', supplierNote: 'Crew free Monday only' });
  });

  it('sets an answered counter-proposal aside when a newer request goes out, so it does not come back once that is accepted', async () => {
    const booking = await confirmed();
    await moveJob('2027-03-10');
    const first = linkToken();
    await request(h.app).post(`/api/public/supplier-links/${first}`).send({ answer: 'propose', erectDate: '2027-03-08', strikeDate: '2027-03-16', note: 'Crew free Monday only' }).expect(200);
    // Moved again: Wed 17 – Fri 19 March needs the scaffold up Tue 16, down Mon 22.
    await moveJob('2027-03-17');
    const asked = await bookingNow(booking.id);
    expect(asked.pendingChange).toMatchObject({ status: 'pending', oldErect: '2027-03-08', oldStrike: '2027-03-16', newErect: '2027-03-16', newStrike: '2027-03-22' });
    const second = linkToken();
    expect(second).not.toBe(first);
    await request(h.app).post(`/api/public/supplier-links/${second}`).send({ answer: 'accept' }).expect(200);
    expect(await bookingNow(booking.id)).toMatchObject({ confirmedErect: '2027-03-16', confirmedStrike: '2027-03-22', pendingChange: null });
    const rows = (await h.dataSource.query(`SELECT status, supplier_note FROM access_change_request WHERE booking_id = $1 ORDER BY created_at`, [booking.id])) as unknown[];
    expect(rows).toEqual([{ status: 'superseded', supplier_note: 'Crew free Monday only' }, { status: 'accepted', supplier_note: null }]);
    expect((await request(h.app).get(`/api/public/supplier-links/${first}`).expect(401)).body.detail).toMatch(/replaced by a newer request/);
  });

  it.each([
    ['an acceptance', { answer: 'accept' }, 'supplier-accepted', { confirmedErect: '2027-03-09', confirmedStrike: '2027-03-15', by: 'Lofty Poles Scaffolding', note: null }],
    ['a counter-proposal', { answer: 'propose', erectDate: '2027-03-08', strikeDate: '2027-03-16', note: 'Crew free Monday only' }, 'supplier-countered',
      { confirmedErect: '2027-03-08', confirmedStrike: '2027-03-16', by: 'Lofty Poles Scaffolding', note: 'Crew free Monday only' }],
  ])("writes one audit line for %s, by nobody signed in, with the dates before and after", async (_name, answer, action, after) => {
    const booking = await confirmed();
    await moveJob('2027-03-10');
    await request(h.app).post(`/api/public/supplier-links/${linkToken()}`).send(answer).expect(200);
    const rows = await h.dataSource.query(
      `SELECT firm_id, actor_user_id, action, before, after FROM audit_event WHERE entity_id = $1 AND action LIKE 'supplier-%'`, [booking.id],
    );
    expect(rows).toEqual([{
      firm_id: owner.session.firm.id, actor_user_id: null, action,
      before: { confirmedErect: '2027-02-26', confirmedStrike: '2027-03-04' }, after,
    }]);
  });

  it('refuses the link once it has expired', async () => {
    await confirmed();
    await moveJob('2027-03-10');
    h.now.value = new Date('2027-02-20T09:00:00Z');
    const res = await request(h.app).get(`/api/public/supplier-links/${linkToken()}`).expect(401);
    expect(res.body.code).toBe('token-expired');
  });

  it('refuses a made-up link and shows nothing of any firm', async () => {
    const res = await request(h.app).get(`/api/public/supplier-links/${'x'.repeat(43)}`).expect(401);
    expect(JSON.stringify(res.body)).not.toContain('Gorse');
  });

  const requestRows = async (bookingId: string) =>
    (await h.dataSource.query(`SELECT status FROM access_change_request WHERE booking_id = $1 ORDER BY created_at`, [bookingId])) as Array<{ status: string }>;
  const supplierAudit = async (bookingId: string) =>
    (await h.dataSource.query(`SELECT action FROM audit_event WHERE entity_id = $1 AND action LIKE 'supplier-%'`, [bookingId])) as unknown[];

  it.each([
    ['cancelled', 'cancelled this booking'],
    ['requested', 'back to a request'],
  ] as const)('withdraws the waiting request when the booking is %s, and the link then refuses an answer', async (state, detail) => {
    const booking = await confirmed();
    await moveJob('2027-03-10');
    const token = linkToken();
    const now = await bookingNow(booking.id);
    const after = (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state, version: now.version }).expect(200)).body as AccessBookingDto;
    expect(after.pendingChange).toBeNull();
    expect(await requestRows(booking.id)).toEqual([{ status: 'withdrawn' }]);

    expect((await request(h.app).get(`/api/public/supplier-links/${token}`).expect(200)).body).toMatchObject({ status: 'withdrawn' });
    const res = await request(h.app).post(`/api/public/supplier-links/${token}`).send({ answer: 'accept' }).expect(409);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'conflict', status: 409 });
    expect(res.body.detail).toContain(detail);
    expect(await bookingNow(booking.id)).toMatchObject({ state, confirmedErect: after.confirmedErect, confirmedStrike: after.confirmedStrike, version: after.version });
    expect(await supplierAudit(booking.id)).toEqual([]);
  });

  it("closes a supplier's counter-proposal when the booking goes back to a request", async () => {
    const booking = await confirmed();
    await moveJob('2027-03-10');
    await request(h.app).post(`/api/public/supplier-links/${linkToken()}`).send({ answer: 'propose', erectDate: '2027-03-08', strikeDate: '2027-03-16' }).expect(200);
    const now = await bookingNow(booking.id);
    expect(now.pendingChange).toMatchObject({ status: 'countered' });
    const after = (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'requested', version: now.version }).expect(200)).body as AccessBookingDto;
    expect(after.pendingChange).toBeNull();
    expect(await requestRows(booking.id)).toEqual([{ status: 'withdrawn' }]);
  });

  it('withdraws a new strike date asked of the supplier once the scaffold is struck, and refuses the answer', async () => {
    const booking = await confirmed();
    h.now.value = new Date('2027-02-26T15:00:00Z');
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'erected', version: booking.version }).expect(200);
    await moveJob('2027-03-01', 5);
    // Once up, only the strike moves: the working day after Fri 5 March is Mon 8 March.
    expect((await bookingNow(booking.id)).pendingChange).toMatchObject({ status: 'pending', newErect: '2027-02-26', newStrike: '2027-03-08' });
    const token = linkToken();
    h.now.value = new Date('2027-03-04T15:00:00Z');
    const now = await bookingNow(booking.id);
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'struck', version: now.version }).expect(200);
    expect(await requestRows(booking.id)).toEqual([{ status: 'withdrawn' }]);
    const res = await request(h.app).post(`/api/public/supplier-links/${token}`).send({ answer: 'propose', erectDate: '2027-02-26', strikeDate: '2027-03-09' }).expect(409);
    expect(res.body.detail).toContain('struck');
    expect(await bookingNow(booking.id)).toMatchObject({ state: 'struck', confirmedStrike: '2027-03-04' });
    expect(await supplierAudit(booking.id)).toEqual([]);
  });

  it('refuses an answer for a booking that is no longer confirmed even if its request was left open', async () => {
    const booking = await confirmed();
    await moveJob('2027-03-10');
    // As if the booking had been cancelled before requests were closed with it.
    await h.dataSource.query(`UPDATE access_booking SET state = 'cancelled' WHERE id = $1`, [booking.id]);
    const res = await request(h.app).post(`/api/public/supplier-links/${linkToken()}`).send({ answer: 'accept' }).expect(409);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.detail).toContain('cancelled this booking');
    expect(await requestRows(booking.id)).toEqual([{ status: 'pending' }]);
    expect(await bookingNow(booking.id)).toMatchObject({ confirmedErect: '2027-02-26', confirmedStrike: '2027-03-04' });
    expect(await supplierAudit(booking.id)).toEqual([]);
  });

  it('flags the job days outside the confirmed window on the board', async () => {
    await confirmed();
    await moveJob('2027-03-03', 3);
    const board = (await request(h.app).get('/api/board').query({ from: '2027-03-01', to: '2027-03-12' }).set(owner.auth).expect(200)).body as BoardDto;
    expect(board.conflicts.filter((c) => c.kind === 'outside-access-window').map((c) => c.date)).toEqual(['2027-03-04', '2027-03-05']);
    expect(board.accessBands).toEqual([expect.objectContaining({ accessType: 'scaffold', erect: '2027-02-26', strike: '2027-03-04', state: 'confirmed' })]);
  });
});

describe('a booking shared by neighbouring jobs at one site', () => {
  async function neighbour(siteId: string, startDate: string) {
    const job = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId, title: 'Rebuild barn chimney', workTypes: ['repairs'], estimatedWorkingDays: 2 }).expect(201);
    await request(h.app).post(`/api/jobs/${job.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    const placed = await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: job.body.id, crewId: ids.crewId, startDate }).expect(201);
    return { jobId: job.body.id as string, assignment: placed.body.assignment as { id: string; version: number } };
  }
  const bookingCount = async () => Number(((await h.dataSource.query(`SELECT COUNT(*)::int AS n FROM access_booking`)) as Array<{ n: number }>)[0]!.n);

  it('spans the days of both jobs and follows a move of either', async () => {
    const next = await neighbour(ids.siteId, '2027-03-08');
    const shared = (await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [ids.jobId, next.jobId], accessType: 'scaffold', supplierId }).expect(201)).body as AccessBookingDto;
    // Mon 1 – Wed 3 and Mon 8 – Tue 9 March: up the working day before the first, down the working day after the last.
    expect(shared).toMatchObject({ jobIds: [ids.jobId, next.jobId], requestedErect: '2027-02-26', requestedStrike: '2027-03-10', neededErect: '2027-02-26', neededStrike: '2027-03-10' });

    // The second job moves to Mon 15 – Tue 16 March: the strike follows it to Wed 17.
    await request(h.app).put(`/api/assignments/${next.assignment.id}`).set(owner.auth).send({ crewId: ids.crewId, startDate: '2027-03-15', workingDays: 2, version: next.assignment.version }).expect(200);
    expect(await bookingNow(shared.id)).toMatchObject({ requestedErect: '2027-02-26', requestedStrike: '2027-03-17' });
    // The first moves to Wed 24 – Fri 26 Feb: the erect follows it to Tue 23 Feb.
    await moveJob('2027-02-24');
    expect(await bookingNow(shared.id)).toMatchObject({ requestedErect: '2027-02-23', requestedStrike: '2027-03-17' });
    const board = (await request(h.app).get('/api/board').query({ from: '2027-02-22', to: '2027-03-19' }).set(owner.auth).expect(200)).body as BoardDto;
    expect(board.accessBands).toEqual([expect.objectContaining({ bookingId: shared.id, jobIds: [ids.jobId, next.jobId], erect: '2027-02-23', strike: '2027-03-17' })]);
  });

  it('refuses to share one booking between jobs at different sites, and books nothing', async () => {
    const elsewhere = await request(h.app).post('/api/sites').set(owner.auth).send({ clientId: ids.clientId, addressLine1: '7 Mill Race', town: 'Lowmoor', postcode: 'LM3 2RR' }).expect(201);
    const far = await neighbour(elsewhere.body.id, '2027-03-08');
    const before = await bookingCount();
    const res = await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [ids.jobId, far.jobId], accessType: 'scaffold', supplierId }).expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'validation-failed', errors: [{ path: 'jobIds', message: expect.stringMatching(/same site/) }] });
    expect(await bookingCount()).toBe(before);
  });
});

describe('supplier links across firms', () => {
  /** A second firm with its own job, supplier and confirmed scaffold, whose job has moved: a live link of its own. */
  async function otherFirmWithPendingChange() {
    const b = await signUpFirm(h, 'Thistle Walls', 'owner@thistle.example');
    const client = await request(h.app).post('/api/clients').set(b.auth).send({ name: 'Rowan Cottage' }).expect(201);
    const site = await request(h.app).post('/api/sites').set(b.auth)
      .send({ clientId: client.body.id, addressLine1: '14 Quarry Row', town: 'Fellside', postcode: 'FS2 7TB' }).expect(201);
    const crew = await request(h.app).post('/api/crews').set(b.auth).send({ name: 'Slate crew', colour: '#665544' }).expect(201);
    const job = await request(h.app).post('/api/jobs').set(b.auth)
      .send({ clientId: client.body.id, siteId: site.body.id, title: 'Rebuild chimney stack', workTypes: ['repairs'], estimatedWorkingDays: 3 }).expect(201);
    await request(h.app).post(`/api/jobs/${job.body.id}/status`).set(b.auth).send({ status: 'booked' }).expect(200);
    const placed = await request(h.app).post('/api/assignments').set(b.auth).send({ jobId: job.body.id, crewId: crew.body.id, startDate: '2027-03-01' }).expect(201);
    const supplier = await request(h.app).post('/api/suppliers').set(b.auth)
      .send({ name: 'Birch Pole Access', email: 'desk@birchpole.example', weeklyRates: { scaffold: 21_000 } }).expect(201);
    const booking = await request(h.app).post('/api/access-bookings').set(b.auth)
      .send({ jobIds: [job.body.id], accessType: 'scaffold', supplierId: supplier.body.id, reference: 'BP-7781' }).expect(201);
    await request(h.app).post(`/api/access-bookings/${booking.body.id}/state`).set(b.auth).send({ state: 'confirmed', version: booking.body.version }).expect(200);
    await request(h.app).put(`/api/assignments/${placed.body.assignment.id}`).set(b.auth)
      .send({ crewId: crew.body.id, startDate: '2027-03-15', workingDays: 3, version: placed.body.assignment.version }).expect(200);
    return { auth: b.auth, firmId: b.session.firm.id, bookingId: booking.body.id as string, token: mailedLinkToken('desk@birchpole.example') };
  }

  /** Everything firm B has that a supplier answer could touch: its booking as its office sees it, its requests and its audit lines. */
  async function stateOf(b: { auth: { Authorization: string }; firmId: string; bookingId: string }) {
    return {
      booking: (await request(h.app).get(`/api/access-bookings/${b.bookingId}`).set(b.auth).expect(200)).body as AccessBookingDto,
      requests: await h.dataSource.query(`SELECT * FROM access_change_request WHERE firm_id = $1 ORDER BY created_at`, [b.firmId]),
      audit: await h.dataSource.query(`SELECT id, action FROM audit_event WHERE firm_id = $1 ORDER BY at, id`, [b.firmId]),
    };
  }

  it("firm A's mailed link reads and answers only A's booking, once; firm B's booking and requests stay as they were", async () => {
    const booking = (await book()).body as AccessBookingDto;
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    await moveJob('2027-03-10');
    const tokenA = mailedLinkToken('hire@loftypoles.example');
    const b = await otherFirmWithPendingChange();
    const bBefore = await stateOf(b);
    expect(bBefore.booking.pendingChange).toMatchObject({ status: 'pending', newErect: '2027-03-12', newStrike: '2027-03-18' });

    const seen = await request(h.app).get(`/api/public/supplier-links/${tokenA}`).expect(200);
    expect(seen.body).toEqual({
      firmName: 'Gorse Hill Builders', supplierName: 'Lofty Poles Scaffolding', accessType: 'scaffold', jobReferences: [expect.any(String)],
      siteAddress: '2 Sheepwash Lane, Lowmoor, LM3 9QD', oldErect: '2027-02-26', oldStrike: '2027-03-04', newErect: '2027-03-09', newStrike: '2027-03-15',
      status: 'pending', expiresAt: expect.any(String),
    });
    for (const ofB of ['Thistle', 'Birch Pole', 'Quarry Row', 'BP-7781', b.bookingId, '2027-03-12']) expect(JSON.stringify(seen.body)).not.toContain(ofB);

    // Unknown keys are stripped, so naming B's booking in the body cannot steer A's link to it.
    const answered = await request(h.app).post(`/api/public/supplier-links/${tokenA}`).send({ answer: 'accept', bookingId: b.bookingId }).expect(200);
    expect(answered.body).toMatchObject({ firmName: 'Gorse Hill Builders', status: 'accepted' });
    expect(await bookingNow(booking.id)).toMatchObject({ confirmedErect: '2027-03-09', confirmedStrike: '2027-03-15', pendingChange: null });
    expect(await stateOf(b)).toEqual(bBefore);

    // Single use: the answered link is refused for a second answer of either kind, and still leaves B alone.
    for (const again of [{ answer: 'accept' }, { answer: 'propose', erectDate: '2027-03-11', strikeDate: '2027-03-19' }]) {
      const res = await request(h.app).post(`/api/public/supplier-links/${tokenA}`).send(again).expect(401);
      expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
      expect(res.body.code).toBe('token-invalid');
    }
    expect(await bookingNow(booking.id)).toMatchObject({ confirmedErect: '2027-03-09', confirmedStrike: '2027-03-15' });
    expect(await stateOf(b)).toEqual(bBefore);
  });

  it("firm B's link answers B's request and leaves firm A's booking untouched", async () => {
    const booking = (await book()).body as AccessBookingDto;
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    await moveJob('2027-03-10');
    const aBefore = await stateOf({ auth: owner.auth, firmId: owner.session.firm.id, bookingId: booking.id });
    const b = await otherFirmWithPendingChange();

    const seen = await request(h.app).get(`/api/public/supplier-links/${b.token}`).expect(200);
    expect(seen.body).toMatchObject({ firmName: 'Thistle Walls', supplierName: 'Birch Pole Access', siteAddress: '14 Quarry Row, Fellside, FS2 7TB' });
    for (const ofA of ['Gorse', 'Lofty Poles', 'Sheepwash', booking.id]) expect(JSON.stringify(seen.body)).not.toContain(ofA);
    await request(h.app).post(`/api/public/supplier-links/${b.token}`).send({ answer: 'propose', erectDate: '2027-03-11', strikeDate: '2027-03-19' }).expect(200);

    expect((await stateOf(b)).booking).toMatchObject({ confirmedErect: '2027-03-11', confirmedStrike: '2027-03-19' });
    expect(await stateOf({ auth: owner.auth, firmId: owner.session.firm.id, bookingId: booking.id })).toEqual(aBefore);
  });
});

describe('bookings whose jobs leave the board or are cancelled', () => {
  const toTray = async () => {
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).delete(`/api/assignments/${job.body.assignment.id}`).query({ version: job.body.assignment.version }).set(owner.auth).expect(200);
  };
  const cancelJob = () => request(h.app).post(`/api/jobs/${ids.jobId}/status`).set(owner.auth).send({ status: 'cancelled' }).expect(200);
  const confirm = async (booking: AccessBookingDto) =>
    (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200)).body as AccessBookingDto;
  const mailsTo = (to: string) => h.mailer.outbox.filter((m) => m.to === to);
  const auditOf = async (bookingId: string) =>
    ((await h.dataSource.query(`SELECT action, after FROM audit_event WHERE entity_id = $1 ORDER BY at, id`, [bookingId])) as Array<{ action: string; after: unknown }>);

  it('cancels a booking that is only requested when its job goes back to the tray, and tells nobody outside', async () => {
    const booking = (await book()).body as AccessBookingDto;
    await toTray();
    expect(await bookingNow(booking.id)).toMatchObject({ state: 'cancelled', cancelledBecause: 'job-unscheduled', hasNoWork: false, neededErect: null });
    expect((await auditOf(booking.id)).at(-1)).toEqual({ action: 'cancelled-with-job', after: { state: 'cancelled', reason: 'job-unscheduled' } });
    expect(mailsTo('hire@loftypoles.example')).toHaveLength(0);
    const board = (await request(h.app).get('/api/board').query({ from: '2027-03-01', to: '2027-03-05' }).set(owner.auth).expect(200)).body as BoardDto;
    expect(board.trayJobIds).toContain(ids.jobId);
    expect(board.accessBands).toEqual([]);
  });

  it('asks again for the window the job needs now when a lapsed request is made again', async () => {
    const booking = (await book()).body as AccessBookingDto;
    await toTray();
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: ids.jobId, crewId: ids.crewId, startDate: '2027-03-10' }).expect(201);
    const lapsed = await bookingNow(booking.id);
    const again = (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'requested', version: lapsed.version }).expect(200)).body as AccessBookingDto;
    // Wed 10 – Fri 12 March: up Tue 9, down Mon 15.
    expect(again).toMatchObject({ state: 'requested', requestedErect: '2027-03-09', requestedStrike: '2027-03-15', cancelledBecause: null, hasNoWork: false });
  });

  it('keeps a confirmed booking when its job goes back to the tray, flags it, and mails the supplier when the office cancels it', async () => {
    const booking = await confirm((await book()).body as AccessBookingDto);
    await toTray();
    const flagged = await bookingNow(booking.id);
    expect(flagged).toMatchObject({ state: 'confirmed', hasNoWork: true, neededErect: null, confirmedErect: '2027-02-26', confirmedStrike: '2027-03-04' });
    expect(mailsTo('hire@loftypoles.example')).toHaveLength(0);

    const cancelled = (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'cancelled', version: flagged.version }).expect(200)).body as AccessBookingDto;
    expect(cancelled).toMatchObject({ state: 'cancelled', cancelledBecause: null, hasNoWork: false });
    const [notice] = mailsTo('hire@loftypoles.example');
    expect(mailsTo('hire@loftypoles.example')).toHaveLength(1);
    expect(notice!.subject).toBe('Cancelled: scaffold at 2 Sheepwash Lane, Lowmoor, LM3 9QD');
    expect(notice!.text).toContain('Gorse Hill Builders no longer needs the scaffold at 2 Sheepwash Lane, Lowmoor, LM3 9QD. Please cancel the booking.');
    expect(notice!.text).toContain('Booked: up 2027-02-26, down 2027-03-04');
  });

  it('does not mail the supplier when the office cancels a booking that was only requested', async () => {
    const booking = (await book()).body as AccessBookingDto;
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'cancelled', version: booking.version }).expect(200);
    expect(mailsTo('hire@loftypoles.example')).toHaveLength(0);
  });

  it('cancels a confirmed booking with its job, withdraws the dates asked of the supplier and tells them in writing', async () => {
    const booking = await confirm((await book()).body as AccessBookingDto);
    await moveJob('2027-03-10');
    const token = linkToken();
    await cancelJob();
    expect(await bookingNow(booking.id)).toMatchObject({ state: 'cancelled', cancelledBecause: 'job-cancelled', pendingChange: null });
    const mails = mailsTo('hire@loftypoles.example');
    expect(mails.map((m) => m.subject)).toEqual(['Date change for scaffold at 2 Sheepwash Lane, Lowmoor, LM3 9QD', 'Cancelled: scaffold at 2 Sheepwash Lane, Lowmoor, LM3 9QD']);
    expect(mails[1]!.text).toContain('Booked: up 2027-02-26, down 2027-03-04');
    const answer = await request(h.app).post(`/api/public/supplier-links/${token}`).send({ answer: 'accept' }).expect(409);
    expect(answer.body.detail).toContain('cancelled this booking');
    expect((await auditOf(booking.id)).at(-1)).toEqual({ action: 'cancelled-with-job', after: { state: 'cancelled', reason: 'job-cancelled' } });
  });

  it('cancels a requested booking with its job without mailing anyone', async () => {
    const booking = (await book()).body as AccessBookingDto;
    await cancelJob();
    expect(await bookingNow(booking.id)).toMatchObject({ state: 'cancelled', cancelledBecause: 'job-cancelled' });
    expect(mailsTo('hire@loftypoles.example')).toHaveLength(0);
  });

  it('leaves a scaffold that is already up standing when its job is cancelled, flagged for the office to have it struck', async () => {
    const booking = await confirm((await book()).body as AccessBookingDto);
    h.now.value = new Date('2027-02-26T15:00:00Z');
    await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'erected', version: booking.version }).expect(200);
    await cancelJob();
    expect(await bookingNow(booking.id)).toMatchObject({ state: 'erected', hasNoWork: true, cancelledBecause: null });
    expect(mailsTo('hire@loftypoles.example')).toHaveLength(0);
  });

  it('keeps a booking shared with a neighbouring job when one of the jobs is cancelled, and follows the job left', async () => {
    const next = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Rebuild barn chimney', workTypes: ['repairs'], estimatedWorkingDays: 2 }).expect(201);
    await request(h.app).post(`/api/jobs/${next.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: next.body.id, crewId: ids.crewId, startDate: '2027-03-08' }).expect(201);
    const shared = (await request(h.app).post('/api/access-bookings').set(owner.auth).send({ jobIds: [ids.jobId, next.body.id], accessType: 'scaffold', supplierId }).expect(201)).body as AccessBookingDto;
    // Mon 1 – Wed 3 and Mon 8 – Tue 9 March: up Fri 26 Feb, down Wed 10 March.
    expect(shared).toMatchObject({ requestedErect: '2027-02-26', requestedStrike: '2027-03-10' });
    await cancelJob();
    // Only Mon 8 – Tue 9 March left: up Fri 5, down Wed 10.
    expect(await bookingNow(shared.id)).toMatchObject({ state: 'requested', jobIds: [next.body.id], requestedErect: '2027-03-05', requestedStrike: '2027-03-10', hasNoWork: false });
  });
});

describe('live updates for the crews on the job', () => {
  function listen() {
    const seen: Array<{ type: string; id: string; crewIds?: string[] }> = [];
    const stop = h.services.events.subscribe((event) => {
      if (event.type.startsWith('access:')) seen.push({ type: event.type, id: event.id, crewIds: event.crewIds });
    });
    return { seen, stop };
  }

  it("sends a booking's changes and its supplier's answer to the rooms of the crews placed on its jobs", async () => {
    const booking = (await book()).body as AccessBookingDto;
    const { seen, stop } = listen();
    try {
      await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
      await vi.waitFor(() => expect(seen).toContainEqual({ type: 'access:updated', id: booking.id, crewIds: [ids.crewId] }));
      await moveJob('2027-03-10');
      await request(h.app).post(`/api/public/supplier-links/${linkToken()}`).send({ answer: 'accept' }).expect(200);
      await vi.waitFor(() => expect(seen).toContainEqual({ type: 'access:answered', id: booking.id, crewIds: [ids.crewId] }));
    } finally {
      stop();
    }
  });

  it('tells only the office about a booking none of whose jobs is on a crew', async () => {
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).delete(`/api/assignments/${job.body.assignment.id}`).query({ version: job.body.assignment.version }).set(owner.auth).expect(200);
    const booking = (await book()).body as AccessBookingDto;
    const { seen, stop } = listen();
    try {
      await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'cancelled', version: booking.version }).expect(200);
      await vi.waitFor(() => expect(seen).toContainEqual({ type: 'access:updated', id: booking.id, crewIds: [] }));
    } finally {
      stop();
    }
  });
});

describe('hire cost', () => {
  it('charges part weeks as whole weeks and never less than the minimum', async () => {
    const booking = (await book()).body as AccessBookingDto;
    // 26 Feb → 4 Mar is 6 days on hire: one part week, raised to the 2-week minimum. Source: hireCost (part weeks up, minimum weeks).
    expect(booking.hire).toMatchObject({ hireDays: 6, chargedWeeks: 2, pence: 36_000, pricedWeeks: 2, overPricedPence: 0 });
    await moveJob('2027-03-01', 12);
    const longer = await bookingNow(booking.id);
    // 26 Feb → 17 Mar is 19 days: three weeks, one more than priced.
    expect(longer.hire).toMatchObject({ hireDays: 19, chargedWeeks: 3, overPricedPence: 18_000 });
    const board = (await request(h.app).get('/api/board').query({ from: '2027-03-01', to: '2027-03-19' }).set(owner.auth).expect(200)).body as BoardDto;
    expect(board.conflicts.find((c) => c.kind === 'hire-extended')?.message).toContain('£180.00 extra');
  });
});

describe('hire cost from the days the access actually stood', () => {
  it('counts from the day it went up and to the day it came down, whatever dates were booked', async () => {
    const created = (await request(h.app).post('/api/access-bookings').set(owner.auth)
      .send({ jobIds: [ids.jobId], accessType: 'scaffold', supplierId, minimumWeeks: 1, pricedWeeks: 1 }).expect(201)).body as AccessBookingDto;
    // Booked Fri 26 Feb → Thu 4 Mar 2027: 6 days, one part week = 1 week × £180.00.
    expect(created.hire).toMatchObject({ erect: '2027-02-26', strike: '2027-03-04', hireDays: 6, chargedWeeks: 1, pence: 18_000, overPricedPence: 0 });
    const confirmed = (await request(h.app).post(`/api/access-bookings/${created.id}/state`).set(owner.auth).send({ state: 'confirmed', version: created.version }).expect(200)).body as AccessBookingDto;

    // Put up early, on Mon 22 Feb: 22 Feb → 4 Mar is 10 days = 2 weeks (part week up) = £360.00, one week (£180.00) over the price.
    h.now.value = new Date('2027-02-22T10:00:00Z');
    const up = (await request(h.app).post(`/api/access-bookings/${created.id}/state`).set(owner.auth).send({ state: 'erected', version: confirmed.version }).expect(200)).body as AccessBookingDto;
    expect(up.hire).toMatchObject({ erect: '2027-02-22', strike: '2027-03-04', hireDays: 10, chargedWeeks: 2, pence: 36_000, pricedWeeks: 1, overPricedPence: 18_000 });
    const board = (await request(h.app).get('/api/board').query({ from: '2027-03-01', to: '2027-03-05' }).set(owner.auth).expect(200)).body as BoardDto;
    expect(board.conflicts.find((c) => c.kind === 'hire-extended')?.message).toBe('Hire now 2 weeks, 1 more than priced: £180.00 extra');

    // Taken down late, on Fri 12 Mar: 22 Feb → 12 Mar is 18 days = 3 weeks = £540.00, two weeks (£360.00) over the price.
    h.now.value = new Date('2027-03-12T16:00:00Z');
    const down = (await request(h.app).post(`/api/access-bookings/${created.id}/state`).set(owner.auth).send({ state: 'struck', version: up.version }).expect(200)).body as AccessBookingDto;
    expect(down).toMatchObject({ confirmedStrike: '2027-03-04' });
    expect(down.hire).toEqual({ erect: '2027-02-22', strike: '2027-03-12', hireDays: 18, chargedWeeks: 3, pence: 54_000, pricedWeeks: 1, overPricedPence: 36_000 });
    expect((await bookingNow(created.id)).hire).toEqual(down.hire);
  });
});

describe('inspections', () => {
  async function erected(): Promise<AccessBookingDto> {
    const booking = (await book()).body as AccessBookingDto;
    const c = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    h.now.value = new Date('2027-02-26T15:00:00Z');
    const e = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'erected', version: c.body.version }).expect(200);
    return e.body as AccessBookingDto;
  }
  const boardOn = async () => (await request(h.app).get('/api/board').query({ from: '2027-03-01', to: '2027-03-05' }).set(owner.auth).expect(200)).body as BoardDto;

  it('makes an uninspected scaffold a stop for the day of work at height', async () => {
    const booking = await erected();
    // Source: Work at Height Regulations 2005 reg 12: inspect after assembly, before first use.
    expect(booking.inspection).toMatchObject({ status: 'due', nextDue: '2027-02-26' });
    h.now.value = new Date('2027-03-01T07:30:00Z');
    const stop = (await boardOn()).conflicts.find((c) => c.kind === 'inspection-overdue');
    expect(stop).toMatchObject({ severity: 'stop', date: '2027-03-01' });
    expect(stop!.message).toMatch(/competent person/);
  });

  it('clears the stop once a safe inspection is recorded, and asks again within seven days', async () => {
    const booking = await erected();
    await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth)
      .send({ inspectedAt: '2027-02-26T14:30:00Z', inspectorName: 'R. Quayle (Lofty Poles)', result: 'safe' }).expect(201);
    h.now.value = new Date('2027-03-01T07:30:00Z');
    expect((await boardOn()).conflicts.filter((c) => c.severity === 'stop')).toEqual([]);
    // Source: WAHR 2005 reg 12: at intervals of no more than 7 days.
    expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'ok', nextDue: '2027-03-05', lastInspectedOn: '2027-02-26' });
  });

  it('keeps work at height stopped after an inspection that found the scaffold unsafe', async () => {
    const booking = await erected();
    await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth)
      .send({ inspectedAt: '2027-02-26T14:30:00Z', inspectorName: 'R. Quayle', result: 'unsafe', defects: 'Missing toe board, lift 2' }).expect(201);
    h.now.value = new Date('2027-03-01T07:30:00Z');
    expect((await boardOn()).conflicts.find((c) => c.kind === 'inspection-overdue')).toMatchObject({ severity: 'stop' });
  });

  it("refuses an operative on the job's crew who tries to record an inspection, and records nothing", async () => {
    const booking = await erected();
    const operative = await addPerson(h, owner, 'operative', 'op@gorse.example');
    const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
    const member = people.find((p) => p.email === 'op@gorse.example')!.id;
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: 'Gable crew', colour: '#445566', memberIds: [member] }).expect(200);
    const { auth } = await signIn(h, 'op@gorse.example');
    expect(operative.session.role).toBe('operative');
    const res = await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(auth)
      .send({ inspectedAt: '2027-02-26T14:30:00Z', inspectorName: 'Op', result: 'safe' }).expect(403);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.code).toBe('forbidden');
    expect(await h.dataSource.getRepository(ScaffoldInspection).count()).toBe(0);
    expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'due', lastInspectedOn: null });
  });

  it('asks for the defects when the result is unsafe', async () => {
    const booking = await erected();
    const res = await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth)
      .send({ inspectedAt: '2027-02-26T14:30:00Z', inspectorName: 'R. Quayle', result: 'unsafe' }).expect(400);
    expect(res.body.errors[0].path).toBe('defects');
  });
});

describe('the handover when the access goes up', () => {
  const handover = { handedOverOn: '2027-02-25', handedOverBy: 'Kit Varley (Lofty Poles)', competentPersonName: 'R. Quayle, CISRS advanced', tagReference: 'LP-TAG-0419', notes: 'Loading bay lift 3 for 4 pallets' };
  async function confirmedBooking(): Promise<AccessBookingDto> {
    const booking = (await book()).body as AccessBookingDto;
    return (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200)).body as AccessBookingDto;
  }
  const markUp = (booking: AccessBookingDto, body: object) =>
    request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'erected', version: booking.version, ...body });

  it('records who handed it over, the competent person and the tag, and dates the erection by the handover', async () => {
    const booking = await confirmedBooking();
    h.now.value = new Date('2027-02-26T08:00:00Z');
    const up = (await markUp(booking, { handover }).expect(200)).body as AccessBookingDto;
    expect(up.handover).toEqual(handover);
    // Handed over on Thu 25 Feb, the day before the office marked it: the hire and the first inspection run from then.
    expect(up.hire).toMatchObject({ erect: '2027-02-25' });
    expect(up.inspection).toMatchObject({ status: 'overdue', nextDue: '2027-02-25', reasons: ['after-assembly'] });
    const [audit] = (await h.dataSource.query(`SELECT after FROM audit_event WHERE entity_id = $1 AND action = 'state-erected'`, [booking.id])) as Array<{ after: Record<string, unknown> }>;
    expect(audit!.after).toMatchObject({ handedOverBy: 'Kit Varley (Lofty Poles)', competentPersonName: 'R. Quayle, CISRS advanced', tagReference: 'LP-TAG-0419' });
  });

  it('puts the handover in the inspection register PDF', async () => {
    const booking = await confirmedBooking();
    h.now.value = new Date('2027-02-26T08:00:00Z');
    await markUp(booking, { handover }).expect(200);
    const pdf = await request(h.app).get(`/api/access-bookings/${booking.id}/inspections/pdf`).set(owner.auth).buffer(true).parse(binaryParser).expect(200);
    const text = await pdfText(pdf.body as Buffer);
    for (const expected of ['HANDOVER', 'Kit Varley (Lofty Poles)', 'R. Quayle, CISRS advanced', 'LP-TAG-0419', 'Loading bay lift 3 for 4 pallets']) expect(text).toContain(expected);
  });

  it.each([
    ['without the competent person', { handover: { ...handover, competentPersonName: '' } }, 'handover.competentPersonName'],
    ['dated in the future', { handover: { ...handover, handedOverOn: '2027-02-27' } }, 'handover.handedOverOn'],
    ['with any state but up', { state: 'cancelled', handover }, 'handover'],
  ])('refuses a handover %s and changes nothing', async (_name, body, path) => {
    const booking = await confirmedBooking();
    h.now.value = new Date('2027-02-26T08:00:00Z');
    const res = await markUp(booking, body).expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain(path);
    expect(await bookingNow(booking.id)).toMatchObject({ state: 'confirmed', handover: null, version: booking.version });
  });

  it('lets the office record the handover after marking it up, or correct it, but not before it is up', async () => {
    const booking = await confirmedBooking();
    const early = await request(h.app).put(`/api/access-bookings/${booking.id}/handover`).set(owner.auth).send({ ...handover, version: booking.version }).expect(409);
    expect(early.body.detail).toMatch(/once the access is up/);
    h.now.value = new Date('2027-02-26T08:00:00Z');
    const up = (await markUp(booking, {}).expect(200)).body as AccessBookingDto;
    expect(up).toMatchObject({ handover: null, hire: { erect: '2027-02-26' } });

    const lead = await addPerson(h, owner, 'crew-lead', 'lead@gorse.example');
    await request(h.app).put(`/api/access-bookings/${booking.id}/handover`).set(lead.auth).send({ ...handover, version: up.version }).expect(403);
    const recorded = (await request(h.app).put(`/api/access-bookings/${booking.id}/handover`).set(owner.auth).send({ ...handover, tagReference: null, version: up.version }).expect(200)).body as AccessBookingDto;
    expect(recorded).toMatchObject({ handover: { ...handover, tagReference: null }, hire: { erect: '2027-02-25' } });
    const stale = await request(h.app).put(`/api/access-bookings/${booking.id}/handover`).set(owner.auth).send({ ...handover, version: up.version }).expect(409);
    expect(stale.body.code).toBe('stale-version');
    const audit = (await h.dataSource.query(`SELECT before, after FROM audit_event WHERE entity_id = $1 AND action = 'handover-recorded'`, [booking.id])) as Array<{ before: unknown; after: unknown }>;
    expect(audit).toEqual([{ before: null, after: { ...handover, tagReference: null } }]);
  });
});

describe('inspections over a whole hire', () => {
  // A 25-working-day job from Mon 7 June 2027 (no bank holidays until 30 August): scaffold up by Fri 4 June,
  // down from Mon 12 July, so about five and a half weeks on hire. Europe/London is on BST (UTC+1) throughout.
  const GALE_DAY = '2027-06-15';

  async function upForTheJob(): Promise<AccessBookingDto> {
    await moveJob('2027-06-07', 25);
    const booking = (await book()).body as AccessBookingDto;
    expect(booking).toMatchObject({ requestedErect: '2027-06-04', requestedStrike: '2027-07-12' });
    const c = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    h.now.value = new Date('2027-06-04T14:00:00Z');
    const e = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'erected', version: c.body.version }).expect(200);
    return e.body as AccessBookingDto;
  }

  /** Stored forecast hours for the site: the fake's calm week every day, and its gale on one day (local midnight to midnight). */
  async function storeForecasts(galeDays: string[]): Promise<void> {
    const firmId = owner.session.firm.id;
    const from = Date.parse('2027-06-03T23:00:00Z');
    const hours = scenarioHours('calm-week', 53.8, -1.55, from, 40 * 24).map((hour) => {
      const localDay = new Date(Date.parse(hour.time) + 3_600_000).toISOString().slice(0, 10);
      if (!galeDays.includes(localDay)) return hour;
      return scenarioHours('gale', 53.8, -1.55, Date.parse(hour.time), 1)[0]!;
    });
    await h.dataSource.getRepository(ForecastHourRow).insert(hours.map((hour) => ({
      siteId: ids.siteId, firmId, time: new Date(hour.time), tempC: hour.tempC, windMeanMs: hour.windMeanMs, windGustMs: hour.windGustMs,
      precipMm: hour.precipMm, precipProbability: hour.precipProbability, fetchedAt: new Date('2027-06-03T06:00:00Z'),
    })));
  }

  const inspect = (bookingId: string, at: string, extra: object = {}) =>
    request(h.app).post(`/api/access-bookings/${bookingId}/inspections`).set(owner.auth).send({ inspectedAt: at, inspectorName: 'Tamsin Orr (Lofty Poles)', result: 'safe', ...extra });
  const boardAround = async (from: string, to: string) => (await request(h.app).get('/api/board').query({ from, to }).set(owner.auth).expect(200)).body as BoardDto;

  it('inspection due dates over a 5-week hire with one windy day', async () => {
    await storeForecasts([GALE_DAY]);
    const booking = await upForTheJob();
    // Source: WAHR 2005 reg 12 — after assembly, before first use (secondary copy).
    // The gale is 11 days off, beyond the 8 days or so a forecast reaches, so it does not count yet.
    expect(booking.inspection).toMatchObject({ status: 'due', nextDue: '2027-06-04', reasons: ['after-assembly'], adverseDays: [] });
    h.now.value = new Date('2027-06-04T15:00:00Z');
    await inspect(booking.id, '2027-06-04T14:45:00Z').expect(201);

    const seen: Array<[string, string[]]> = [];
    for (;;) {
      const status = (await bookingNow(booking.id)).inspection;
      if (!status.nextDue || status.nextDue >= '2027-07-12') break;
      seen.push([status.nextDue, status.reasons]);
      // Inspected first thing on the day it falls due, before anyone goes up.
      h.now.value = new Date(`${status.nextDue}T06:30:00Z`);
      expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'due', nextDue: status.nextDue });
      await inspect(booking.id, `${status.nextDue}T06:15:00Z`).expect(201);
    }
    expect(seen).toEqual([
      // Source: WAHR 2005 reg 12 — within the previous 7 days (secondary copy).
      ['2027-06-11', ['within-7-days']],
      // Source: WAHR 2005 reg 12 — after adverse weather: the gale of Tue 15 June (fake's gale scenario, gusts 28 m/s
      // against the 18 m/s scaffold-use stop, SOURCES.scaffoldUse) brings it forward from 18 June to the day after.
      ['2027-06-16', ['after-adverse-weather']],
      ['2027-06-23', ['within-7-days']],
      ['2027-06-30', ['within-7-days']],
      ['2027-07-07', ['within-7-days']],
    ]);
    const records = (await request(h.app).get(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth).expect(200)).body as ScaffoldInspectionDto[];
    expect(records).toHaveLength(6);
    expect((await bookingNow(booking.id)).inspection.adverseDays).toEqual([GALE_DAY]);
  });

  it('makes the work-at-height day after a missed post-gale inspection a stop conflict', async () => {
    await storeForecasts([GALE_DAY]);
    const booking = await upForTheJob();
    h.now.value = new Date('2027-06-04T15:00:00Z');
    await inspect(booking.id, '2027-06-04T14:45:00Z').expect(201);
    h.now.value = new Date('2027-06-11T06:30:00Z');
    await inspect(booking.id, '2027-06-11T06:15:00Z').expect(201);

    // On the gale day itself the 11 June inspection still stands; the next is due the day after.
    h.now.value = new Date('2027-06-15T12:00:00Z');
    expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'ok', nextDue: '2027-06-16', reasons: ['after-adverse-weather'] });
    expect((await boardAround('2027-06-14', '2027-06-18')).conflicts.filter((c) => c.kind === 'inspection-overdue')).toEqual([
      expect.objectContaining({ severity: 'warning', date: '2027-06-16', message: expect.stringContaining('inspection due by Wed 16 Jun') }),
    ]);

    // Nobody inspected on the 16th: on the 17th it is overdue and work at height stops.
    h.now.value = new Date('2027-06-17T06:30:00Z');
    expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'overdue', nextDue: '2027-06-16', lastInspectedOn: '2027-06-11' });
    const stop = (await boardAround('2027-06-14', '2027-06-18')).conflicts.find((c) => c.kind === 'inspection-overdue');
    expect(stop).toMatchObject({ severity: 'stop', date: '2027-06-17' });
    expect(stop!.message).toMatch(/overdue \(Wed 16 Jun\).*competent person/);
    const band = (await boardAround('2027-06-14', '2027-06-18')).accessBands[0];
    expect(band).toMatchObject({ inspection: 'overdue' });
  });

  it('counts a day stood down for wind as adverse weather too', async () => {
    const booking = await upForTheJob();
    h.now.value = new Date('2027-06-04T15:00:00Z');
    await inspect(booking.id, '2027-06-04T14:45:00Z').expect(201);
    h.now.value = new Date('2027-06-08T07:00:00Z');
    await request(h.app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates: ['2027-06-08'], reason: 'wind' }).expect(201);
    await request(h.app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates: ['2027-06-09'], reason: 'rain' }).expect(201);
    // Source: WAHR 2005 reg 12 — after adverse weather (secondary copy); a rain stand-down is not a wind event.
    expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'ok', nextDue: '2027-06-09', reasons: ['after-adverse-weather'], adverseDays: ['2027-06-08'] });
  });

  it("judges the wind by the firm's own limit for working from a scaffold, as its board does", async () => {
    await storeForecasts([]);
    // The fake's calm week gusts to 6 m/s from 09:00 to 18:00; with the firm's limit at 5.5 m/s every day is a wind stop.
    await request(h.app).put('/api/weather/limits').set(owner.auth).send({ overrides: { scaffoldUseGustStopMs: 5.5 }, version: 0 }).expect(200);
    const booking = await upForTheJob();
    h.now.value = new Date('2027-06-04T15:00:00Z');
    await inspect(booking.id, '2027-06-04T14:45:00Z').expect(201);
    // Source: WAHR 2005 reg 12 — after adverse weather (secondary copy); the wind of the inspection day itself may have come after it.
    expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'ok', nextDue: '2027-06-05', reasons: ['after-adverse-weather'] });
  });

  it('leaves the seven-day interval alone when the wind stays below the stop limits', async () => {
    await storeForecasts([]);
    const booking = await upForTheJob();
    h.now.value = new Date('2027-06-04T15:00:00Z');
    await inspect(booking.id, '2027-06-04T14:45:00Z').expect(201);
    // Source: WAHR 2005 reg 12 — within the previous 7 days (secondary copy).
    expect((await bookingNow(booking.id)).inspection).toMatchObject({ status: 'ok', nextDue: '2027-06-11', adverseDays: [] });
  });
});

describe('inspection photos', () => {
  const jpeg = () => sharp({ create: { width: 900, height: 600, channels: 3, background: '#8b5a2b' } }).jpeg().toBuffer();
  const upload = async (who: SignedIn, jobId: string) =>
    (await request(h.app).post('/api/photos').set(who.auth).field('jobId', jobId).field('caption', 'Lift 2 toe board')
      .attach('photo', await jpeg(), { filename: 'lift2.jpg', contentType: 'image/jpeg' }).expect(201)).body as PhotoDto;

  async function erectedNow(): Promise<AccessBookingDto> {
    const booking = (await book()).body as AccessBookingDto;
    const c = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    h.now.value = new Date('2027-02-26T15:00:00Z');
    return (await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'erected', version: c.body.version }).expect(200)).body as AccessBookingDto;
  }

  it("keeps a crew lead's photos with the inspection, with thumbnails from the photo service", async () => {
    const booking = await erectedNow();
    const lead = await addPerson(h, owner, 'crew-lead', 'lead@gorse.example');
    const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
    const leadMember = people.find((p) => p.email === 'lead@gorse.example')!.id;
    await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth).send({ name: 'Gable crew', colour: '#445566', leadMemberId: leadMember, memberIds: [leadMember] }).expect(200);

    const photos = [await upload(lead, ids.jobId), await upload(lead, ids.jobId)];
    const res = await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(lead.auth)
      .send({ inspectedAt: '2027-02-26T14:40:00Z', inspectorName: 'Crew lead', result: 'unsafe', defects: 'Toe board missing on lift 2', photoIds: photos.map((p) => p.id) })
      .expect(201);
    const saved = res.body as ScaffoldInspectionDto;
    expect(saved.photos.map((p) => p.id)).toEqual(photos.map((p) => p.id));
    const thumb = await request(h.app).get(saved.photos[0]!.thumbUrl).buffer(true).parse(binaryParser).expect(200);
    expect(thumb.headers['content-type']).toBe('image/webp');
    expect((await sharp(thumb.body as Buffer).metadata()).width).toBeLessThanOrEqual(480);

    const listed = (await request(h.app).get(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth).expect(200)).body as ScaffoldInspectionDto[];
    expect(listed[0]).toMatchObject({ result: 'unsafe', recordedBy: 'crew-lead person', keepUntil: null, isDiscardable: false });
    expect(listed[0]!.photos).toHaveLength(2);
  });

  it("refuses a photo from a job the booking does not cover, and records nothing", async () => {
    const booking = await erectedNow();
    const other = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Garden wall', workTypes: ['repairs'], estimatedWorkingDays: 1 }).expect(201);
    const stray = await upload(owner, other.body.id);
    const res = await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth)
      .send({ inspectedAt: '2027-02-26T14:40:00Z', inspectorName: 'R. Quayle', result: 'safe', photoIds: [stray.id] }).expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.errors[0]).toMatchObject({ path: 'photoIds' });
    expect(await h.dataSource.getRepository(ScaffoldInspection).count()).toBe(0);
  });
});

describe('inspection records: export and retention', () => {
  async function withRecords(): Promise<AccessBookingDto> {
    const booking = (await book()).body as AccessBookingDto;
    const c = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'confirmed', version: booking.version }).expect(200);
    h.now.value = new Date('2027-02-26T15:00:00Z');
    const e = await request(h.app).post(`/api/access-bookings/${booking.id}/state`).set(owner.auth).send({ state: 'erected', version: c.body.version }).expect(200);
    await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth)
      .send({ inspectedAt: '2027-02-26T14:50:00Z', inspectorName: 'R. Quayle (Lofty Poles)', result: 'safe', notes: 'Handover inspection' }).expect(201);
    h.now.value = new Date('2027-03-02T08:00:00Z');
    await request(h.app).post(`/api/access-bookings/${booking.id}/inspections`).set(owner.auth)
      .send({ inspectedAt: '2027-03-02T07:40:00Z', inspectorName: 'Mags Ellery', result: 'unsafe', defects: 'Tie at lift 3 loosened', notes: 'Supplier called back' }).expect(201);
    return e.body as AccessBookingDto;
  }
  const strike = async (bookingId: string, on: string) => {
    h.now.value = new Date(`${on}T15:00:00Z`);
    const now = await bookingNow(bookingId);
    await request(h.app).post(`/api/access-bookings/${bookingId}/state`).set(owner.auth).send({ state: 'struck', version: now.version }).expect(200);
  };
  const records = async (bookingId: string) => (await request(h.app).get(`/api/access-bookings/${bookingId}/inspections`).set(owner.auth).expect(200)).body as ScaffoldInspectionDto[];

  it('exports the records as a PDF with the firm, site, booking, each record and the safety caution', async () => {
    const booking = await withRecords();
    const res = await request(h.app).get(`/api/access-bookings/${booking.id}/inspections/pdf`).set(owner.auth).buffer(true).parse(binaryParser).expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="inspections-.+-scaffold\.pdf"/);
    const text = await pdfText(res.body as Buffer);
    for (const expected of ['Gorse Hill Builders', '2 Sheepwash Lane, Lowmoor, LM3 9QD', 'Repoint barn gable', 'Scaffold from Lofty Poles Scaffolding',
      'R. Quayle (Lofty Poles)', 'Safe to use', 'Handover inspection', 'Mags Ellery', 'NOT SAFE TO USE', 'Tie at lift 3 loosened', 'Supplier called back',
      'competent, trained people', 'follow your local regulations']) {
      expect(text).toContain(expected);
    }
    // Times in the firm's zone: 14:50 UTC on 26 Feb is 14:50 GMT.
    expect(text).toMatch(/26 February 2027,? (at )?14:50/);
  });

  it('gives another firm 404 on the PDF and the discard', async () => {
    const booking = await withRecords();
    const other = await signUpFirm(h, 'Thistle Walls', 'owner@thistle.example');
    const [record] = await records(booking.id);
    await request(h.app).get(`/api/access-bookings/${booking.id}/inspections/pdf`).set(other.auth).expect(404);
    await request(h.app).delete(`/api/access-bookings/${booking.id}/inspections/${record!.id}`).set(other.auth).expect(404);
  });

  it('refuses to discard records while the scaffold is up and for 3 months after it is struck, then allows it', async () => {
    const booking = await withRecords();
    const [latest] = await records(booking.id);
    const up = await request(h.app).delete(`/api/access-bookings/${booking.id}/inspections/${latest!.id}`).set(owner.auth).expect(409);
    expect(up.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(up.body).toMatchObject({ code: 'conflict', keepUntil: null });
    expect(up.body.detail).toMatch(/as long as the access is up/);

    await strike(booking.id, '2027-03-05');
    // Source: WAHR 2005 reg 12(6) — kept until the work is complete, then for 3 months (secondary copy).
    expect((await records(booking.id)).map((r) => [r.keepUntil, r.isDiscardable])).toEqual([['2027-06-05', false], ['2027-06-05', false]]);
    h.now.value = new Date('2027-06-05T12:00:00Z');
    const inside = await request(h.app).delete(`/api/access-bookings/${booking.id}/inspections/${latest!.id}`).set(owner.auth).expect(409);
    expect(inside.body).toMatchObject({ code: 'conflict', keepUntil: '2027-06-05' });
    expect(await records(booking.id)).toHaveLength(2);

    const lead = await addPerson(h, owner, 'crew-lead', 'lead@gorse.example');
    h.now.value = new Date('2027-06-06T08:00:00Z');
    expect((await records(booking.id)).every((r) => r.isDiscardable)).toBe(true);
    await request(h.app).delete(`/api/access-bookings/${booking.id}/inspections/${latest!.id}`).set(lead.auth).expect(403);
    await request(h.app).delete(`/api/access-bookings/${booking.id}/inspections/${latest!.id}`).set(owner.auth).expect(204);
    expect((await records(booking.id)).map((r) => r.inspectorName)).toEqual(['R. Quayle (Lofty Poles)']);
  });
});
