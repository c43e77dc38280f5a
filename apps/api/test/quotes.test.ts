import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Papa from 'papaparse';
import request from 'supertest';
import Stripe from 'stripe';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import {
  costingSettingsSchema,
  priceQuote,
  quoteContentSchema,
  type AccessBookingDto,
  type BoardDto,
  type CostingReportDto,
  type QuoteContentInput,
  type QuoteDto,
} from '@hodboard/shared';
import { createStripeFake, type StripeFake } from '../src/fakes/stripe-fake.js';
import { addPerson, countRows, createHarness, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';
import { binaryParser, enquiry, gardenWallContent, gardenWallSettings, linkToken, pdfText, setUpCosting } from './quotes-helpers.js';

const SECRET_KEY = 'sk_test_local_fake';
const WEBHOOK_SECRET = 'whsec_test_quotes_suite';

let stripeFake: StripeFake;
let h: Harness;
let owner: SignedIn;
let server: Server | undefined;

beforeAll(async () => {
  stripeFake = createStripeFake({ port: 0, secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET });
  await stripeFake.start();
  h = await createHarness({ stripe: { secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, host: '127.0.0.1', port: stripeFake.port() } });
});
afterAll(async () => {
  await stripeFake.stop();
  await h.dataSource.destroy();
});
beforeEach(async () => {
  await truncateAll(h.dataSource);
  h.mailer.outbox.length = 0;
  h.now.value = new Date('2027-03-01T09:00:00Z');
  owner = await signUpFirm(h, 'Wrenfold Walling', 'owner@wrenfold.example');
  await setUpCosting(h, owner);
});
afterEach(async () => {
  if (server) await new Promise<void>((resolve) => server!.close(() => resolve()));
  server = undefined;
});

async function draft(jobId: string, content = gardenWallContent): Promise<QuoteDto> {
  const res = await request(h.app).post('/api/quotes').set(owner.auth).send({ jobId, content }).expect(201);
  return res.body as QuoteDto;
}

async function sent(): Promise<{ quote: QuoteDto; token: string; jobId: string }> {
  const { jobId } = await enquiry(h, owner);
  const created = await draft(jobId);
  const res = await request(h.app).post(`/api/quotes/${created.id}/send`).set(owner.auth).send({ version: created.version }).expect(200);
  return { quote: res.body as QuoteDto, token: linkToken(h.mailer.lastTo('mo.hartigan@example.org')!.text), jobId };
}

function signed(payload: string, secret = WEBHOOK_SECRET): string {
  return new Stripe(SECRET_KEY).webhooks.generateTestHeaderString({ payload, secret });
}

describe('pricing a quote', () => {
  it('saves the figure priceJob gives for the content and the firm settings', async () => {
    const { jobId } = await enquiry(h, owner);
    const quote = await draft(jobId);
    const expected = priceQuote(quoteContentSchema.parse(gardenWallContent), costingSettingsSchema.parse(gardenWallSettings));
    expect(quote.current.breakdown).toEqual(expected);
    // Worked by hand: materials 56,100 + 3,456; labour 66,000 + 42,000; running costs 25,200 × 3 / 21 = 3,600;
    // travel 1,500 × 3 = 4,500; cost 175,656; margin 15 % = 26,348.4 → 26,348; net 202,004;
    // VAT 20 % = 40,400.8 → 40,401; total 242,405; deposit 25 % = 60,601.25 → 60,601.
    expect(quote.current.breakdown.totals).toEqual({
      costPence: 175_656, marginPence: 26_348, accessPence: 0, netPence: 202_004, vatPence: 40_401, grossPence: 242_405,
    });
    expect(quote.current.depositPence).toBe(60_601);
    expect(quote.current.travelPerDayPence).toBe(1_500);
    expect(quote.status).toBe('draft');
    expect(quote.reference).toMatch(/^Q\d{4}$/);
  });

  it('charges travel on the travel days given, keeps running costs on the days on site, and refuses bad travel days', async () => {
    const { jobId } = await enquiry(h, owner);
    const quote = await draft(jobId, { ...gardenWallContent, travelDays: 5 });
    const line = (kind: string) => quote.current.breakdown.lines.find((l) => l.kind === kind)?.pence;
    // Worked by hand: a survey visit and a delivery run on top of 3 days on site: travel 1,500 × 5 = 7,500;
    // running costs stay 25,200 × 3 / 21 = 3,600; cost 175,656 + 3,000 = 178,656.
    expect(line('travel')).toBe(7_500);
    expect(line('running-cost')).toBe(3_600);
    expect(quote.current.breakdown.totals.costPence).toBe(178_656);
    expect(quote.current.content.travelDays).toBe(5);

    const { jobId: other } = await enquiry(h, owner, 'sam.quill@example.org');
    const plain = await draft(other);
    expect(plain.current.content.travelDays).toBeNull();
    expect(plain.current.breakdown.lines.find((l) => l.kind === 'travel')?.pence).toBe(4_500);

    const before = await countRows(h.dataSource);
    const res = await request(h.app).put(`/api/quotes/${plain.id}`).set(owner.auth).send({ version: plain.version, content: { ...gardenWallContent, travelDays: -1 } }).expect(400);
    expect(res.body.errors).toEqual([expect.objectContaining({ path: 'content.travelDays' })]);
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  it('charges no VAT for a firm that is not VAT registered', async () => {
    await setUpCosting(h, owner, { vatRegistered: false });
    const { jobId } = await enquiry(h, owner);
    const quote = await draft(jobId);
    expect(quote.current.breakdown.totals.vatPence).toBe(0);
    expect(quote.current.breakdown.totals.grossPence).toBe(202_004);
    expect(quote.current.breakdown.lines.some((line) => line.kind === 'vat')).toBe(false);
  });

  it('answers 400 naming the field for bad lines and writes nothing', async () => {
    const { jobId } = await enquiry(h, owner);
    const before = await countRows(h.dataSource);
    const bad = { ...gardenWallContent, materials: [{ ...gardenWallContent.materials![0]!, quantity: -2 }] };
    const res = await request(h.app).post('/api/quotes').set(owner.auth).send({ jobId, content: bad }).expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.code).toBe('validation-failed');
    expect(res.body.errors).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'content.materials.0.quantity' })]));
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  it('refuses costing settings whose distance bands go backwards, naming the band, and keeps the old ones', async () => {
    const before = await request(h.app).get('/api/costing/settings').set(owner.auth).expect(200);
    const res = await request(h.app)
      .put('/api/costing/settings')
      .set(owner.auth)
      .send({ ...gardenWallSettings, travelBands: [{ upToMiles: 20, perDayPence: 1000 }, { upToMiles: 10, perDayPence: 2000 }], version: before.body.version })
      .expect(400);
    expect(res.body.errors).toEqual([expect.objectContaining({ path: 'travelBands.1.upToMiles' })]);
    const after = await request(h.app).get('/api/costing/settings').set(owner.auth).expect(200);
    expect(after.body).toEqual(before.body);
  });
});

describe('quote life cycle', () => {
  it('sends a draft: freezes the version, mails a link, marks the job quoted', async () => {
    const { quote, jobId } = await sent();
    expect(quote.status).toBe('sent');
    expect(quote.current.isFrozen).toBe(true);
    expect(quote.validUntil).toBe('2027-03-31');
    const mail = h.mailer.lastTo('mo.hartigan@example.org')!;
    expect(mail.subject).toBe(`Your quote ${quote.reference} from Wrenfold Walling`);
    expect(mail.text).toContain('£2,424.05');
    const job = await request(h.app).get(`/api/jobs/${jobId}`).set(owner.auth).expect(200);
    expect(job.body.status).toBe('quoted');
  });

  it('keeps a sent version frozen: edits are refused and a revision makes version 2', async () => {
    const { quote, token } = await sent();
    const edit = await request(h.app)
      .put(`/api/quotes/${quote.id}`)
      .set(owner.auth)
      .send({ version: quote.version, content: { ...gardenWallContent, marginPct: 40 } })
      .expect(409);
    expect(edit.body.code).toBe('illegal-transition');

    const revised = (await request(h.app).post(`/api/quotes/${quote.id}/revise`).set(owner.auth).send({ version: quote.version }).expect(200)).body as QuoteDto;
    expect(revised.status).toBe('draft');
    expect(revised.current.number).toBe(2);
    const edited = (await request(h.app)
      .put(`/api/quotes/${quote.id}`)
      .set(owner.auth)
      .send({ version: revised.version, content: { ...gardenWallContent, marginPct: 20 } })
      .expect(200)).body as QuoteDto;
    expect(edited.current.breakdown.totals.marginPence).toBe(35_131); // 175,656 × 20 % = 35,131.2
    expect(edited.versions.map((v) => [v.number, v.isFrozen, v.grossPence])).toEqual([[1, true, 242_405], [2, false, edited.current.breakdown.totals.grossPence]]);

    const v1 = await request(h.app).get(`/api/quotes/${quote.id}/pdf?version=1`).set(owner.auth).buffer(true).parse(binaryParser).expect(200);
    expect(await pdfText(v1.body as Buffer)).toContain('£2,424.05');

    // The first link died with the revision.
    const old = await request(h.app).get(`/api/public/quotes/${token}`).expect(401);
    expect(old.body.code).toBe('token-invalid');
  });

  it('sends a revision as a new frozen version with its own link, and version 1 stays as it was sent', async () => {
    const { quote, token, jobId } = await sent();
    const revised = (await request(h.app).post(`/api/quotes/${quote.id}/revise`).set(owner.auth).send({ version: quote.version }).expect(200)).body as QuoteDto;
    const edited = (await request(h.app)
      .put(`/api/quotes/${quote.id}`)
      .set(owner.auth)
      .send({ version: revised.version, content: { ...gardenWallContent, scope: 'Rebuild the wall and add a brick pier at the gate.', marginPct: 20 } })
      .expect(200)).body as QuoteDto;
    h.now.value = new Date('2027-03-08T09:00:00Z');
    const resent = (await request(h.app).post(`/api/quotes/${quote.id}/send`).set(owner.auth).send({ version: edited.version }).expect(200)).body as QuoteDto;
    // 175,656 + 20 % margin 35,131 = 210,787 before VAT; VAT 42,157.4 → 42,157; total 252,944.
    expect(resent).toMatchObject({ status: 'sent', validUntil: '2027-04-07', current: { number: 2, isFrozen: true, sentAt: '2027-03-08T09:00:00.000Z' } });
    expect(resent.versions.map((v) => [v.number, v.isFrozen, v.grossPence, v.sentAt])).toEqual([
      [1, true, 242_405, '2027-03-01T09:00:00.000Z'],
      [2, true, 252_944, '2027-03-08T09:00:00.000Z'],
    ]);
    // The sent revision is frozen like the first: no edits, and still one quote for the job.
    const refused = await request(h.app).put(`/api/quotes/${quote.id}`).set(owner.auth).send({ version: resent.version, content: gardenWallContent }).expect(409);
    expect(refused.body.code).toBe('illegal-transition');
    const second = await request(h.app).post('/api/quotes').set(owner.auth).send({ jobId, content: gardenWallContent }).expect(409);
    expect(second.body).toMatchObject({ code: 'already-exists', detail: expect.stringContaining('revise that one instead') });
    expect((await request(h.app).get(`/api/quotes?jobId=${jobId}`).set(owner.auth).expect(200)).body).toHaveLength(1);

    const newToken = linkToken(h.mailer.lastTo('mo.hartigan@example.org')!.text);
    expect(newToken).not.toBe(token);
    expect((await request(h.app).get(`/api/public/quotes/${token}`).expect(401)).body.code).toBe('token-invalid');
    const view = (await request(h.app).get(`/api/public/quotes/${newToken}`).expect(200)).body;
    expect(view).toMatchObject({ versionNumber: 2, grossPence: 252_944, scope: 'Rebuild the wall and add a brick pier at the gate.' });
    const pdf = (n: number) => request(h.app).get(`/api/quotes/${quote.id}/pdf?version=${n}`).set(owner.auth).buffer(true).parse(binaryParser).expect(200);
    const v1 = await pdfText((await pdf(1)).body as Buffer);
    expect(v1).toContain('£2,424.05');
    expect(v1).not.toContain('brick pier');
    expect(await pdfText((await pdf(2)).body as Buffer)).toContain('£2,529.44');
  });

  it('accepts once through the link: records name, time and IP, books the job into the tray, writes an audit line', async () => {
    const { quote, token, jobId } = await sent();
    const view = await request(h.app).get(`/api/public/quotes/${token}`).expect(200);
    expect(view.body).toMatchObject({ reference: quote.reference, status: 'sent', grossPence: 242_405, firm: { name: 'Wrenfold Walling' } });
    expect(view.body.lines.reduce((t: number, l: { pence: number }) => t + l.pence, 0)).toBe(202_004);
    expect(JSON.stringify(view.body)).not.toContain('Margin');

    h.now.value = new Date('2027-03-04T18:30:00Z');
    const accepted = await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(200);
    expect(accepted.body.status).toBe('accepted');
    expect(accepted.body.depositUrl).toMatch(new RegExp(`^http://127\\.0\\.0\\.1:${stripeFake.port()}/pay/cs_test_`));

    const after = (await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth).expect(200)).body as QuoteDto;
    expect(after.acceptance).toEqual({ name: 'Mo Hartigan', at: '2027-03-04T18:30:00.000Z', ip: expect.stringMatching(/127\.0\.0\.1/) });
    expect(after.deposit).toEqual({ amountPence: 60_601, status: 'pending', paidAt: null });
    expect(after.jobStatus).toBe('booked');
    const board = (await request(h.app).get('/api/board?from=2027-03-01&to=2027-03-14').set(owner.auth).expect(200)).body as BoardDto;
    expect(board.trayJobIds).toContain(jobId);
    const [audit] = (await h.dataSource.query(
      `SELECT actor_user_id, after FROM audit_event WHERE entity = 'quote' AND entity_id = $1 AND action = 'accepted'`, [quote.id],
    )) as Array<{ actor_user_id: string | null; after: Record<string, unknown> }>;
    expect(audit).toMatchObject({ actor_user_id: null, after: { name: 'Mo Hartigan', version: 1, grossPence: 242_405 } });

    const rows = await countRows(h.dataSource);
    const again = await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Someone Else', agree: true }).expect(409);
    expect(again.body.detail).toBe('This quote has already been accepted.');
    const decline = await request(h.app).post(`/api/public/quotes/${token}/decline`).send({}).expect(409);
    expect(decline.body.code).toBe('illegal-transition');
    expect(await countRows(h.dataSource)).toEqual(rows);
    expect(((await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth)).body as QuoteDto).acceptance?.name).toBe('Mo Hartigan');
  });

  it("refuses acceptance of a cancelled job's quote, saying why, changes nothing, and tells the office once", async () => {
    await request(h.app).put('/api/firm').set(owner.auth).send({ name: 'Wrenfold Walling', email: 'office@wrenfold.example', phone: '01632 960 123' }).expect(200);
    const { quote, token, jobId } = await sent();
    await request(h.app).post(`/api/jobs/${jobId}/status`).set(owner.auth).send({ status: 'cancelled' }).expect(200);

    const refused = await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(409);
    expect(refused.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(refused.body).toMatchObject({ code: 'illegal-transition', detail: 'This job has been cancelled, so the quote can no longer be accepted. Please contact Wrenfold Walling on 01632 960 123.' });
    const office = () => h.mailer.outbox.filter((m) => m.to === 'office@wrenfold.example');
    expect(office()).toHaveLength(1);
    expect(office()[0]!.subject).toBe(`Mo Hartigan tried to accept quote ${quote.reference}, but ${quote.jobReference} is cancelled`);
    expect(office()[0]!.text).toContain('the acceptance was refused and nothing was changed');

    // Trying again is refused the same way, writes nothing and does not mail the office a second time.
    const rows = await countRows(h.dataSource);
    await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(409);
    expect(await countRows(h.dataSource)).toEqual(rows);
    expect(office()).toHaveLength(1);
    const after = (await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth).expect(200)).body as QuoteDto;
    expect(after).toMatchObject({ status: 'sent', acceptance: null, deposit: null, jobStatus: 'cancelled' });
    expect((await request(h.app).get(`/api/public/quotes/${token}`).expect(200)).body.status).toBe('sent');
  });

  it('accepts the quote of a job already on the board without moving it back to booked, and tells the office where it is', async () => {
    await request(h.app).put('/api/firm').set(owner.auth).send({ name: 'Wrenfold Walling', email: 'office@wrenfold.example' }).expect(200);
    const { quote, token, jobId } = await sent();
    await request(h.app).post(`/api/jobs/${jobId}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    const crew = await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Wall crew', colour: '#336699' }).expect(201);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId, crewId: crew.body.id, startDate: '2027-03-15' }).expect(201);
    const placedStatus = ((await request(h.app).get(`/api/jobs/${jobId}`).set(owner.auth).expect(200)).body as { status: string }).status;
    expect(placedStatus).not.toBe('booked');

    await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(200);
    const after = (await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth).expect(200)).body as QuoteDto;
    expect(after).toMatchObject({ status: 'accepted', jobStatus: placedStatus, acceptance: { name: 'Mo Hartigan' } });
    const board = (await request(h.app).get('/api/board?from=2027-03-15&to=2027-03-21').set(owner.auth).expect(200)).body as BoardDto;
    expect(board.trayJobIds).not.toContain(jobId);
    const mail = h.mailer.lastTo('office@wrenfold.example')!;
    expect(mail.subject).toBe(`Quote ${quote.reference} accepted by Mo Hartigan`);
    expect(mail.text).toContain('The job is already on the board with Wall crew from Mon 15 Mar; it stays where it is.');
  });

  it('lets the client decline with a reason, after which the link cannot accept', async () => {
    const { quote, token } = await sent();
    const declined = await request(h.app).post(`/api/public/quotes/${token}/decline`).send({ reason: 'Going with a neighbour' }).expect(200);
    expect(declined.body.status).toBe('declined');
    await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(409);
    const after = (await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth).expect(200)).body as QuoteDto;
    expect(after).toMatchObject({ status: 'declined', declineReason: 'Going with a neighbour', acceptance: null, jobStatus: 'quoted' });
  });

  it('lapses a sent quote the day after its last valid day, and a lapsed quote cannot be accepted', async () => {
    const { quote, token } = await sent();
    h.now.value = new Date('2027-03-31T22:00:00Z'); // 31 March in London: still valid
    expect((await request(h.app).get(`/api/public/quotes/${token}`).expect(200)).body.status).toBe('sent');
    h.now.value = new Date('2027-04-01T08:00:00Z');
    expect((await request(h.app).get(`/api/public/quotes/${token}`).expect(200)).body.status).toBe('expired');
    const res = await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(409);
    expect(res.body.detail).toContain('lapsed');
    const listed = await request(h.app).get('/api/quotes?status=expired').set(owner.auth).expect(200);
    expect(listed.body.map((q: { id: string }) => q.id)).toEqual([quote.id]);
  });

  it('needs the tick box and a name to accept, and says which field is missing', async () => {
    const { token } = await sent();
    const res = await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: ' ' }).expect(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['agree', 'name']);
  });

  it('renders the PDF with the firm, the scope, the price and the terms', async () => {
    const { quote, token } = await sent();
    const res = await request(h.app).get(`/api/public/quotes/${token}/pdf`).buffer(true).parse(binaryParser).expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const text = await pdfText(res.body as Buffer);
    for (const expected of ['Wrenfold Walling', `Quote ${quote.reference}`, 'Rebuild front garden wall', 'reclaimed red brick on the old footing',
      'Materials', '£595.56', 'Price before VAT', '£2,020.04', 'VAT 20 %', '£404.01', 'Total to pay', '£2,424.05',
      'Deposit on acceptance', '£606.01', 'Making good the lawn.', 'Balance within 14 days of completion.']) {
      expect(text).toContain(expected);
    }
  });
});

describe('deposit by card', () => {
  async function acceptedWithCheckout() {
    const { quote, token } = await sent();
    const accepted = await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(200);
    const sessionId = /\/pay\/(cs_test_\w+)/.exec(accepted.body.depositUrl as string)![1]!;
    const session = stripeFake.sessions().find((s) => s.id === sessionId)!;
    return { quote, token, session };
  }

  it('opens a checkout session for the deposit amount with the quote on it', async () => {
    const { quote, session } = await acceptedWithCheckout();
    expect(session).toMatchObject({ amount_total: 60_601, currency: 'gbp', customer_email: 'mo.hartigan@example.org', description: `Deposit for quote ${quote.reference}` });
  });

  it('refuses a forged webhook and changes nothing', async () => {
    const { quote, session } = await acceptedWithCheckout();
    const payload = JSON.stringify({ id: 'evt_forged', type: 'checkout.session.completed', data: { object: { ...session, payment_status: 'paid' } } });
    const before = await countRows(h.dataSource);
    const forged = await request(h.app).post('/api/payments/stripe-webhook').set('content-type', 'application/json').set('stripe-signature', signed(payload, 'whsec_guessed')).send(payload).expect(400);
    expect(forged.body.errors).toEqual([expect.objectContaining({ path: 'stripe-signature' })]);
    await request(h.app).post('/api/payments/stripe-webhook').set('content-type', 'application/json').send(payload).expect(400);
    // A genuine signature over different bytes is as good as none.
    await request(h.app).post('/api/payments/stripe-webhook').set('content-type', 'application/json').set('stripe-signature', signed(payload)).send(payload.replace('60601', '1')).expect(400);
    expect(await countRows(h.dataSource)).toEqual(before);
    expect(((await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth)).body as QuoteDto).deposit?.status).toBe('pending');
  });

  it('ignores a signed event for a session the deposit did not open', async () => {
    const { quote, session } = await acceptedWithCheckout();
    const payload = JSON.stringify({ id: 'evt_other', type: 'checkout.session.completed', data: { object: { ...session, id: 'cs_test_someone_else', payment_status: 'paid' } } });
    const res = await request(h.app).post('/api/payments/stripe-webhook').set('content-type', 'application/json').set('stripe-signature', signed(payload)).send(payload).expect(200);
    expect(res.body.handled).toBe(false);
    expect(((await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth)).body as QuoteDto).deposit?.status).toBe('pending');
  });

  it('marks the deposit paid when the client pays on the fake, once however often the event comes', async () => {
    const { quote, token, session } = await acceptedWithCheckout();
    server = createServer(h.app);
    await new Promise<void>((resolve) => server!.listen(0, '127.0.0.1', resolve));
    stripeFake.setWebhookUrl(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/payments/stripe-webhook`);
    h.now.value = new Date('2027-03-05T10:00:00Z');

    expect(await stripeFake.pay(session.id)).toBe(200);
    const paid = ((await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth)).body as QuoteDto).deposit;
    expect(paid).toEqual({ amountPence: 60_601, status: 'paid', paidAt: '2027-03-05T10:00:00.000Z' });
    const view = await request(h.app).get(`/api/public/quotes/${token}`).expect(200);
    expect(view.body.deposit).toMatchObject({ status: 'paid', canPay: false });

    const audits = async () => Number(((await h.dataSource.query(`SELECT COUNT(*)::int AS n FROM audit_event WHERE action = 'deposit-paid'`)) as Array<{ n: number }>)[0]!.n);
    expect(await audits()).toBe(1);
    expect(await stripeFake.pay(session.id)).toBe(200);
    expect(await audits()).toBe(1);
    await request(h.app).post(`/api/public/quotes/${token}/deposit`).expect(409);
  });
});

describe('who may see and change quotes', () => {
  it.each([
    ['crew-lead', 'get', '/api/quotes'],
    ['operative', 'get', '/api/quotes'],
    ['crew-lead', 'get', '/api/materials'],
    ['operative', 'get', '/api/costing/settings'],
    ['crew-lead', 'get', '/api/costing/report?from=2027-01&to=2027-03'],
    ['office', 'put', '/api/costing/settings'],
  ] as const)('refuses a %s %s %s with 403', async (role, method, url) => {
    const person = await addPerson(h, owner, role, `${role}@wrenfold.example`);
    const res = await request(h.app)[method](url).set(person.auth).send({ ...gardenWallSettings, version: 1 });
    expect(res.status).toBe(403);
    expect(res.body.code).toBe('forbidden');
  });

  it('lets the office build and send a quote', async () => {
    const office = await addPerson(h, owner, 'office', 'office@wrenfold.example');
    const { jobId } = await enquiry(h, owner);
    const created = await request(h.app).post('/api/quotes').set(office.auth).send({ jobId, content: gardenWallContent }).expect(201);
    await request(h.app).post(`/api/quotes/${created.body.id}/send`).set(office.auth).send({ version: created.body.version }).expect(200);
  });

  it("gives another firm 404 on this firm's quote, its PDF and its job, and refuses to quote a foreign job", async () => {
    const { quote } = await sent();
    const other = await signUpFirm(h, 'Elsewhere Builders', 'owner@elsewhere.example');
    for (const url of [`/api/quotes/${quote.id}`, `/api/quotes/${quote.id}/pdf`]) {
      const res = await request(h.app).get(url).set(other.auth).expect(404);
      expect(JSON.stringify(res.body)).not.toContain('Mo Hartigan');
    }
    await request(h.app).post(`/api/quotes/${quote.id}/revise`).set(other.auth).send({ version: quote.version }).expect(404);
    await request(h.app).post('/api/quotes').set(other.auth).send({ jobId: quote.jobId, content: gardenWallContent }).expect(404);
    expect((await request(h.app).get('/api/quotes').set(other.auth).expect(200)).body).toEqual([]);
  });
});

describe('links without an account', () => {
  /** The same app over the same database, with tight limits on the e-mailed links. */
  async function limitedApp(limits: { requests: number; misses: number }) {
    const limited = await createHarness({ publicLinkLimits: limits });
    limited.now.value = h.now.value;
    return limited.app;
  }

  function expectRateLimited(res: request.Response): void {
    expect(res.status).toBe(429);
    expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(res.body).toMatchObject({ type: '/problems/rate-limited', status: 429, code: 'rate-limited', title: 'Too many attempts' });
    expect(res.body.detail).toMatch(/try again in \d+ minutes?/);
    const retryAfter = Number(res.headers['retry-after']);
    expect(retryAfter).toBeGreaterThan(0);
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);
  }

  it('answers 429 problem JSON with Retry-After once an address has used its link requests, on quote and supplier links alike', async () => {
    const { token } = await sent();
    const app = await limitedApp({ requests: 4, misses: 100 });
    await request(app).get(`/api/public/quotes/${token}`).expect(200);
    await request(app).get(`/api/public/quotes/${token}/pdf`).buffer(true).parse(binaryParser).expect(200);
    await request(app).post(`/api/public/quotes/${token}/decline`).send({ reason: 'Too dear' }).expect(200);
    await request(app).get(`/api/public/quotes/${token}`).expect(200);
    const rows = await countRows(h.dataSource);
    expectRateLimited(await request(app).get(`/api/public/quotes/${token}`));
    expectRateLimited(await request(app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }));
    expectRateLimited(await request(app).post(`/api/public/quotes/${token}/deposit`));
    expectRateLimited(await request(app).get(`/api/public/supplier-links/${'x'.repeat(43)}`));
    expect(await countRows(h.dataSource)).toEqual(rows);
    // Signed-in work and sign-in itself are not held back by the links' budget.
    await request(app).get('/api/quotes').set(owner.auth).expect(200);
  });

  it('stops an address guessing at links after a few misses, while reading a real link costs nothing of that budget', async () => {
    const { token } = await sent();
    const app = await limitedApp({ requests: 1000, misses: 3 });
    for (let i = 0; i < 6; i += 1) await request(app).get(`/api/public/quotes/${token}`).expect(200);
    const guess = `${token.slice(0, -1)}${token.endsWith('A') ? 'B' : 'A'}`;
    for (let i = 0; i < 3; i += 1) {
      const miss = await request(app).get(`/api/public/quotes/${guess}`).expect(401);
      expect(miss.body.code).toBe('token-invalid');
    }
    expectRateLimited(await request(app).get(`/api/public/quotes/${guess}`));
    // Once the misses are used up the address waits, real link or not.
    expectRateLimited(await request(app).get(`/api/public/quotes/${token}`));
  });

  it('refuses a tampered link on every route it opens, changes nothing, and the real link still works', async () => {
    const { quote, token } = await sent();
    const flip = (c: string) => (c === 'A' ? 'B' : 'A');
    const tampered = [
      `${token.slice(0, -1)}${flip(token.at(-1)!)}`,
      `${flip(token[0]!)}${token.slice(1)}`,
      `${token.slice(0, 20)}${flip(token[20]!)}${token.slice(21)}`,
      token.slice(0, -1),
      `${token}A`,
    ];
    const before = await countRows(h.dataSource);
    for (const link of tampered) {
      expect(link).not.toBe(token);
      const answers = [
        ['view', await request(h.app).get(`/api/public/quotes/${link}`)],
        ['pdf', await request(h.app).get(`/api/public/quotes/${link}/pdf`)],
        ['accept', await request(h.app).post(`/api/public/quotes/${link}/accept`).send({ name: 'Mo Hartigan', agree: true })],
        ['decline', await request(h.app).post(`/api/public/quotes/${link}/decline`).send({ reason: 'Forged' })],
        ['deposit', await request(h.app).post(`/api/public/quotes/${link}/deposit`)],
      ] as const;
      for (const [what, res] of answers) {
        expect(res.status, `${what} with ${link}`).toBe(401);
        expect(res.body).toMatchObject({ code: 'token-invalid' });
        expect(JSON.stringify(res.body)).not.toMatch(/Wrenfold|Hartigan|Q\d{4}/);
      }
    }
    expect(await countRows(h.dataSource)).toEqual(before);
    expect(((await request(h.app).get(`/api/quotes/${quote.id}`).set(owner.auth).expect(200)).body as QuoteDto)).toMatchObject({ status: 'sent', acceptance: null, declinedAt: null });
    await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(200);
  });

  it("shows through firm A's link only firm A's quote, and never anything of firm B", async () => {
    const a = await sent();
    const other = await signUpFirm(h, 'Elsewhere Builders', 'owner@elsewhere.example');
    await setUpCosting(h, other);
    const b = await enquiry(h, other, 'ada.quennell@example.org');
    const bDraft = (await request(h.app).post('/api/quotes').set(other.auth).send({ jobId: b.jobId, content: { ...gardenWallContent, scope: 'Rebuild the churchyard wall in knapped flint.' } }).expect(201)).body as QuoteDto;
    await request(h.app).post(`/api/quotes/${bDraft.id}/send`).set(other.auth).send({ version: bDraft.version }).expect(200);
    const bToken = linkToken(h.mailer.lastTo('ada.quennell@example.org')!.text);
    expect(bToken).not.toBe(a.token);
    const firmB = ['Elsewhere Builders', 'knapped flint', 'elsewhere.example', 'ada.quennell', bDraft.id, b.jobId];

    const viewA = await request(h.app).get(`/api/public/quotes/${a.token}`).expect(200);
    expect(viewA.body).toMatchObject({ reference: a.quote.reference, firm: { name: 'Wrenfold Walling' }, clientName: 'Mo Hartigan' });
    const pdfA = await pdfText((await request(h.app).get(`/api/public/quotes/${a.token}/pdf`).buffer(true).parse(binaryParser).expect(200)).body as Buffer);
    expect(pdfA).toContain('Wrenfold Walling');
    for (const text of firmB) {
      expect(JSON.stringify(viewA.body)).not.toContain(text);
      expect(pdfA).not.toContain(text);
    }
    // A link one character off is nobody's, and says so without naming a firm.
    const guess = `${a.token.slice(0, -1)}${a.token.endsWith('A') ? 'B' : 'A'}`;
    const miss = await request(h.app).get(`/api/public/quotes/${guess}`).expect(401);
    expect(JSON.stringify(miss.body)).not.toMatch(/Wrenfold|Elsewhere|Hartigan|Quennell/);

    await request(h.app).post(`/api/public/quotes/${a.token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(200);
    expect(((await request(h.app).get(`/api/quotes/${a.quote.id}`).set(owner.auth).expect(200)).body as QuoteDto).status).toBe('accepted');
    const untouched = (await request(h.app).get(`/api/quotes/${bDraft.id}`).set(other.auth).expect(200)).body as QuoteDto;
    expect(untouched).toMatchObject({ status: 'sent', acceptance: null, deposit: null });
    expect((await request(h.app).get(`/api/public/quotes/${bToken}`).expect(200)).body).toMatchObject({ firm: { name: 'Elsewhere Builders' }, status: 'sent' });
  });
});

describe('estimate against actual', () => {
  const report = async () => (await request(h.app).get('/api/costing/report?from=2027-03&to=2027-04').set(owner.auth).expect(200)).body as CostingReportDto;

  /** An accepted garden-wall quote placed on a crew for Monday 15 to Wednesday 17 March 2027. */
  async function acceptedAndPlaced(content: QuoteContentInput = gardenWallContent) {
    const { jobId } = await enquiry(h, owner);
    const created = await draft(jobId, content);
    await request(h.app).post(`/api/quotes/${created.id}/send`).set(owner.auth).send({ version: created.version }).expect(200);
    const token = linkToken(h.mailer.lastTo('mo.hartigan@example.org')!.text);
    await request(h.app).post(`/api/public/quotes/${token}/accept`).send({ name: 'Mo Hartigan', agree: true }).expect(200);
    const crew = await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Wall crew', colour: '#336699' }).expect(201);
    const placed = await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId, crewId: crew.body.id, startDate: '2027-03-15' }).expect(201);
    expect(placed.body.assignment.days).toEqual(['2027-03-15', '2027-03-16', '2027-03-17']);
    return { jobId, assignment: placed.body.assignment as { id: string; version: number } };
  }

  it('reports the margin achieved from the days on the board, the hire booked beyond the weeks priced, and materials added', async () => {
    const withTower = { ...gardenWallContent, accessHire: [{ description: 'Tower', weeks: 1, minimumWeeks: 1, weeklyRatePence: 9_000 }] };
    const { jobId } = await acceptedAndPlaced(withTower);

    const plain = await report();
    expect(plain.rows).toHaveLength(1);
    // Three days on the board, as quoted, no stand-downs, no bookings: the achieved margin is the quoted one.
    expect(plain.rows[0]!.actual).toMatchObject({ days: 3, daysFrom: 'board', weatherDaysLost: 0, extraAccessWeeks: 0, marginPence: plain.rows[0]!.estimate.marginPence });

    const supplier = await request(h.app).post('/api/suppliers').set(owner.auth).send({ name: 'Steeple Towers', email: 'hire@steeple.example' }).expect(201);
    // 12 to 26 March is 14 days on hire: two weeks against the one priced.
    await request(h.app).post('/api/access-bookings').set(owner.auth).send({
      jobIds: [jobId], accessType: 'tower', supplierId: supplier.body.id,
      requestedErect: '2027-03-12', requestedStrike: '2027-03-26', weeklyRate: 9_000, minimumWeeks: 1, pricedWeeks: 1,
    }).expect(201);
    // The hand-typed fields of old are no longer read: only the materials and the notes are the office's to enter.
    await request(h.app)
      .put(`/api/costing/actuals/${jobId}`)
      .set(owner.auth)
      .send({ extraMaterialsPence: 5_000, notes: 'Ten more copings', workingDays: 9, weatherDaysLost: 4, extraAccessWeeks: 6 })
      .expect(204);
    const row = (await report()).rows[0]!;
    // Worked by hand: materials 59,556 + 5,000 added; labour 3 days = 66,000 + 42,000; running costs 25,200 × 3 / 21 = 3,600;
    // travel 1,500 × 3 = 4,500; tower 9,000 + one week over 9,000: cost 198,656. Price before VAT 211,004: margin 12,348.
    expect(row.estimate).toMatchObject({ netPence: 211_004, marginPence: 26_348 });
    expect(row.actual).toMatchObject({
      days: 3, daysFrom: 'board', weatherDaysLost: 0, extraAccessWeeks: 1, extraAccessPence: 9_000, extraMaterialsPence: 5_000,
      costPence: 198_656, marginPence: 12_348, marginPct: 5.9, notes: 'Ten more copings',
    });
  });

  it('starts a booking left without weeks priced from the weeks the accepted quote priced for that kind of access', async () => {
    // Worked by hand: the tower line is 1 week against the hirer's 2-week minimum, so the quote priced 2 weeks.
    // The scaffold line is another kind of access and must not count towards the tower.
    const content: QuoteContentInput = {
      ...gardenWallContent,
      accessHire: [
        { description: 'Tower', accessType: 'tower', weeks: 1, minimumWeeks: 2, weeklyRatePence: 9_000 },
        { description: 'Scaffold to the gable', accessType: 'scaffold', weeks: 4, minimumWeeks: 1, weeklyRatePence: 20_000 },
      ],
    };
    const { jobId } = await acceptedAndPlaced(content);
    const quote = ((await request(h.app).get(`/api/quotes?jobId=${jobId}`).set(owner.auth).expect(200)).body as Array<{ reference: string }>)[0]!;
    const prefill = await request(h.app).get(`/api/access-bookings/quoted-weeks?jobIds=${jobId}&accessType=tower`).set(owner.auth).expect(200);
    expect(prefill.body).toEqual({ pricedWeeks: 2, quoteReferences: [quote.reference] });
    const unpriced = await request(h.app).get(`/api/access-bookings/quoted-weeks?jobIds=${jobId}&accessType=mewp`).set(owner.auth).expect(200);
    expect(unpriced.body).toEqual({ pricedWeeks: null, quoteReferences: [] });

    const supplier = await request(h.app).post('/api/suppliers').set(owner.auth).send({ name: 'Steeple Towers', email: 'hire@steeple.example' }).expect(201);
    // 12 March to 2 April is 21 days on hire: 3 weeks charged against the 2 priced, one extra week at 9,000.
    const tower = (await request(h.app).post('/api/access-bookings').set(owner.auth).send({
      jobIds: [jobId], accessType: 'tower', supplierId: supplier.body.id,
      requestedErect: '2027-03-12', requestedStrike: '2027-04-02', weeklyRate: 9_000, minimumWeeks: 1,
    }).expect(201)).body as AccessBookingDto;
    expect(tower.hire).toMatchObject({ chargedWeeks: 3, pricedWeeks: 2, overPricedPence: 9_000 });
    // A kind the quote did not price keeps the booking's own weeks as priced: nothing over.
    const mewp = (await request(h.app).post('/api/access-bookings').set(owner.auth).send({
      jobIds: [jobId], accessType: 'mewp', supplierId: supplier.body.id,
      requestedErect: '2027-03-12', requestedStrike: '2027-03-26', weeklyRate: 30_000, minimumWeeks: 1,
    }).expect(201)).body as AccessBookingDto;
    expect(mewp.hire).toMatchObject({ chargedWeeks: 2, pricedWeeks: 2, overPricedPence: 0 });

    const row = (await report()).rows[0]!;
    expect(row.actual).toMatchObject({ extraAccessWeeks: 1, extraAccessPence: 9_000 });

    const other = await signUpFirm(h, 'Elsewhere Builders', 'owner@elsewhere.example');
    await request(h.app).get(`/api/access-bookings/quoted-weeks?jobIds=${jobId}&accessType=tower`).set(other.auth).expect(404);
  });

  it('takes 2 days lost from a 2-day stand-down, and the achieved margin pays for them', async () => {
    const { jobId } = await acceptedAndPlaced();
    const before = (await report()).rows[0]!;
    expect(before.actual.marginPence).toBe(26_348);

    const hold = await request(h.app).post('/api/weather-holds').set(owner.auth)
      .send({ jobId, dates: ['2027-03-15', '2027-03-16'], reason: 'rain', notes: 'Heavy rain both days' }).expect(201);
    // Stood down but not yet re-planned: the two days are still in the span, and the crew is not on site on them.
    expect((await report()).rows[0]!.actual).toMatchObject({ days: 1, weatherDaysLost: 2 });

    await request(h.app).post(`/api/weather-holds/${hold.body.id}/commit`).set(owner.auth).send({ mode: 'push', version: hold.body.version }).expect(200);
    const summary = await request(h.app).get('/api/weather-holds/summary').set(owner.auth).expect(200);
    expect(summary.body.byJob).toEqual([{ jobId, days: 2 }]);
    const after = await report();
    // Pushed to 17–19 March: three days on site as quoted, two lost. Each lost day still costs the running costs
    // (25,200 / 21 = 1,200) and the trip (1,500): 26,348 − 2 × 2,700 = 20,948, 10.4 % of 202,004.
    expect(after.rows[0]!.actual).toMatchObject({ days: 3, daysFrom: 'board', weatherDaysLost: 2, costPence: 181_056, marginPence: 20_948, marginPct: 10.4 });
    expect(after.months[0]).toEqual({ month: '2027-03', jobs: 1, netPence: 202_004, estimatedMarginPence: 26_348, actualMarginPence: 20_948 });
  });

  it('counts the days the crew marked done, not the days planned', async () => {
    const { assignment } = await acceptedAndPlaced();
    // Finished a day early: the crew marks the job done on its second day.
    await request(h.app).post(`/api/assignments/${assignment.id}/progress`).set(owner.auth)
      .send({ date: '2027-03-16', remainingWorkingDays: 0, version: assignment.version }).expect(200);
    const row = (await report()).rows[0]!;
    // Worked by hand: labour 2 days = 44,000 + 28,000; running costs 2,400; travel 3,000; materials 59,556: cost 136,956.
    expect(row.actual).toMatchObject({ days: 2, daysFrom: 'done', weatherDaysLost: 0, costPence: 136_956, marginPence: 202_004 - 136_956 });
  });

  it('refuses actual figures for a job without an accepted quote', async () => {
    const { jobId } = await enquiry(h, owner);
    const res = await request(h.app).put(`/api/costing/actuals/${jobId}`).set(owner.auth).send({ extraMaterialsPence: 0 }).expect(409);
    expect(res.body.code).toBe('illegal-transition');
  });
});

describe('price list', () => {
  const csv = [
    'name,unit,unit_price,vatable,supplier',
    'Reclaimed red facing brick,brick,0.85,yes,Kilnside Supplies',
    '"Mortar, 1:5 ready-mixed",m³,160.00,yes,Kilnside Supplies',
    'Coping brick (bullnose),brick,"1,240.50",no,',
  ].join('\n');

  it('imports a CSV, updates rows by name on a second import, and exports what it holds', async () => {
    const first = await request(h.app).post('/api/materials/import').set(owner.auth).set('content-type', 'text/csv').send(csv).expect(200);
    expect(first.body).toEqual({ created: 3, updated: 0 });
    const again = await request(h.app)
      .post('/api/materials/import')
      .set(owner.auth)
      .set('content-type', 'text/csv')
      .send('name,unit,unit_price\nRECLAIMED red facing brick,brick,0.91\n')
      .expect(200);
    expect(again.body).toEqual({ created: 0, updated: 1 });
    const list = (await request(h.app).get('/api/materials').set(owner.auth).expect(200)).body as Array<{ name: string; unitPricePence: number; isVatable: boolean; supplier: string | null }>;
    expect(list.map((m) => [m.name, m.unitPricePence, m.isVatable, m.supplier])).toEqual([
      ['Coping brick (bullnose)', 124_050, false, null],
      ['Mortar, 1:5 ready-mixed', 16_000, true, 'Kilnside Supplies'],
      ['RECLAIMED red facing brick', 91, true, 'Kilnside Supplies'],
    ]);
    const exported = await request(h.app).get('/api/materials/export').set(owner.auth).expect(200);
    expect(exported.headers['content-type']).toMatch(/^text\/csv/);
    const lines = (exported.text as string).split(/\r?\n/);
    expect(lines[0]).toBe('name,unit,unit_price,vatable,supplier,last_updated');
    expect(lines[1]).toMatch(/^Coping brick \(bullnose\),brick,1240\.50,no,,\d{4}-\d{2}-\d{2}$/);
    expect(lines[2]).toMatch(/^"Mortar, 1:5 ready-mixed",m³,160\.00,yes,Kilnside Supplies,/);
  });

  it('refuses a file with a bad price or a repeated name, naming row and column, and imports nothing', async () => {
    const bad = `${csv}\nSharp sand,tonne,about forty,yes,\nreclaimed red facing brick,brick,0.80,maybe,`;
    const res = await request(h.app).post('/api/materials/import').set(owner.auth).set('content-type', 'text/csv').send(bad).expect(400);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toEqual(['rows.4.unit_price', 'rows.5.vatable', 'rows.5.name']);
    expect((await request(h.app).get('/api/materials').set(owner.auth).expect(200)).body).toEqual([]);
  });

  it('exports cells a spreadsheet would run as formulas with a leading quote, and reads them back as they were', async () => {
    const risky = [
      { name: '=HYPERLINK("http://bad.example","Price")', unit: 'brick', unitPricePence: 85, supplier: '@SUM(1+1)' },
      { name: '+44 ties', unit: '-pack', unitPricePence: 1_200, supplier: 'Kilnside Supplies' },
      { name: 'Sharp sand = washed', unit: 'tonne', unitPricePence: 4_650, supplier: null },
    ];
    for (const item of risky) await request(h.app).post('/api/materials').set(owner.auth).send(item).expect(201);
    const exported = (await request(h.app).get('/api/materials/export').set(owner.auth).expect(200)).text as string;
    const cells = Papa.parse<string[]>(exported, { skipEmptyLines: true }).data.slice(1).map((row) => row.slice(0, 5));
    // Source: OWASP ASVS requirement 1.2.10 (secondary copy, asvs.emil.hemdal.se/1.2.10): a field starting with
    // = + - @ or a tab is escaped with a single quote when exported to CSV.
    expect(cells).toEqual([
      ['\'+44 ties', '\'-pack', '12.00', 'yes', 'Kilnside Supplies'],
      ['\'=HYPERLINK("http://bad.example","Price")', 'brick', '0.85', 'yes', '\'@SUM(1+1)'],
      ['Sharp sand = washed', 'tonne', '46.50', 'yes', ''],
    ]);
    expect(cells.flat().filter((cell) => /^[=+\-@]/.test(cell))).toEqual([]);

    const again = await request(h.app).post('/api/materials/import').set(owner.auth).set('content-type', 'text/csv').send(exported).expect(200);
    expect(again.body).toEqual({ created: 0, updated: 3 });
    const list = (await request(h.app).get('/api/materials').set(owner.auth).expect(200)).body as Array<{ name: string; unit: string; supplier: string | null }>;
    expect(list.map((m) => [m.name, m.unit, m.supplier])).toEqual([
      ['+44 ties', '-pack', 'Kilnside Supplies'],
      ['=HYPERLINK("http://bad.example","Price")', 'brick', '@SUM(1+1)'],
      ['Sharp sand = washed', 'tonne', null],
    ]);
  });

  it('refuses a file without the price column', async () => {
    const res = await request(h.app).post('/api/materials/import').set(owner.auth).set('content-type', 'text/csv').send('name,unit\nBrick,brick\n').expect(400);
    expect(res.body.errors).toEqual([{ path: 'columns.unit_price', message: 'The file needs a "unit_price" column' }]);
  });
});
