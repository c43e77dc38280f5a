import { constants, crc32, deflateRawSync } from 'node:zlib';

interface Section {
  value: unknown;
  /** The field as it stands in the JSON text, with its leading brace or comma. */
  raw: Buffer;
  /** `raw` deflated on its own and ended on a byte boundary, so sections can follow one another in one stream. */
  deflated: Buffer;
}

// RFC 1952: magic, deflate, no flags, no time, no extra flags, unknown OS.
const HEADER = Buffer.from([0x1f, 0x8b, 8, 0, 0, 0, 0, 0, 0, 0xff]);
const CLOSE_RAW = Buffer.from('}');
const CLOSE = deflateRawSync(CLOSE_RAW, { level: 1 });

/**
 * The gzip of an object's JSON, made field by field: each top-level field is deflated apart (a sync flush ends it on a
 * byte boundary, as a streaming compressor does), and a field whose value is the very same as last time reuses its
 * bytes. The deflate segments then join into one gzip member (RFC 1951 §3.2.3, RFC 1952 §2.3), so any gzip reader
 * reads exactly `JSON.stringify(object)`. Values must be replaced, never changed in place, for the reuse to hold.
 */
export class SectionedGzip {
  private sections = new Map<string, Section>();

  constructor(private readonly level = 1) {}

  gzip(object: Record<string, unknown>): Buffer {
    const next = new Map<string, Section>();
    const parts: Buffer[] = [HEADER];
    let crc = 0;
    let length = 0;
    for (const [key, value] of Object.entries(object)) {
      if (value === undefined || typeof value === 'function') continue;
      const lead = next.size === 0 ? '{' : ',';
      const known = this.sections.get(key);
      const section = known && known.value === value && known.raw[0] === lead.charCodeAt(0) ? known : this.section(lead, key, value);
      next.set(key, section);
      parts.push(section.deflated);
      crc = crc32(section.raw, crc);
      length += section.raw.length;
    }
    const close = next.size === 0 ? Buffer.from('{}') : CLOSE_RAW;
    parts.push(next.size === 0 ? deflateRawSync(close, { level: this.level }) : CLOSE);
    crc = crc32(close, crc);
    length += close.length;
    this.sections = next;
    const trailer = Buffer.alloc(8);
    trailer.writeUInt32LE(crc >>> 0, 0);
    trailer.writeUInt32LE(length % 2 ** 32, 4);
    parts.push(trailer);
    return Buffer.concat(parts);
  }

  private section(lead: string, key: string, value: unknown): Section {
    const raw = Buffer.from(`${lead}${JSON.stringify(key)}:${JSON.stringify(value)}`);
    return { value, raw, deflated: deflateRawSync(raw, { level: this.level, finishFlush: constants.Z_SYNC_FLUSH }) };
  }
}
