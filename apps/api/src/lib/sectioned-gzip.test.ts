import { execFileSync } from 'node:child_process';
import { gunzipSync } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SectionedGzip } from './sectioned-gzip.js';

const objects = fc.dictionary(fc.string({ maxLength: 12 }), fc.jsonValue({ maxDepth: 3 }), { maxKeys: 8 });

describe('SectionedGzip', () => {
  // Source: RFC 1952 (gzip) and RFC 1951 (deflate), read back by Node's zlib, the reference implementation's binding.
  it('unzips to exactly the JSON text of any object, fresh or with fields reused', () => {
    fc.assert(fc.property(objects, objects, (first, second) => {
      const gzip = new SectionedGzip();
      expect(gunzipSync(gzip.gzip(first)).toString()).toBe(JSON.stringify(first));
      const mixed = { ...first, ...second };
      expect(gunzipSync(gzip.gzip(mixed)).toString()).toBe(JSON.stringify(mixed));
    }));
  });

  // Source: the system's gzip(1), an implementation apart from Node's, checks the CRC-32 and length in the trailer.
  it('passes gzip -t and reads back with the system gzip', () => {
    const board = { from: '2027-03-01', days: Array.from({ length: 400 }, (_, i) => ({ date: `d${i}`, isWorkingDay: i % 7 < 5 })), lastEventId: 9 };
    const zipped = new SectionedGzip().gzip(board);
    execFileSync('gzip', ['-t'], { input: zipped });
    expect(execFileSync('gzip', ['-dc'], { input: zipped }).toString()).toBe(JSON.stringify(board));
  });

  it('reads right after fields are replaced, dropped or moved to the front', () => {
    const gzip = new SectionedGzip();
    const jobs = Array.from({ length: 2000 }, (_, i) => ({ id: `job-${i}`, title: 'Repoint the gable' }));
    const first = { from: '2027-03-01', jobs, assignments: [1, 2, 3] };
    const read = (object: Record<string, unknown>) => gunzipSync(gzip.gzip(object)).toString();
    expect(read(first)).toBe(JSON.stringify(first));
    expect(read({ ...first, assignments: [1, 2, 4] })).toBe(JSON.stringify({ ...first, assignments: [1, 2, 4] }));
    expect(read({ jobs, assignments: [5] })).toBe(JSON.stringify({ jobs, assignments: [5] }));
    expect(read({ from: '2027-03-08', jobs })).toBe(JSON.stringify({ from: '2027-03-08', jobs }));
    expect(read({})).toBe('{}');
  });
});
