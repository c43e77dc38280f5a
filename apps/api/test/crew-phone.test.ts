import { createECDH, randomBytes } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { crc32 } from 'node:zlib';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import exifr from 'exifr';
import ICAL from 'ical.js';
import sharp from 'sharp';
import request from 'supertest';
import webpush from 'web-push';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { PHOTO_MAX_BYTES, type CrewDaysDto, type PhotoDto, type SiteNoteDto } from '@hodboard/shared';
import { WeatherHold } from '../src/entities/index.js';
import { createPushFake, type PushFake } from '../src/fakes/push-fake.js';
import { createS3Fake, type S3Fake } from '../src/fakes/s3-fake.js';
import { S3Storage } from '../src/services/storage-service.js';
import { addPerson, countRows, createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

const BUCKET = 'crew-phone-test';
let s3: S3Fake;
let pushFake: PushFake;
let s3Dir: string;
let storage: S3Storage;
let h: Harness;
let owner: SignedIn;
let lead: SignedIn;
let operative: SignedIn;
let ids: Awaited<ReturnType<typeof populateFirm>>;
const vapid = { ...webpush.generateVAPIDKeys(), subject: 'mailto:office@crew-phone.example' };

beforeAll(async () => {
  s3Dir = await mkdtemp(path.join(tmpdir(), 'hodboard-s3-'));
  s3 = createS3Fake({ port: 0, directory: s3Dir, bucket: BUCKET });
  await s3.start();
  pushFake = createPushFake({ port: 0 });
  await pushFake.start();
  storage = new S3Storage({ endpoint: s3.endpoint(), bucket: BUCKET, accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' });
});
afterAll(async () => {
  storage.destroy();
  await s3.stop();
  await pushFake.stop();
  await rm(s3Dir, { recursive: true, force: true });
  await h.dataSource.destroy();
});

// populateFirm places its job on Mon 1 March 2027 for 3 working days (1–3 March) on "Gable crew".
beforeEach(async () => {
  h = await createHarness({ storage, vapid });
  h.now.value = new Date('2027-02-28T18:00:00Z');
  await truncateAll(h.dataSource);
  for (const key of await storedKeys()) await storage.delete(key);
  owner = await signUpFirm(h, 'Quoin Lane Builders', 'owner@quoin.example');
  ids = await populateFirm(h, owner);
  lead = await addPerson(h, owner, 'crew-lead', 'lead@quoin.example');
  operative = await addPerson(h, owner, 'operative', 'op@quoin.example');
  const people = (await request(h.app).get('/api/people').set(owner.auth).expect(200)).body as Array<{ id: string; email: string }>;
  const memberId = (email: string) => people.find((p) => p.email === email)!.id;
  await request(h.app).put(`/api/crews/${ids.crewId}`).set(owner.auth)
    .send({ name: 'Gable crew', colour: '#445566', leadMemberId: memberId('lead@quoin.example'), memberIds: [memberId('lead@quoin.example'), memberId('op@quoin.example')] })
    .expect(200);
});

async function storedKeys(): Promise<string[]> {
  const client = new S3Client({ endpoint: s3.endpoint(), region: 'eu-west-2', forcePathStyle: true, credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } });
  const listed = await client.send(new ListObjectsV2Command({ Bucket: BUCKET }));
  client.destroy();
  return (listed.Contents ?? []).map((object) => object.Key!);
}

/** A real JPEG with a capture time and a GPS position in its EXIF, as a phone camera writes them. */
async function cameraJpeg(): Promise<Buffer> {
  return sharp({ create: { width: 1200, height: 900, channels: 3, background: '#a0522d' } })
    .jpeg()
    .withExif({
      IFD0: { Make: 'Test', Model: 'Phone' },
      IFD2: { DateTimeOriginal: '2027:03:01 09:15:30' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '53/1 28/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '2/1 14/1 0/1' },
    })
    .toBuffer();
}

const upload = (who: SignedIn, file: Buffer, name: string, fields: Record<string, string> = {}) =>
  request(h.app).post('/api/photos').set(who.auth).field('jobId', fields.jobId ?? ids.jobId)
    .field(Object.fromEntries(Object.entries(fields).filter(([key]) => key !== 'jobId')))
    .attach('photo', file, { filename: name, contentType: 'image/jpeg' });

/** The EXIF of a stored photo, read the way any viewer would, from the TIFF block sharp finds in it. */
async function exifOf(photo: Buffer): Promise<Record<string, unknown>> {
  const block = (await sharp(photo).metadata()).exif;
  if (!block) return {};
  return (await exifr.parse(block.subarray(6), { tiff: true, exif: true, gps: true, reviveValues: false })) ?? {};
}

/** A PNG whose header claims 10 000 × 10 000 pixels: a few bytes that would unpack to 300 MB. */
async function pixelBomb(): Promise<Buffer> {
  const png = Buffer.from(await sharp({ create: { width: 16, height: 16, channels: 3, background: '#777777' } }).png().toBuffer());
  // IHDR is the first chunk: length (4) and type (4) at byte 8, width and height at 16 and 20, its CRC at 29.
  png.writeUInt32BE(10_000, 16);
  png.writeUInt32BE(10_000, 20);
  png.writeUInt32BE(crc32(png.subarray(12, 29)), 29);
  return png;
}

describe('photo uploads', () => {
  it('refuses a PDF named like a photo with a clear problem, and stores nothing', async () => {
    const before = await countRows(h.dataSource);
    const pdf = Buffer.from('%PDF-1.7\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n');
    const res = await upload(lead, pdf, 'scaffold.jpg').expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'validation-failed', status: 400 });
    expect(res.body.detail).toContain('not a photo');
    expect(res.body.errors[0]).toMatchObject({ path: 'photo' });
    expect(res.body.errors[0].message).toMatch(/"scaffold\.jpg" is a PDF file/);
    expect(await countRows(h.dataSource)).toEqual(before);
    expect(await storedKeys()).toEqual([]);
  });

  it('refuses text with an image name as not a picture', async () => {
    const res = await upload(lead, Buffer.from('just some words, no picture here at all'), 'wall.png').expect(400);
    expect(res.body.errors[0].message).toContain('not a picture Hodboard recognises');
    expect(await storedKeys()).toEqual([]);
  });

  it('refuses a file over the size limit with 413, and stores nothing', async () => {
    const before = await countRows(h.dataSource);
    const jpeg = await cameraJpeg();
    const big = Buffer.concat([jpeg, Buffer.alloc(PHOTO_MAX_BYTES + 1 - jpeg.length, 0)]);
    const res = await upload(lead, big, 'huge.jpg').expect(413);
    expect(res.body).toMatchObject({ code: 'payload-too-large', status: 413 });
    expect(res.body.detail).toContain('12 MB');
    expect(await countRows(h.dataSource)).toEqual(before);
    expect(await storedKeys()).toEqual([]);
  });

  it('stores the original and a thumbnail, keeps the EXIF time and removes the position by default', async () => {
    const res = await upload(lead, await cameraJpeg(), 'gable.jpg', { caption: 'North gable before' }).expect(201);
    const photo = res.body as PhotoDto;
    // Wall-clock 09:15:30 on 1 March is GMT in Europe/London.
    expect(photo).toMatchObject({ jobId: ids.jobId, caption: 'North gable before', contentType: 'image/jpeg', width: 1200, height: 900,
      takenAt: '2027-03-01T09:15:30.000Z', isLocationRemoved: true, uploadedBy: 'crew-lead person' });
    expect((await storedKeys()).sort()).toHaveLength(2);

    const thumb = await request(h.app).get(photo.thumbUrl).buffer(true).expect(200);
    expect(thumb.headers['content-type']).toBe('image/webp');
    const thumbMeta = await sharp(thumb.body as Buffer).metadata();
    expect(Math.max(thumbMeta.width!, thumbMeta.height!)).toBe(480);

    const original = await request(h.app).get(photo.originalUrl).buffer(true).expect(200);
    const exif = await exifr.parse(original.body as Buffer, { gps: true, reviveValues: false });
    expect(exif.DateTimeOriginal).toBe('2027:03:01 09:15:30');
    expect(Object.keys(exif).filter((key) => key.startsWith('GPS'))).toEqual([]);
  });

  it('keeps the position when the owner turns removal off', async () => {
    await request(h.app).put('/api/photos/settings').set(lead.auth).send({ removeLocation: false }).expect(403);
    await request(h.app).put('/api/photos/settings').set(owner.auth).send({ removeLocation: false }).expect(200);
    const photo = (await upload(lead, await cameraJpeg(), 'gable.jpg').expect(201)).body as PhotoDto;
    expect(photo.isLocationRemoved).toBe(false);
    const original = await request(h.app).get(photo.originalUrl).buffer(true).expect(200);
    const gps = await exifr.gps(original.body as Buffer);
    expect(gps.latitude).toBeCloseTo(53.4667, 3);
  });

  it('removes the position from a WebP photo too, and keeps when it was taken', async () => {
    const webp = await sharp({ create: { width: 800, height: 600, channels: 3, background: '#8b4513' } })
      .webp()
      .withExif({
        IFD2: { DateTimeOriginal: '2027:03:01 14:05:00', OffsetTimeOriginal: '+00:00' },
        IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '53/1 28/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '2/1 14/1 0/1' },
      })
      .toBuffer();
    const photo = (await upload(lead, webp, 'pier.webp').expect(201)).body as PhotoDto;
    expect(photo).toMatchObject({ contentType: 'image/webp', width: 800, height: 600, takenAt: '2027-03-01T14:05:00.000Z', isLocationRemoved: true });
    const original = await request(h.app).get(photo.originalUrl).buffer(true).expect(200);
    expect(original.headers['content-type']).toBe('image/webp');
    const exif = await exifOf(original.body as Buffer);
    expect(exif.DateTimeOriginal).toBe('2027:03:01 14:05:00');
    expect(Object.keys(exif).filter((key) => key.startsWith('GPS') || key === 'latitude')).toEqual([]);
  });

  it('removes a position written only in the XMP block, and reads the time from there', async () => {
    const xmp = '<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">'
      + '<rdf:Description rdf:about="" xmlns:exif="http://ns.adobe.com/exif/1.0/" exif:GPSLatitude="53,28.0N" exif:GPSLongitude="2,14.0W"'
      + ' exif:DateTimeOriginal="2027-03-01T08:40:00"/></rdf:RDF></x:xmpmeta>';
    const jpeg = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#6b4226' } }).jpeg().withXmp(xmp).toBuffer();
    expect((await sharp(jpeg).metadata()).xmp).toBeDefined();

    const photo = (await upload(lead, jpeg, 'sill.jpg').expect(201)).body as PhotoDto;
    // 08:40 wall-clock on 1 March is GMT in the firm's Europe/London.
    expect(photo).toMatchObject({ isLocationRemoved: true, takenAt: '2027-03-01T08:40:00.000Z' });
    const original = (await request(h.app).get(photo.originalUrl).buffer(true).expect(200)).body as Buffer;
    const meta = await sharp(original).metadata();
    expect(meta.xmp?.toString('utf8') ?? '').not.toMatch(/GPS/);
    expect((await exifOf(original)).DateTimeOriginal).toBe('2027:03:01 08:40:00');
  });

  it('refuses a picture whose header claims more pixels than any phone takes, before unpacking it, and stores nothing', async () => {
    const before = await countRows(h.dataSource);
    const res = await upload(lead, await pixelBomb(), 'bomb.png').expect(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body).toMatchObject({ code: 'validation-failed', status: 400 });
    expect(res.body.errors[0]).toMatchObject({ path: 'photo' });
    expect(res.body.errors[0].message).toMatch(/10000 × 10000 pixels \(100 megapixels\); Hodboard takes photos up to 64 megapixels/);
    expect(await countRows(h.dataSource)).toEqual(before);
    expect(await storedKeys()).toEqual([]);
  });

  it('stores a photo sent twice with one idempotency key once', async () => {
    const jpeg = await cameraJpeg();
    const first = await upload(lead, jpeg, 'a.jpg', { idempotencyKey: 'photo-key-0001' }).expect(201);
    const again = await upload(lead, jpeg, 'a.jpg', { idempotencyKey: 'photo-key-0001' }).expect(200);
    expect(again.body.id).toBe(first.body.id);
    expect((await request(h.app).get('/api/photos').query({ jobId: ids.jobId }).set(lead.auth).expect(200)).body).toHaveLength(1);
    expect(await storedKeys()).toHaveLength(2);
  });

  it('refuses a link whose signature was tampered with', async () => {
    const photo = (await upload(lead, await cameraJpeg(), 'a.jpg').expect(201)).body as PhotoDto;
    const res = await request(h.app).get(photo.thumbUrl.replace(/signature=./, 'signature=X')).expect(404);
    expect(res.body.code).toBe('not-found');
  });
});

describe('crews only see their own jobs', () => {
  it("gives an operative of crew X nothing of crew Y's job: not the job, its notes, its photos nor its day", async () => {
    const otherCrew = await request(h.app).post('/api/crews').set(owner.auth).send({ name: 'Ridge crew', colour: '#336699' }).expect(201);
    const otherJob = await request(h.app).post('/api/jobs').set(owner.auth)
      .send({ clientId: ids.clientId, siteId: ids.siteId, title: 'Rebuild ridge chimney', workTypes: ['chimney'], estimatedWorkingDays: 2 }).expect(201);
    await request(h.app).post(`/api/jobs/${otherJob.body.id}/status`).set(owner.auth).send({ status: 'booked' }).expect(200);
    await request(h.app).post('/api/assignments').set(owner.auth).send({ jobId: otherJob.body.id, crewId: otherCrew.body.id, startDate: '2027-03-01' }).expect(201);
    const photo = (await upload(owner, await cameraJpeg(), 'ridge.jpg', { jobId: otherJob.body.id }).expect(201)).body as PhotoDto;
    await request(h.app).post('/api/site-notes').set(owner.auth).send({ jobId: otherJob.body.id, body: 'Ridge tiles stacked by the shed' }).expect(201);

    const before = await countRows(h.dataSource);
    for (const url of [`/api/jobs/${otherJob.body.id}`, `/api/photos/${photo.id}`, `/api/photos?jobId=${otherJob.body.id}`, `/api/site-notes?jobId=${otherJob.body.id}`]) {
      const res = await request(h.app).get(url).set(operative.auth);
      expect(res.status, url).toBe(404);
      expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    }
    await request(h.app).post('/api/site-notes').set(operative.auth).send({ jobId: otherJob.body.id, body: 'Sneaky note' }).expect(404);
    await upload(operative, await cameraJpeg(), 'sneaky.jpg', { jobId: otherJob.body.id }).expect(404);
    expect(await countRows(h.dataSource)).toEqual(before);

    const days = (await request(h.app).get('/api/crew-days').set(operative.auth).expect(200)).body as CrewDaysDto;
    expect(days.days.map((d) => d.job.id)).not.toContain(otherJob.body.id);
    expect(Object.keys(days.photos)).not.toContain(otherJob.body.id);
    expect(JSON.stringify(days)).not.toContain('ridge');
  });
});

describe('the crew home', () => {
  it("shows tomorrow's job with site details, notes newest first, and the client's phone to the lead only", async () => {
    await request(h.app).put(`/api/sites/${ids.siteId}`).set(owner.auth)
      .send({ clientId: ids.clientId, addressLine1: '2 Sheepwash Lane', town: 'Lowmoor', postcode: 'LM3 9QD', accessNotes: 'Gate code 2231', hazards: 'Overhead cable' })
      .expect(200);
    const first = await request(h.app).post('/api/site-notes').set(operative.auth).send({ jobId: ids.jobId, body: 'Sand delivered to the yard' }).expect(201);
    h.now.value = new Date('2027-02-28T18:05:00Z');
    await request(h.app).post('/api/site-notes').set(lead.auth).send({ jobId: ids.jobId, body: 'Tarp the pallets tonight' }).expect(201);

    const forLead = (await request(h.app).get('/api/crew-days').set(lead.auth).expect(200)).body as CrewDaysDto;
    expect(forLead).toMatchObject({ today: '2027-02-28', nextDay: '2027-03-01', isLead: true });
    expect(forLead.days.map((d) => d.date)).toEqual(['2027-03-01', '2027-03-02', '2027-03-03']);
    const tomorrow = forLead.days[0]!;
    expect(tomorrow).toMatchObject({
      dayNumber: 1, dayCount: 3, startTime: '08:00', crewName: 'Gable crew',
      job: { reference: expect.any(String), title: 'Repoint barn gable' },
      site: { address: '2 Sheepwash Lane, Lowmoor, LM3 9QD', accessNotes: 'Gate code 2231', hazards: 'Overhead cable', mapsUrl: 'geo:0,0?q=2%20Sheepwash%20Lane%2C%20Lowmoor%2C%20LM3%209QD' },
      client: { firstName: 'Marsh End Farm', phone: null },
    });
    expect(forLead.notes[ids.jobId]!.map((n: SiteNoteDto) => n.body)).toEqual(['Tarp the pallets tonight', 'Sand delivered to the yard']);
    expect(forLead.notes[ids.jobId]![1]).toMatchObject({ id: first.body.id, authorName: 'operative person', authorRole: 'crew' });
    expect(forLead.ahead.map((d) => d.date)).toEqual(['2027-03-01', '2027-03-02', '2027-03-03', '2027-03-04', '2027-03-05']);

    const forOperative = (await request(h.app).get('/api/crew-days').set(operative.auth).expect(200)).body as CrewDaysDto;
    expect(forOperative.days[0]!.client).toBeNull();
  });

  it('gives a crew on a Friday evening Monday as its next day, not the Saturday', async () => {
    h.now.value = new Date('2027-02-26T17:30:00Z');
    const days = (await request(h.app).get('/api/crew-days').set(lead.auth).expect(200)).body as CrewDaysDto;
    expect(days).toMatchObject({ today: '2027-02-26', nextDay: '2027-03-01' });
    expect(days.days.filter((d) => d.date === days.nextDay).map((d) => d.job.title)).toEqual(['Repoint barn gable']);
  });

  it('stores a note sent twice with one idempotency key once', async () => {
    const body = { jobId: ids.jobId, body: 'Left the mixer under the tarp', idempotencyKey: 'note-key-0001' };
    const first = await request(h.app).post('/api/site-notes').set(lead.auth).send(body).expect(201);
    const again = await request(h.app).post('/api/site-notes').set(lead.auth).send(body).expect(200);
    expect(again.body.id).toBe(first.body.id);
    expect((await request(h.app).get('/api/site-notes').query({ jobId: ids.jobId }).set(lead.auth).expect(200)).body).toHaveLength(1);
  });

  it('refuses an empty note with a field error', async () => {
    const res = await request(h.app).post('/api/site-notes').set(lead.auth).send({ jobId: ids.jobId, body: '   ' }).expect(400);
    expect(res.body.errors).toEqual([{ path: 'body', message: 'The note is required' }]);
  });
});

describe('calendar feeds', () => {
  async function feedUrl(who: SignedIn): Promise<string> {
    const res = await request(h.app).post('/api/calendar-feeds').set(who.auth).expect(201);
    return new URL(res.body.url as string).pathname;
  }

  it("parses as iCalendar and holds the crew's job-days at the firm's day start in Europe/London, across the clock change", async () => {
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    // Source: UK clocks go back on the last Sunday of October (Summer Time Order 2002, SI 2002/262): 31 October 2027.
    await request(h.app).put(`/api/assignments/${job.body.assignment.id}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-10-29', workingDays: 3, version: job.body.assignment.version }).expect(200);
    h.now.value = new Date('2027-10-20T09:00:00Z');
    const url = await feedUrl(lead);
    const res = await request(h.app).get(url).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/calendar/);
    const calendar = new ICAL.Component(ICAL.parse(res.text));
    const zone = calendar.getFirstSubcomponent('vtimezone');
    expect(zone?.getFirstPropertyValue('tzid')).toBe('Europe/London');
    ICAL.TimezoneService.register(zone!);
    const events = calendar.getAllSubcomponents('vevent').map((component) => new ICAL.Event(component));
    const summary = events.map((event) => ({
      day: event.startDate.toString().slice(0, 10),
      zone: event.startDate.zone?.tzid,
      local: event.startDate.toString().slice(11, 16),
      utc: event.startDate.toJSDate().toISOString(),
      summary: event.summary,
    }));
    expect(summary).toEqual([
      { day: '2027-10-29', zone: 'Europe/London', local: '08:00', utc: '2027-10-29T07:00:00.000Z', summary: `${job.body.reference} Repoint barn gable` },
      { day: '2027-11-01', zone: 'Europe/London', local: '08:00', utc: '2027-11-01T08:00:00.000Z', summary: `${job.body.reference} Repoint barn gable` },
      { day: '2027-11-02', zone: 'Europe/London', local: '08:00', utc: '2027-11-02T08:00:00.000Z', summary: `${job.body.reference} Repoint barn gable` },
    ]);
    expect(events[0]!.location).toBe('2 Sheepwash Lane, Lowmoor, LM3 9QD');
    expect(events[0]!.endDate.toString().slice(11, 16)).toBe('16:30');
  });

  it('marks a stood-down day in the feed', async () => {
    await h.dataSource.manager.save(h.dataSource.manager.create(WeatherHold, {
      firmId: owner.session.firm.id, jobId: ids.jobId, crewId: ids.crewId, dates: ['2027-03-02'], reason: 'wind', notes: 'Gusts over the scaffold limit',
      raisedBy: lead.session.user.id, raisedFrom: 'crew', status: 'open', forecastSeen: [], idempotencyKey: null,
    }));
    const res = await request(h.app).get(await feedUrl(lead)).expect(200);
    const events = new ICAL.Component(ICAL.parse(res.text)).getAllSubcomponents('vevent').map((c) => new ICAL.Event(c));
    const stood = events.filter((event) => event.summary.startsWith('Stood down (wind)'));
    expect(stood.map((event) => event.startDate.toString().slice(0, 10))).toEqual(['2027-03-02']);
    expect(stood[0]!.description).toContain('Gusts over the scaffold limit');
  });

  it('answers 404 once the link is revoked, and for the old link after a new one is made', async () => {
    const url = await feedUrl(lead);
    await request(h.app).get(url).expect(200);
    const feeds = (await request(h.app).get('/api/calendar-feeds').set(lead.auth).expect(200)).body as Array<{ id: string; lastFetchedAt: string | null }>;
    expect(feeds).toHaveLength(1);
    expect(feeds[0]!.lastFetchedAt).not.toBeNull();
    await request(h.app).delete(`/api/calendar-feeds/${feeds[0]!.id}`).set(operative.auth).expect(404);
    await request(h.app).delete(`/api/calendar-feeds/${feeds[0]!.id}`).set(lead.auth).expect(204);
    const gone = await request(h.app).get(url).expect(404);
    expect(gone.headers['content-type']).toMatch(/application\/problem\+json/);

    const second = await feedUrl(lead);
    const third = await feedUrl(lead);
    await request(h.app).get(second).expect(404);
    await request(h.app).get(third).expect(200);
  });
});

describe('web push', () => {
  function browserKeys() {
    const ecdh = createECDH('prime256v1');
    ecdh.generateKeys();
    return { p256dh: ecdh.getPublicKey().toString('base64url'), auth: randomBytes(16).toString('base64url') };
  }

  it("sends an encrypted, VAPID-signed push to the crew's phones when their schedule changes, and drops a gone subscription", async () => {
    expect((await request(h.app).get('/api/push/config').set(lead.auth).expect(200)).body).toEqual({ publicKey: vapid.publicKey });
    await request(h.app).post('/api/push/subscriptions').set(lead.auth).send({ endpoint: pushFake.endpoint('lead-phone'), keys: browserKeys() }).expect(204);
    await request(h.app).post('/api/push/subscriptions').set(owner.auth).send({ endpoint: pushFake.endpoint('office-pc'), keys: browserKeys() }).expect(204);
    pushFake.clear();
    const job = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/assignments/${job.body.assignment.id}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-03-08', workingDays: 3, version: job.body.assignment.version }).expect(200);
    await h.services.push.idle();
    const received = pushFake.received();
    // The office is not in the crew, so only the lead's phone hears about it.
    expect(received.map((push) => push.path)).toEqual(['/push/lead-phone']);
    expect(received[0]!.headers['content-encoding']).toBe('aes128gcm');
    expect(received[0]!.headers.authorization).toMatch(new RegExp(`^vapid t=[\\w-]+\\.[\\w-]+\\.[\\w-]+, k=${vapid.publicKey}$`));
    expect(received[0]!.bodyBytes).toBeGreaterThan(86);

    pushFake.answerNext('/push/lead-phone', 410);
    const moved = await request(h.app).get(`/api/jobs/${ids.jobId}`).set(owner.auth).expect(200);
    await request(h.app).put(`/api/assignments/${moved.body.assignment.id}`).set(owner.auth)
      .send({ crewId: ids.crewId, startDate: '2027-03-15', workingDays: 3, version: moved.body.assignment.version }).expect(200);
    await h.services.push.idle();
    expect(await h.dataSource.query('SELECT endpoint FROM push_subscription ORDER BY endpoint')).toEqual([{ endpoint: pushFake.endpoint('office-pc') }]);
  });
});
