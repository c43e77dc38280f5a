import { pino } from 'pino';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import type { Express } from 'express';
import type { Role, SessionDto } from '@hodboard/shared';
import { createApp, createServices, type AppDeps, type AppServices } from '../src/app.js';
import { createDataSource } from '../src/db/data-source.js';
import { MemoryMailer } from '../src/services/mailer.js';

export const TEST_SECRET = 'test-secret-test-secret-test-secret-0001';
export const PASSWORD = 'Correct-horse-42';

export interface Harness {
  app: Express;
  dataSource: DataSource;
  mailer: MemoryMailer;
  services: AppServices;
  now: { value: Date };
}

let shared: DataSource | undefined;

export async function testDataSource(): Promise<DataSource> {
  if (!shared) {
    shared = createDataSource(process.env.DATABASE_URL!);
    await shared.initialize();
  }
  return shared;
}

export async function createHarness(overrides: Partial<AppDeps> = {}): Promise<Harness> {
  const dataSource = await testDataSource();
  const mailer = new MemoryMailer();
  const now = { value: new Date() };
  const deps: AppDeps = {
    dataSource,
    mailer,
    clock: () => now.value,
    logger: pino({ level: 'silent' }),
    jwtSecret: TEST_SECRET,
    appUrl: 'http://localhost:3000',
    authAttemptsPerWindow: 1000,
    authAttemptsPerAddress: 1000,
    publicLinkLimits: { requests: 100_000, misses: 100_000 },
    ...overrides,
  };
  const services = createServices(deps);
  return { app: createApp(deps, services), dataSource, mailer, services, now };
}

export async function truncateAll(dataSource: DataSource): Promise<void> {
  const tables = dataSource.entityMetadatas.map((meta) => `"${meta.tableName}"`).join(', ');
  await dataSource.query(`TRUNCATE ${tables} RESTART IDENTITY CASCADE`);
}

export async function countRows(dataSource: DataSource): Promise<Record<string, number>> {
  const counts: Record<string, number> = {};
  for (const meta of dataSource.entityMetadatas) {
    const [row] = (await dataSource.query(`SELECT COUNT(*)::int AS n FROM "${meta.tableName}"`)) as Array<{ n: number }>;
    counts[meta.tableName] = row!.n;
  }
  return counts;
}

export interface SignedIn {
  token: string;
  session: SessionDto;
  auth: { Authorization: string };
}

export async function signUpFirm(harness: Harness, firmName: string, email: string): Promise<SignedIn> {
  const res = await request(harness.app)
    .post('/api/auth/sign-up')
    .send({ firmName, ownerName: `${firmName} Owner`, email, password: PASSWORD })
    .expect(201);
  const session = res.body as SessionDto;
  return { token: session.accessToken, session, auth: { Authorization: `Bearer ${session.accessToken}` } };
}

export async function signIn(harness: Harness, email: string, password = PASSWORD): Promise<SignedIn> {
  const res = await request(harness.app).post('/api/auth/sign-in').send({ email, password }).expect(200);
  const session = res.body as SessionDto;
  return { token: session.accessToken, session, auth: { Authorization: `Bearer ${session.accessToken}` } };
}

/** Invites a person with a role and accepts the invitation from the e-mail, as they would. */
export async function addPerson(harness: Harness, owner: SignedIn, role: Role, email: string): Promise<SignedIn> {
  await request(harness.app).post('/api/people/invite').set(owner.auth).send({ email, name: `${role} person`, role }).expect(201);
  const token = inviteTokenFrom(harness.mailer, email);
  const res = await request(harness.app)
    .post('/api/auth/accept-invite')
    .send({ token, name: `${role} person`, password: PASSWORD })
    .expect(200);
  const session = res.body as SessionDto;
  return { token: session.accessToken, session, auth: { Authorization: `Bearer ${session.accessToken}` } };
}

export function inviteTokenFrom(mailer: MemoryMailer, email: string, path = 'accept-invite'): string {
  const message = mailer.lastTo(email);
  const match = message && new RegExp(`/${path}\\?token=([A-Za-z0-9_%-]+)`).exec(message.text);
  if (!match?.[1]) throw new Error(`no ${path} link mailed to ${email}`);
  return decodeURIComponent(match[1]);
}

/** A firm with one of everything, for sweeps across resources; a client name of its own tells two such firms apart. */
export async function populateFirm(harness: Harness, owner: SignedIn, clientName = 'Marsh End Farm') {
  const client = await request(harness.app).post('/api/clients').set(owner.auth).send({ name: clientName, contacts: [{ email: 'farm@example.org' }] }).expect(201);
  const site = await request(harness.app)
    .post('/api/sites')
    .set(owner.auth)
    .send({ clientId: client.body.id, addressLine1: '2 Sheepwash Lane', town: 'Lowmoor', postcode: 'LM3 9QD' })
    .expect(201);
  const crew = await request(harness.app).post('/api/crews').set(owner.auth).send({ name: 'Gable crew', colour: '#445566' }).expect(201);
  const job = await request(harness.app)
    .post('/api/jobs')
    .set(owner.auth)
    .send({ clientId: client.body.id, siteId: site.body.id, title: 'Repoint barn gable', workTypes: ['repointing'], estimatedWorkingDays: 3 })
    .expect(201);
  const people = await request(harness.app).get('/api/people').set(owner.auth).expect(200);
  await request(harness.app).post(`/api/jobs/${job.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
  const assignment = await request(harness.app)
    .post('/api/assignments')
    .set(owner.auth)
    .send({ jobId: job.body.id, crewId: crew.body.id, startDate: '2027-03-01' })
    .expect(201);
  const timeOff = await request(harness.app)
    .post('/api/time-off')
    .set(owner.auth)
    .send({ scope: 'crew', crewId: crew.body.id, label: 'Training day', startDate: '2027-04-09', endDate: '2027-04-09' })
    .expect(201);
  const supplier = await request(harness.app)
    .post('/api/suppliers')
    .set(owner.auth)
    .send({ name: 'Upright Access Hire', email: 'bookings@upright.example', weeklyRates: { scaffold: 15_000 } })
    .expect(201);
  const booking = await request(harness.app)
    .post('/api/access-bookings')
    .set(owner.auth)
    .send({ jobIds: [job.body.id], accessType: 'scaffold', supplierId: supplier.body.id })
    .expect(201);
  return {
    supplierId: supplier.body.id as string,
    bookingId: booking.body.id as string,
    assignmentId: assignment.body.assignment.id as string,
    timeOffId: timeOff.body.id as string,
    clientId: client.body.id as string,
    siteId: site.body.id as string,
    crewId: crew.body.id as string,
    jobId: job.body.id as string,
    memberId: (people.body as Array<{ id: string }>)[0]!.id,
  };
}
