import { pino } from 'pino';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { createHarness, inviteTokenFrom, PASSWORD, signUpFirm, truncateAll, type Harness } from './harness.js';

let h: Harness;
let lines: string[];

beforeEach(async () => {
  lines = [];
  h = await createHarness({ logger: pino({ level: 'info' }, { write: (line: string) => void lines.push(line) }) });
  await truncateAll(h.dataSource);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

function refreshCookie(res: request.Response): string {
  const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((value) => value.startsWith('hb_refresh='));
  if (!cookie) throw new Error('no refresh cookie set');
  return cookie.split(';')[0]!;
}

/** Every request line logged so far, parsed. */
function requestLines(): Array<{ req: { url: string; headers: Record<string, string> }; res: { headers: Record<string, unknown> } }> {
  return lines.map((line) => JSON.parse(line)).filter((entry) => entry.req);
}

describe('request log', () => {
  it('keeps session tokens, cookies and e-mailed link tokens out of the log', async () => {
    const owner = await signUpFirm(h, 'Ridge Tile Co', 'owner@ridge.example');
    const signedIn = await request(h.app).post('/api/auth/sign-in').send({ email: 'owner@ridge.example', password: PASSWORD }).expect(200);
    const cookie = refreshCookie(signedIn);
    const refreshToken = decodeURIComponent(cookie.slice('hb_refresh='.length));
    await request(h.app).post('/api/auth/refresh').set('Cookie', cookie).expect(200);
    await request(h.app).get('/api/crews').set(owner.auth).expect(200);

    await request(h.app).post('/api/people/invite').set(owner.auth).send({ email: 'new@ridge.example', name: 'New Person', role: 'operative' }).expect(201);
    const inviteToken = inviteTokenFrom(h.mailer, 'new@ridge.example');
    await request(h.app).post('/api/auth/forgot-password').send({ email: 'owner@ridge.example' }).expect(202);
    const resetToken = inviteTokenFrom(h.mailer, 'owner@ridge.example', 'reset-password');
    // The pages the e-mails link to, as a browser asks for them (the app shell is served for these paths).
    await request(h.app).get(`/accept-invite?token=${encodeURIComponent(inviteToken)}`);
    await request(h.app).get(`/reset-password?token=${encodeURIComponent(resetToken)}&from=mail`);

    // Link tokens in API paths and signed URLs: unknown ones still get a logged answer.
    const linkToken = 'Lnk0123456789abcdefghijklmnopqrstuvwxyzABCD';
    await request(h.app).get(`/api/public/supplier-links/${linkToken}`);
    await request(h.app).get(`/api/public/quotes/${linkToken}/pdf`);
    await request(h.app).get(`/api/public/calendar/${linkToken}.ics`);
    await request(h.app).get(`/api/public/photos/7a1c2b9e-5f0d-4a7e-9c51-3e2f1d0b8a64/thumb?expires=1&signature=${linkToken}`);
    await request(h.app).get(`/q/${linkToken}`);

    const secrets = [owner.token, signedIn.body.accessToken as string, refreshToken, inviteToken, resetToken, linkToken];
    const logged = requestLines();
    // One line per request above: the log was written, so its silence on the secrets means something.
    expect(logged).toHaveLength(13);
    const text = lines.join('\n');
    for (const secret of secrets) {
      expect(text).not.toContain(secret);
      expect(text).not.toContain(encodeURIComponent(secret));
    }

    const crews = logged.find((entry) => entry.req.url === '/api/crews')!;
    expect(crews.req.headers.authorization).toBe('[redacted]');
    const refresh = logged.find((entry) => entry.req.url === '/api/auth/refresh')!;
    expect(refresh.req.headers.cookie).toBe('[redacted]');
    expect(refresh.res.headers['set-cookie']).toBe('[redacted]');
    const urls = logged.map((entry) => entry.req.url);
    expect(urls).toEqual(expect.arrayContaining([
      '/accept-invite?token=[redacted]',
      '/reset-password?token=[redacted]&from=mail',
      '/api/public/supplier-links/[redacted]',
      '/api/public/quotes/[redacted]',
      '/api/public/calendar/[redacted]',
      '/api/public/photos/[redacted]?expires=1&signature=[redacted]',
      '/q/[redacted]',
    ]));
  });
});
