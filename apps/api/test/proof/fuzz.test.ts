import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import querystring from 'node:querystring';
import fc from 'fast-check';
import { pino } from 'pino';
import request from 'supertest';
import type { ZodType } from 'zod';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findNul } from '../../src/middleware/validate.js';
import { listPublicRoutes, listResourceRoutes, type RouteInfo } from '../../src/app.js';
import { createHarness, populateFirm, signUpFirm, truncateAll, type Harness, type SignedIn } from '../harness.js';
import { quoteFixture } from '../quotes-helpers.js';
import { bodyMutations, oddPathSegments, queryMutations, type Mutation } from './mutations.js';
import { arbitraryOf, fieldsOf, type ArbitraryContext } from './zod-arbitrary.js';
import { rowCounts } from './row-counts.js';

// Fixed so a failure replays exactly; fast-check prints the seed and the failing case. FUZZ_SEED / FUZZ_RUNS override.
// Every route gets every kind of mutation its body, query and path allow, FUZZ_RUNS times each, and input as generated.
const SEED = Number(process.env.FUZZ_SEED ?? 20_270_301);
const RUNS = Number(process.env.FUZZ_RUNS ?? 2);
const PLAIN_RUNS = 3;

let h: Harness;
let server: Server;
let base: string;
let owner: SignedIn;
let context: ArbitraryContext;
let idOf: Record<string, string>;
const logged: string[] = [];

const harnessDeps = () => ({
  logger: pino({ level: 'error' }, { write: (line: string) => void logged.push(line) }),
});

beforeAll(async () => {
  h = await createHarness(harnessDeps());
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Quarry Lane Masonry', 'owner@quarrylane.example');
  const ids = await populateFirm(h, owner);
  const quotes = await quoteFixture(h, owner, ids.jobId);
  const feed = await request(h.app).post('/api/calendar-feeds').set(owner.auth).expect(201);
  const hold = await request(h.app).post('/api/weather-holds').set(owner.auth).send({ jobId: ids.jobId, dates: ['2027-03-02'], reason: 'wind' }).expect(201);
  idOf = {
    people: ids.memberId, crews: ids.crewId, clients: ids.clientId, sites: ids.siteId, jobs: ids.jobId,
    assignments: ids.assignmentId, 'time-off': ids.timeOffId, suppliers: ids.supplierId, 'access-bookings': ids.bookingId,
    quotes: quotes.quoteId, materials: quotes.materialId, costing: ids.jobId, 'calendar-feeds': feed.body.id, 'weather-holds': hold.body.id,
  };
  context = { ids: [...Object.values(ids), quotes.quoteId, quotes.materialId] };
  server = createServer(h.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
  await h.dataSource.destroy();
});

interface Parts {
  params: Record<string, string>;
  query: Record<string, unknown>;
  body: unknown;
}

function paramNames(path: string): string[] {
  return [...path.matchAll(/:([A-Za-z_]+)/g)].map((match) => match[1]!);
}

function urlFor(route: RouteInfo, params: Record<string, string>, query: Record<string, unknown>, rawSegment?: { name: string; value: string }): string {
  const path = route.path.replace(/:([A-Za-z_]+)/g, (_m, name: string) =>
    rawSegment?.name === name ? rawSegment.value : encodeURIComponent(params[name] ?? 'missing'));
  const search = querystring.stringify(query as querystring.ParsedUrlQueryInput);
  return search ? `${path}?${search}` : path;
}

/** Would the route's own schemas accept these parts, read the way Express reads them? */
function isAccepted(route: RouteInfo, url: string, body: unknown, hasBody: boolean): boolean {
  const spec = route.spec ?? {};
  const [pathPart, search = ''] = url.split('?') as [string, string?];
  const template = route.path.split('/');
  const actual = pathPart.split('/');
  const params: Record<string, string> = {};
  for (const [i, segment] of template.entries()) {
    if (!segment.startsWith(':')) continue;
    try {
      params[segment.slice(1)] = decodeURIComponent(actual[i] ?? '');
    } catch {
      return false;
    }
  }
  const query = { ...querystring.parse(search) };
  // The API refuses NUL in any text before the schema sees it.
  const check = (schema: ZodType | undefined, value: unknown) => !schema || (!findNul(value) && schema.safeParse(value).success);
  return check(spec.params, params) && check(spec.query, query) && (!hasBody || check(spec.body, body ?? {}));
}

async function send(route: RouteInfo, url: string, body: unknown, hasBody: boolean) {
  const isOpen = !url.startsWith('/api/') || /^\/api\/(auth|public|payments)\//.test(route.path);
  let req = request(base)[route.method.toLowerCase() as 'post'](url);
  if (!isOpen || route.path === '/api/auth/me') req = req.set(owner.auth);
  if (hasBody) req = req.set('Content-Type', 'application/json').send(JSON.stringify(body) ?? 'null');
  return req;
}

function describeFailure(route: RouteInfo, label: string, status: number, body: unknown): string {
  const lastError = logged.at(-1)?.slice(0, 1_500) ?? '';
  return `${route.method} ${route.path} [${label}] → ${status} ${JSON.stringify(body).slice(0, 400)}\n${status >= 500 ? lastError : ''}`;
}

function generatorsFor(route: RouteInfo) {
  const spec = route.spec ?? {};
  const resource = route.path.split('/')[2] ?? '';
  const names = paramNames(route.path);
  const paramsArb: fc.Arbitrary<Record<string, string>> = spec.params
    ? (arbitraryOf(spec.params, { ids: idOf[resource] ? [idOf[resource]!] : [] }) as fc.Arbitrary<Record<string, string>>)
    : fc.constant(Object.fromEntries(names.map((name) => [name, 'missing'])));
  const queryArb = spec.query ? (arbitraryOf(spec.query, context) as fc.Arbitrary<Record<string, unknown>>) : fc.constant({});
  const bodyArb = spec.body ? arbitraryOf(spec.body, context) : fc.constant(undefined);
  return { paramsArb, queryArb, bodyArb, names };
}

/** Every route that reads a body, a query or path params; removals last so the others still find their rows. */
const allRoutes = (): RouteInfo[] => {
  const routes = [...listPublicRoutes(h.services, { appUrl: 'http://localhost:3000' }), ...listResourceRoutes(h.services)]
    .filter((route) => route.spec && (route.spec.body || route.spec.query || route.spec.params));
  return [...routes.filter((route) => route.method !== 'DELETE'), ...routes.filter((route) => route.method === 'DELETE')];
};

describe('fuzzed input', () => {
  it('finds routes to fuzz, public ones included', async () => {
    const routes = allRoutes();
    expect(routes.length).toBeGreaterThan(60);
    expect(routes.some((route) => route.path.startsWith('/api/public/'))).toBe(true);
    expect(routes.some((route) => route.path.startsWith('/api/auth/'))).toBe(true);
  });

  it('answers every fuzzed request on every route with 2xx/4xx, never 500, and writes nothing when the input is invalid', async () => {
    const routes = allRoutes();
    const failures: string[] = [];
    let cases = 0;
    for (const [index, route] of routes.entries()) {
      const { paramsArb, queryArb, bodyArb, names } = generatorsFor(route);
      const hasBody = Boolean(route.spec?.body);
      const valid = fc.record({ params: paramsArb, query: queryArb, body: bodyArb });
      const apply = (mutation: Mutation, value: unknown) => mutation.apply((value && typeof value === 'object' && !Array.isArray(value) ? value : {}) as Record<string, unknown>);
      // Each kind of bad input on its own: input as generated, then every mutation of the body, the query and the path.
      const kinds: Array<{ runs: number; arb: fc.Arbitrary<{ parts: Parts; label: string; rawSegment?: { name: string; value: string } }> }> = [
        { runs: PLAIN_RUNS, arb: valid.map((parts) => ({ parts, label: 'as generated' })) },
        ...(hasBody ? bodyMutations(fieldsOf(route.spec!.body!)) : []).map((mutation) => ({
          runs: RUNS,
          arb: fc.tuple(valid, mutation).map(([parts, m]) => ({ parts: { ...parts, body: apply(m, parts.body) }, label: `body: ${m.name}` })),
        })),
        ...(route.spec?.query ? queryMutations(fieldsOf(route.spec.query)) : []).map((mutation) => ({
          runs: RUNS,
          arb: fc.tuple(valid, mutation).map(([parts, m]) => ({ parts: { ...parts, query: apply(m, parts.query) as Record<string, unknown> }, label: `query: ${m.name}` })),
        })),
        ...(names.length ? [{
          runs: RUNS * 2,
          arb: fc.tuple(valid, fc.constantFrom(...names), fc.constantFrom(...oddPathSegments)).map(([parts, name, value]) => ({
            parts, label: `path :${name} = ${value.slice(0, 40)}`, rawSegment: { name, value },
          })),
        }] : []),
      ];
      for (const [kindIndex, kind] of kinds.entries()) {
        cases += kind.runs;
        const outcome = await fc.check(
          fc.asyncProperty(kind.arb, async ({ parts, label, rawSegment }) => {
            const url = urlFor(route, parts.params, parts.query, rawSegment);
            const isValid = isAccepted(route, url, parts.body, hasBody);
            const before = isValid ? undefined : await rowCounts(h.dataSource);
            const res = await send(route, url, parts.body, hasBody);
            const why = describeFailure(route, label, res.status, res.body);
            expect(res.status, why).toBeLessThan(500);
            if (res.status >= 400) expect(res.headers['content-type'], why).toMatch(/application\/problem\+json/);
            if (!isValid) {
              expect([400, 413], why).toContain(res.status);
              expect(await rowCounts(h.dataSource), why).toEqual(before);
            }
          }),
          { seed: SEED + index * 100 + kindIndex, numRuns: kind.runs, endOnFailure: true },
        );
        if (outcome.failed) {
          const error = outcome.errorInstance instanceof Error ? outcome.errorInstance.message : String(outcome.errorInstance);
          failures.push(`${error.split('\n').slice(0, 6).join('\n')}\n  (seed ${outcome.seed}, replay FUZZ_SEED=${SEED} route #${index} kind #${kindIndex})`);
        }
      }
    }
    // Roughly a dozen kinds per route with a body: a route left with only its plain runs would show here.
    expect(cases).toBeGreaterThan(routes.length * 8);
    expect(failures, failures.join('\n\n')).toEqual([]);
  }, 240_000);

  it('answers any text sent as a price-list file with the import or a problem, never 500, and a refused file imports nothing', async () => {
    const header = fc.constantFrom('name,unit,unitPricePence,isVatable\n', 'name,unit\n', '', '\uFEFFname,unit,unitPricePence\n', 'a,a,a\n');
    const cell = fc.oneof(
      fc.string({ unit: 'grapheme', maxLength: 30 }),
      fc.constantFrom('', '"', '""', '"a,b"', '=1+1', '-5', '1e999', '12.345', 'NaN', 'true', '\u0000', 'x'.repeat(5_000)),
    );
    const line = fc.tuple(fc.array(cell, { minLength: 1, maxLength: 6 }), fc.constantFrom(',', ';', '\t')).map(([cells, separator]) => cells.join(separator));
    const file = fc.tuple(header, fc.array(line, { maxLength: 8 }), fc.constantFrom('\n', '\r\n', '\r')).map(([head, lines, end]) => head + lines.join(end));
    await fc.assert(
      fc.asyncProperty(file, async (csv) => {
        const before = await rowCounts(h.dataSource);
        const res = await request(base).post('/api/materials/import').set(owner.auth).set('Content-Type', 'text/csv').send(csv);
        const why = `${res.status} ${JSON.stringify(res.body).slice(0, 300)} for ${JSON.stringify(csv.slice(0, 200))}`;
        expect([200, 400, 413], why).toContain(res.status);
        if (res.status !== 200) {
          expect(res.headers['content-type'], why).toMatch(/application\/problem\+json/);
          expect(await rowCounts(h.dataSource), why).toEqual(before);
        }
      }),
      { seed: SEED, numRuns: 40 },
    );
  }, 120_000);
});
