import { createHmac, randomUUID, timingSafeEqual } from 'node:crypto';
import exifr from 'exifr';
import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import { In, type DataSource } from 'typeorm';
import {
  PHOTO_MAX_BYTES,
  photoContentTypes,
  type PhotoContentType,
  type PhotoDto,
  type PhotoSettings,
  type PhotoUploadFields,
  type PhotoVariant,
} from '@hodboard/shared';
import { Firm, Photo, PhotoSettingsRow, User } from '../entities/index.js';
import { AppError, errors } from '../errors.js';
import type { Clock } from '../lib/clock.js';
import type { EventBus } from '../lib/event-bus.js';
import { requirePermission, type Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import { crewsOfJob, visibleJob } from './crew-day-service.js';
import { FirmScope } from './firm-scope.js';
import { retryOnDuplicateKey } from './site-note-service.js';
import type { ObjectStorage, StoredObject } from './storage-service.js';

export interface UploadedFile {
  buffer: Buffer;
  originalname: string;
  size: number;
}

const THUMB_EDGE = 480;
const DAY_MS = 86_400_000;
/**
 * The most pixels a photo may have. Phones take 12–50 megapixels; a file far past that within the byte limit is
 * a tiny compressed picture that would unpack to gigabytes (a decompression bomb), so it is refused from its
 * header, before anything is decoded.
 */
export const PHOTO_MAX_PIXELS = 64_000_000;

export class PhotoService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly storage: ObjectStorage,
    private readonly events: EventBus,
    private readonly clock: Clock,
    private readonly signingSecret: string,
  ) {}

  /**
   * Checks the bytes (not the name) are a photo, makes a thumbnail, removes the location if the firm says
   * so, and only then stores anything: a refused upload leaves no object and no row behind.
   */
  async upload(actor: Actor, fields: PhotoUploadFields, file: UploadedFile | undefined): Promise<{ photo: PhotoDto; isNew: boolean }> {
    requirePermission(actor, 'photos:add');
    const manager = this.dataSource.manager;
    if (fields.idempotencyKey) {
      const earlier = await this.byKey(actor, fields.idempotencyKey);
      if (earlier) return { photo: earlier, isNew: false };
    }
    await visibleJob(manager, actor, fields.jobId);
    if (!file || file.size === 0) throw errors.validation([{ path: 'photo', message: 'Choose a photo to upload' }], 'No photo was sent.');
    if (file.size > PHOTO_MAX_BYTES) throw tooLarge(file.originalname);
    const detected = await fileTypeFromBuffer(file.buffer);
    const contentType = detected?.mime as PhotoContentType | undefined;
    if (!contentType || !photoContentTypes.includes(contentType)) {
      const what = detected ? `a ${detected.ext.toUpperCase()} file (${detected.mime})` : 'not a picture Hodboard recognises';
      throw errors.validation(
        [{ path: 'photo', message: `"${file.originalname}" is ${what}. Send a JPEG, PNG or WebP photo.` }],
        `"${file.originalname}" is not a photo: its content is ${what}, whatever its name says.`,
      );
    }
    const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
    const settings = await this.settingsFor(actor.firmId);
    const prepared = await prepare(file, contentType, settings.removeLocation, firm.timeZone);

    const id = randomUUID();
    const base = `${actor.firmId}/${fields.jobId}/${id}`;
    const originalKey = `${base}.${extensionOf(contentType)}`;
    const thumbKey = `${base}-thumb.webp`;
    await this.storage.put(originalKey, prepared.original, contentType);
    try {
      await this.storage.put(thumbKey, prepared.thumb, 'image/webp');
      const result = await retryOnDuplicateKey(() => this.dataSource.transaction(async (tx) => {
        if (fields.idempotencyKey) {
          const earlier = (await new FirmScope(tx, actor.firmId).find(Photo, { where: { idempotencyKey: fields.idempotencyKey } }))[0];
          if (earlier) return { row: earlier, isNew: false, crewIds: [] as string[] };
        }
        const row = await tx.save(new FirmScope(tx, actor.firmId).create(Photo, {
          id, jobId: fields.jobId, caption: fields.caption, contentType, sizeBytes: prepared.original.length,
          width: prepared.width, height: prepared.height, takenAt: prepared.takenAt, originalKey, thumbKey,
          isLocationRemoved: prepared.isLocationRemoved, uploadedBy: actor.userId, idempotencyKey: fields.idempotencyKey ?? null,
        }));
        await recordAudit(tx, actor, { entity: 'job', entityId: fields.jobId, action: 'photo-added', after: { photoId: id, caption: fields.caption } });
        return { row, isNew: true, crewIds: await crewsOfJob(tx, actor.firmId, fields.jobId) };
      }), Boolean(fields.idempotencyKey));
      if (!result.isNew) await this.removeObjects(originalKey, thumbKey);
      else this.events.publish({ firmId: actor.firmId, type: 'photo:added', id: fields.jobId, crewIds: result.crewIds });
      const [dto] = await this.toDtos([result.row]);
      return { photo: dto!, isNew: result.isNew };
    } catch (error) {
      await this.removeObjects(originalKey, thumbKey);
      throw error;
    }
  }

  async list(actor: Actor, jobId: string): Promise<PhotoDto[]> {
    requirePermission(actor, 'jobs:read');
    await visibleJob(this.dataSource.manager, actor, jobId);
    return (await this.listForJobs(actor, [jobId]))[jobId] ?? [];
  }

  async get(actor: Actor, id: string): Promise<PhotoDto> {
    requirePermission(actor, 'jobs:read');
    const row = await new FirmScope(this.dataSource.manager, actor.firmId).get(Photo, id, 'Photo');
    try {
      await visibleJob(this.dataSource.manager, actor, row.jobId);
    } catch {
      throw errors.notFound('Photo');
    }
    const [dto] = await this.toDtos([row]);
    return dto!;
  }

  async listForJobs(actor: Actor, jobIds: string[]): Promise<Record<string, PhotoDto[]>> {
    if (jobIds.length === 0) return {};
    const rows = await new FirmScope(this.dataSource.manager, actor.firmId).find(Photo, { where: { jobId: In(jobIds) }, order: { createdAt: 'DESC' } });
    const byJob: Record<string, PhotoDto[]> = Object.fromEntries(jobIds.map((id) => [id, []]));
    for (const dto of await this.toDtos(rows)) byJob[dto.jobId]!.push(dto);
    return byJob;
  }

  /** The bytes behind a signed link; the signature stands in for the session an <img> cannot send. */
  async signedObject(id: string, variant: PhotoVariant, expires: number, signature: string): Promise<StoredObject> {
    if (!Number.isFinite(expires) || expires < this.clock().getTime() || !this.isSigned(id, variant, expires, signature)) {
      throw errors.notFound('Photo');
    }
    const row = await this.dataSource.manager.findOneBy(Photo, { id });
    if (!row) throw errors.notFound('Photo');
    const object = await this.storage.get(variant === 'thumb' ? row.thumbKey : row.originalKey);
    if (!object) throw errors.notFound('Photo');
    return object;
  }

  async settings(actor: Actor): Promise<PhotoSettings> {
    requirePermission(actor, 'jobs:read');
    return this.settingsFor(actor.firmId);
  }

  async saveSettings(actor: Actor, input: PhotoSettings): Promise<PhotoSettings> {
    requirePermission(actor, 'firm:manage');
    await this.dataSource.transaction(async (manager) => {
      const before = await this.settingsFor(actor.firmId);
      await manager.upsert(PhotoSettingsRow, { firmId: actor.firmId, removeLocation: input.removeLocation }, ['firmId']);
      await recordAudit(manager, actor, { entity: 'firm', entityId: actor.firmId, action: 'photo-settings-changed', before, after: input });
    });
    return this.settingsFor(actor.firmId);
  }

  private async settingsFor(firmId: string): Promise<PhotoSettings> {
    const row = await this.dataSource.manager.findOneBy(PhotoSettingsRow, { firmId });
    return { removeLocation: row?.removeLocation ?? true };
  }

  private async byKey(actor: Actor, key: string): Promise<PhotoDto | null> {
    const row = (await new FirmScope(this.dataSource.manager, actor.firmId).find(Photo, { where: { idempotencyKey: key } }))[0];
    if (!row) return null;
    await visibleJob(this.dataSource.manager, actor, row.jobId);
    return (await this.toDtos([row]))[0]!;
  }

  private async removeObjects(...keys: string[]): Promise<void> {
    for (const key of keys) await this.storage.delete(key).catch(() => undefined);
  }

  private async toDtos(rows: Photo[]): Promise<PhotoDto[]> {
    const ids = [...new Set(rows.map((row) => row.uploadedBy).filter((id): id is string => Boolean(id)))];
    const users = ids.length ? await this.dataSource.manager.find(User, { where: { id: In(ids) }, select: { id: true, name: true } }) : [];
    const names = new Map(users.map((user) => [user.id, user.name]));
    // Links last until the end of tomorrow (UTC): stable for a day, so the phone's cache keeps hitting.
    const expires = (Math.floor(this.clock().getTime() / DAY_MS) + 2) * DAY_MS;
    return rows.map((row) => ({
      id: row.id,
      jobId: row.jobId,
      caption: row.caption,
      contentType: row.contentType,
      sizeBytes: row.sizeBytes,
      width: row.width,
      height: row.height,
      takenAt: row.takenAt?.toISOString() ?? null,
      uploadedAt: row.createdAt.toISOString(),
      uploadedBy: (row.uploadedBy && names.get(row.uploadedBy)) || 'Someone',
      isLocationRemoved: row.isLocationRemoved,
      thumbUrl: this.signedUrl(row.id, 'thumb', expires),
      originalUrl: this.signedUrl(row.id, 'original', expires),
    }));
  }

  private signedUrl(id: string, variant: PhotoVariant, expires: number): string {
    return `/api/public/photos/${id}/${variant}?expires=${expires}&signature=${this.sign(id, variant, expires)}`;
  }

  private sign(id: string, variant: PhotoVariant, expires: number): string {
    return createHmac('sha256', this.signingSecret).update(`photo:${id}:${variant}:${expires}`).digest('base64url');
  }

  private isSigned(id: string, variant: PhotoVariant, expires: number, signature: string): boolean {
    const expected = Buffer.from(this.sign(id, variant, expires));
    const given = Buffer.from(signature);
    return expected.length === given.length && timingSafeEqual(expected, given);
  }
}

export function tooLarge(name?: string): AppError {
  const limit = `${Math.round(PHOTO_MAX_BYTES / 1024 / 1024)} MB`;
  return new AppError('payload-too-large', 413, `${name ? `"${name}"` : 'The photo'} is larger than ${limit}, the most Hodboard takes for one photo.`);
}

function extensionOf(type: PhotoContentType): string {
  return { 'image/jpeg': 'jpg', 'image/png': 'png', 'image/webp': 'webp' }[type];
}

interface Prepared {
  original: Buffer;
  thumb: Buffer;
  width: number;
  height: number;
  takenAt: Date | null;
  isLocationRemoved: boolean;
}

async function prepare(file: UploadedFile, type: PhotoContentType, removeLocation: boolean, timeZone: string): Promise<Prepared> {
  const unreadable = () =>
    errors.validation([{ path: 'photo', message: `"${file.originalname}" could not be read as a picture; it may be damaged` }], 'The photo could not be read.');
  let meta: Awaited<ReturnType<ReturnType<typeof sharp>['metadata']>>;
  try {
    meta = await sharp(file.buffer).metadata();
  } catch {
    throw unreadable();
  }
  const pixels = (meta.width ?? 0) * (meta.height ?? 0);
  if (pixels > PHOTO_MAX_PIXELS) {
    const size = `${meta.width} × ${meta.height} pixels (${Math.round(pixels / 1e6)} megapixels)`;
    throw errors.validation(
      [{ path: 'photo', message: `"${file.originalname}" is ${size}; Hodboard takes photos up to ${PHOTO_MAX_PIXELS / 1e6} megapixels. Take it at the camera's usual size.` }],
      'The photo has too many pixels.',
    );
  }
  let thumb: Buffer;
  try {
    thumb = await sharp(file.buffer, { limitInputPixels: PHOTO_MAX_PIXELS })
      .rotate().resize(THUMB_EDGE, THUMB_EDGE, { fit: 'inside', withoutEnlargement: true }).webp({ quality: 72 }).toBuffer();
  } catch {
    throw unreadable();
  }
  const exif = await readExif(meta.exif);
  const xmp = readXmp(meta.xmp);
  const taken = exif.taken ?? xmp.taken;
  const offset = exif.taken ? exif.offset : xmp.offset;
  const takenAt = taken ? exifTimeToDate(taken, offset, timeZone) : null;
  const hasLocation = exif.hasGps || xmp.hasGps;
  let original = file.buffer;
  if (removeLocation && hasLocation) {
    // Re-encoding drops every metadata block (EXIF, XMP, IPTC); the colour profile and the time the photo was
    // taken are written back, the position is not.
    const keep = taken ? { IFD0: { DateTime: taken }, IFD2: { DateTimeOriginal: taken, ...(offset ? { OffsetTimeOriginal: offset } : {}) } } : {};
    const image = sharp(file.buffer, { limitInputPixels: PHOTO_MAX_PIXELS }).rotate().keepIccProfile().withExif(keep);
    original = await (type === 'image/png' ? image.png() : type === 'image/webp' ? image.webp({ quality: 92 }) : image.jpeg({ quality: 92, mozjpeg: true })).toBuffer();
  }
  const oriented = (meta.orientation ?? 1) >= 5;
  return {
    original,
    thumb,
    width: (oriented ? meta.height : meta.width) ?? 0,
    height: (oriented ? meta.width : meta.height) ?? 0,
    takenAt,
    isLocationRemoved: removeLocation && hasLocation,
  };
}

interface PhotoTime {
  /** EXIF form, "YYYY:MM:DD HH:MM:SS", wall-clock where the photo was taken. */
  taken: string | null;
  /** "+HH:MM" when the camera said which offset that wall-clock was in. */
  offset: string | null;
}

/**
 * Reads the EXIF block sharp found, whatever the container (exifr alone does not open WebP): sharp hands it over
 * as "Exif\0\0" and a TIFF structure, which is what exifr parses.
 */
async function readExif(block: Buffer | undefined): Promise<PhotoTime & { hasGps: boolean }> {
  if (!block?.length) return { taken: null, offset: null, hasGps: false };
  const tiff = block.subarray(0, 6).toString('latin1') === 'Exif\0\0' ? block.subarray(6) : block;
  try {
    const raw = (await exifr.parse(tiff, { tiff: true, exif: true, gps: true, reviveValues: false, translateValues: false })) as Record<string, unknown> | undefined;
    const taken = typeof raw?.DateTimeOriginal === 'string' ? raw.DateTimeOriginal : typeof raw?.CreateDate === 'string' ? raw.CreateDate : null;
    const offset = typeof raw?.OffsetTimeOriginal === 'string' ? raw.OffsetTimeOriginal : null;
    const hasGps = Boolean(raw && Object.keys(raw).some((key) => key.startsWith('GPS')));
    return { taken, offset, hasGps };
  } catch {
    // An EXIF block too broken to read may still hold a position: treat it as one, so removal re-encodes.
    return { taken: null, offset: null, hasGps: true };
  }
}

/** XMP (Adobe's XML metadata, written by editing apps and some cameras) can carry the position and the time too. */
export function readXmp(block: Buffer | undefined): PhotoTime & { hasGps: boolean } {
  if (!block?.length) return { taken: null, offset: null, hasGps: false };
  const text = block.toString('utf8');
  // Whatever prefix the writer bound the EXIF namespace to, the property names stay GPSLatitude and so on.
  const hasGps = /GPS(?:Latitude|Longitude|Altitude|DestLatitude|DestLongitude|AreaInformation)\b/.test(text);
  const value = /\b(?:exif:DateTimeOriginal|photoshop:DateCreated|xmp:CreateDate)\s*(?:=\s*"|>)\s*([^"<]+)/.exec(text)?.[1]?.trim();
  // ISO 8601 as XMP writes it: a date and time, and an offset only when the writer knew it.
  const iso = value ? /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?(?:\.\d+)?(Z|[+-]\d{2}:\d{2})?$/.exec(value) : null;
  if (!iso) return { taken: null, offset: null, hasGps };
  const [, y, mo, d, h, mi, sec, zone] = iso;
  return { taken: `${y}:${mo}:${d} ${h}:${mi}:${sec ?? '00'}`, offset: zone === 'Z' ? '+00:00' : (zone ?? null), hasGps };
}

/** EXIF times are wall-clock without a zone unless the camera wrote an offset; read them in the firm's zone. */
export function exifTimeToDate(value: string, offset: string | null, timeZone: string): Date | null {
  const match = /^(\d{4}):(\d{2}):(\d{2}) (\d{2}):(\d{2}):(\d{2})/.exec(value);
  if (!match) return null;
  const [, y, mo, d, h, mi, s] = match.map(Number) as [number, number, number, number, number, number, number];
  const wall = Date.UTC(y, mo - 1, d, h, mi, s);
  if (offset && /^[+-]\d{2}:\d{2}$/.test(offset)) {
    const sign = offset.startsWith('-') ? -1 : 1;
    return new Date(wall - sign * (Number(offset.slice(1, 3)) * 60 + Number(offset.slice(4, 6))) * 60_000);
  }
  const guess = wall - zoneOffsetMs(timeZone, wall);
  return new Date(wall - zoneOffsetMs(timeZone, guess));
}

export function zoneOffsetMs(timeZone: string, at: number): number {
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit',
  }).formatToParts(new Date(at));
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value);
  return Date.UTC(get('year'), get('month') - 1, get('day'), get('hour'), get('minute'), get('second')) - Math.floor(at / 1000) * 1000;
}
