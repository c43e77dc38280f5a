import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listPublicRoutes, listResourceRoutes, publicRouters, resourceRouters, type RouteInfo } from '../../src/app.js';
import { createHarness, signUpFirm, truncateAll, type Harness, type SignedIn } from '../harness.js';

let h: Harness;
let owner: SignedIn;
let document: { openapi: string; paths: Record<string, Record<string, { requestBody?: unknown; parameters: Array<{ name: string; in: string }>; security?: unknown[] }>>; components: { schemas: Record<string, unknown> } };
let routes: RouteInfo[];

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Quarry Lane Masonry', 'owner@quarrylane.example');
  routes = [...listPublicRoutes(h.services, { appUrl: 'http://localhost:3000' }), ...listResourceRoutes(h.services)];
  const res = await request(h.app).get('/api/openapi.json').expect(200);
  expect(res.headers['content-type']).toMatch(/application\/json/);
  document = res.body;
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const openPath = (path: string) => path.replace(/:([A-Za-z_]+)/g, '{$1}');

interface Layer {
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

/** Every route the live app would answer, found by walking its router tree rather than the lists in app.ts. */
function mountedRoutes(stack: Layer[]): string[] {
  const found: string[] = [];
  for (const layer of stack) {
    if (layer.route) {
      for (const method of Object.keys(layer.route.methods)) found.push(`${method.toUpperCase()} ${layer.route.path}`);
    } else if (layer.handle?.stack) {
      found.push(...mountedRoutes(layer.handle.stack));
    }
  }
  return found;
}

function listedRoutes(): string[] {
  const found: string[] = [];
  for (const { router } of [...publicRouters(h.services, { appUrl: 'http://localhost:3000' }), ...resourceRouters(h.services)]) {
    found.push(...mountedRoutes(router.stack as unknown as Layer[]));
  }
  return found;
}

/** A concrete URL for a documented path: a well-formed id, token or variant in each placeholder. */
function sampleUrl(path: string): string {
  return path
    .replace('{id}', '3f1c2a9e-6b7d-4e8f-9a0b-1c2d3e4f5a6b')
    .replace('{variant}', 'thumb')
    .replace(/\{[A-Za-z_]+\}/g, 'AbCdEfGhIjKlMnOpQrStUvWxYz012345');
}

describe('OpenAPI document', () => {
  it('is OpenAPI 3.1 and every $ref in it resolves', () => {
    expect(document.openapi).toBe('3.1.0');
    const refs = [...JSON.stringify(document).matchAll(/"\$ref":"#\/components\/schemas\/([^"]+)"/g)].map((match) => match[1]!);
    expect(refs.length).toBeGreaterThan(30);
    expect(refs.filter((name) => !(name in document.components.schemas))).toEqual([]);
  });

  it('documents every live route, with its body and path parameters', () => {
    const missing = routes.filter((route) => !document.paths[openPath(route.path)]?.[route.method.toLowerCase()]);
    expect(missing).toEqual([]);
    for (const route of routes) {
      const operation = document.paths[openPath(route.path)]![route.method.toLowerCase()]!;
      expect(Boolean(operation.requestBody), `${route.method} ${route.path} body`).toBe(Boolean(route.spec?.body) || route.path === '/api/materials/import' || route.path === '/api/payments/stripe-webhook');
      const pathParams = [...route.path.matchAll(/:([A-Za-z_]+)/g)].map((match) => match[1]);
      expect(operation.parameters.filter((p) => p.in === 'path').map((p) => p.name).sort(), `${route.method} ${route.path} params`).toEqual(pathParams.sort());
    }
  });

  it('lists in app.ts every route the app has mounted, so none can escape the document', () => {
    const mounted = mountedRoutes((h.app as unknown as { router: { stack: Layer[] } }).router.stack).sort();
    expect(mounted).toEqual(listedRoutes().sort());
  });

  it('documents no route the live app does not answer', async () => {
    const operations = Object.entries(document.paths).flatMap(([path, methods]) => Object.keys(methods).map((method) => ({ path, method })));
    expect(operations.length).toBe(routes.length);
    for (const { path, method } of operations) {
      const url = sampleUrl(path);
      const res = await request(h.app)[method as 'get'](url).set(owner.auth);
      // The catch-all answers with exactly this detail; a real route may still say its record was not found.
      expect(res.body?.detail, `${method.toUpperCase()} ${path}`).not.toBe(`${method.toUpperCase()} ${url.split('?')[0]} was not found.`);
      // 503 is allowed: card payments are not set up in tests, and the webhook says so.
      expect(res.status, `${method.toUpperCase()} ${path}`).not.toBe(500);
    }
  });

  it('marks the routes reached without a session as open and the rest as needing a bearer token', () => {
    expect(document.paths['/api/auth/sign-in']!.post!.security).toEqual([]);
    expect(document.paths['/api/public/quotes/{token}']!.get!.security).toEqual([]);
    expect(document.paths['/api/jobs']!.get!.security).toBeUndefined();
    expect(document.paths['/api/auth/me']!.get!.security).toBeUndefined();
  });

  it('gives a body the name of its shared schema', () => {
    expect(document.components.schemas).toHaveProperty('JobInput');
    expect(document.components.schemas).toHaveProperty('SignIn');
    expect(document.components.schemas.AssignmentUpdate).toMatchObject({ type: 'object', required: expect.arrayContaining(['crewId', 'startDate', 'version']) });
  });
});
