import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHarness, signUpFirm, truncateAll, type Harness, type SignedIn } from './harness.js';

let h: Harness;
let owner: SignedIn;

beforeAll(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
  owner = await signUpFirm(h, 'Flint Lane Builders', 'owner@flint.example');
});
afterAll(async () => {
  await h.dataSource.destroy();
});

const EVIL = 'https://evil.example';

function expectSecurityHeaders(res: request.Response): void {
  const csp = String(res.headers['content-security-policy']);
  expect(csp).toContain("default-src 'self'");
  expect(csp).toContain("frame-ancestors 'self'");
  expect(csp).toContain("object-src 'none'");
  expect(res.headers['x-content-type-options']).toBe('nosniff');
  expect(res.headers['x-frame-options']).toBe('SAMEORIGIN');
  expect(res.headers['strict-transport-security']).toMatch(/max-age=\d+/);
  expect(res.headers['referrer-policy']).toBe('no-referrer');
  expect(res.headers['cross-origin-opener-policy']).toBe('same-origin');
  expect(res.headers).not.toHaveProperty('x-powered-by');
}

function expectNoCors(res: request.Response): void {
  expect(res.headers).not.toHaveProperty('access-control-allow-origin');
  expect(res.headers).not.toHaveProperty('access-control-allow-credentials');
  expect(res.headers).not.toHaveProperty('access-control-allow-methods');
  expect(res.headers).not.toHaveProperty('access-control-allow-headers');
}

describe('security headers', () => {
  it.each([
    ['a public route', () => request(h.app).get('/api/health'), 200],
    ['a signed-in route', () => request(h.app).get('/api/clients').set(owner.auth), 200],
    ['a problem answer', () => request(h.app).get('/api/no-such-thing'), 404],
  ])('are sent on %s', async (_name, send, status) => {
    const res = await send();
    expect(res.status).toBe(status);
    expectSecurityHeaders(res);
  });
});

describe('cross-origin requests', () => {
  it('get no Access-Control-Allow-Origin on a simple request from another origin', async () => {
    const res = await request(h.app).get('/api/clients').set(owner.auth).set('Origin', EVIL).expect(200);
    expectNoCors(res);
  });

  it('get no CORS grant on a preflight from another origin', async () => {
    const res = await request(h.app)
      .options('/api/clients')
      .set('Origin', EVIL)
      .set('Access-Control-Request-Method', 'POST')
      .set('Access-Control-Request-Headers', 'authorization, content-type');
    expectNoCors(res);
  });

  it('get no CORS grant on the session routes, which carry the refresh cookie', async () => {
    const res = await request(h.app).post('/api/auth/refresh').set('Origin', EVIL).set('Cookie', 'hb_refresh=whatever');
    expect(res.status).toBe(401);
    expectNoCors(res);
  });
});
