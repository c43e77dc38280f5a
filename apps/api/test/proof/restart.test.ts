import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHarness, signUpFirm, truncateAll, type Harness, type SignedIn } from '../harness.js';

// scripts/test.sh exports where its cluster lives; by hand: HB_PG_DATA=/path/to/data PGBIN=/usr/lib/postgresql/15/bin.
const dataDir = process.env.HB_PG_DATA;
const pgBin = process.env.PGBIN;
const canControl = Boolean(dataDir && pgBin && existsSync(path.join(pgBin, 'pg_ctl')) && existsSync(path.join(dataDir, 'PG_VERSION')));
if (!canControl) {
  console.warn('restart test skipped: set HB_PG_DATA and PGBIN to the test cluster (npm test does) to run it');
}

/** pg_ctl as the cluster's owner; as root that is the postgres user, and from / since it may not enter the cwd. */
function pgCtl(...args: string[]): void {
  const command = [path.join(pgBin!, 'pg_ctl'), '-D', dataDir!, '-w', '-t', '30', ...args];
  const asRoot = process.getuid?.() === 0;
  execFileSync(asRoot ? 'runuser' : command[0]!, asRoot ? ['-u', 'postgres', '--', ...command] : command.slice(1), { cwd: '/', stdio: 'pipe' });
}

let h: Harness;
let server: Server;
let base: string;
let owner: SignedIn;

beforeAll(async () => {
  if (!canControl) return;
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Quarry Lane Masonry', 'owner@quarrylane.example');
  server = createServer(h.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  if (!canControl) return;
  // Whatever happened above, the next test file needs the database back.
  try {
    pgCtl('status');
  } catch {
    pgCtl('-l', path.join(path.dirname(dataDir!), 'restart-test.log'), 'restart');
  }
  await new Promise((resolve) => server.close(resolve));
  await h.dataSource.destroy();
});

interface Outcome {
  status: number;
  contentType: string;
  id?: string;
  code?: string;
}

async function addClient(n: number): Promise<Outcome> {
  try {
    const res = await fetch(`${base}/api/clients`, {
      method: 'POST',
      headers: { ...owner.auth, 'Content-Type': 'application/json' },
      body: JSON.stringify({ name: `Restart client ${n}`, contacts: [{ email: `client${n}@restart.example` }] }),
      signal: AbortSignal.timeout(10_000),
    });
    const body = (await res.json()) as { id?: string; code?: string };
    return { status: res.status, contentType: res.headers.get('content-type') ?? '', id: body.id, code: body.code };
  } catch (error) {
    return { status: 0, contentType: String(error) };
  }
}

describe.skipIf(!canControl)('database restart', () => {
  it('answers 503 problem JSON while PostgreSQL is down, recovers by itself within 5 s and loses no acknowledged write', async () => {
    const outcomes: Outcome[] = [];
    let n = 0;
    let isWriting = true;
    // Four writers keep requests in flight across the stop and the start.
    const writers = Array.from({ length: 4 }, async () => {
      while (isWriting) {
        outcomes.push(await addClient(n++));
        await new Promise((resolve) => setTimeout(resolve, 5));
      }
    });
    await new Promise((resolve) => setTimeout(resolve, 300));
    const writtenBeforeStop = outcomes.filter((o) => o.status === 201).length;

    pgCtl('-m', 'fast', 'stop');
    const whileDown = await Promise.all([addClient(-1), addClient(-2), fetch(`${base}/api/clients`, { headers: owner.auth })]);
    await new Promise((resolve) => setTimeout(resolve, 300));
    // From postmaster.opts, so the cluster comes back with the port and options it had.
    pgCtl('-l', path.join(path.dirname(dataDir!), 'restart-test.log'), 'restart');
    const startedAt = Date.now();

    let recoveredAfter = -1;
    while (Date.now() - startedAt < 5_000) {
      const res = await fetch(`${base}/api/clients`, { headers: owner.auth });
      if (res.status === 200) {
        recoveredAfter = Date.now() - startedAt;
        break;
      }
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    await new Promise((resolve) => setTimeout(resolve, 300));
    isWriting = false;
    await Promise.all(writers);

    expect(writtenBeforeStop).toBeGreaterThan(0);
    const [downWrite, , downRead] = whileDown;
    expect(downWrite).toMatchObject({ status: 503, code: 'service-unavailable' });
    expect(downWrite!.contentType).toMatch(/application\/problem\+json/);
    expect(downRead.status).toBe(503);
    expect(recoveredAfter, 'the API did not answer 200 within 5 s of PostgreSQL starting again').toBeGreaterThanOrEqual(0);

    // In flight across the stop, a write is either acknowledged or refused with 503; nothing else.
    expect(outcomes.filter((o) => o.status !== 201 && o.status !== 503)).toEqual([]);
    const refused = outcomes.filter((o) => o.status === 503);
    expect(refused.length).toBeGreaterThan(0);
    expect(refused.every((o) => o.contentType.includes('application/problem+json'))).toBe(true);
    const acknowledged = outcomes.filter((o) => o.status === 201).map((o) => o.id!);
    expect(acknowledged.length).toBeGreaterThan(writtenBeforeStop);
    const missing: string[] = [];
    for (const id of acknowledged) {
      const res = await fetch(`${base}/api/clients/${id}`, { headers: owner.auth });
      if (res.status !== 200) missing.push(`${id} → ${res.status}`);
    }
    expect(missing).toEqual([]);
    console.info(`restart: ${acknowledged.length} writes acknowledged, ${refused.length} refused with 503, recovered ${recoveredAfter} ms after start`);
  }, 60_000);
});
