import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { addPerson, countRows, createHarness, inviteTokenFrom, PASSWORD, signIn, signUpFirm, TEST_SECRET, truncateAll, type Harness } from './harness.js';

let h: Harness;

beforeEach(async () => {
  h = await createHarness();
  await truncateAll(h.dataSource);
});
afterAll(async () => {
  await h.dataSource.destroy();
});

function refreshCookie(res: request.Response): string {
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const cookie = cookies.find((value) => value.startsWith('hb_refresh='));
  if (!cookie) throw new Error('no refresh cookie set');
  return cookie.split(';')[0]!;
}

describe('sign-up, sign-in, refresh and sign-out', () => {
  it('walks a new firm through the whole session life cycle', async () => {
    const signUp = await request(h.app)
      .post('/api/auth/sign-up')
      .send({ firmName: 'Pennine Stoneworks', ownerName: 'Ada Crowther', email: 'Ada@Pennine.example', password: PASSWORD })
      .expect(201);
    expect(signUp.body).toMatchObject({ role: 'owner', firm: { name: 'Pennine Stoneworks' }, user: { email: 'ada@pennine.example' } });
    const setCookie = ([] as string[]).concat(signUp.headers['set-cookie'] ?? []).join(';');
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Strict/i);

    const signInRes = await request(h.app).post('/api/auth/sign-in').send({ email: 'ada@pennine.example', password: PASSWORD }).expect(200);
    const me = await request(h.app).get('/api/auth/me').set('Authorization', `Bearer ${signInRes.body.accessToken}`).expect(200);
    expect(me.body.firm.name).toBe('Pennine Stoneworks');

    const cookie = refreshCookie(signInRes);
    const refreshed = await request(h.app).post('/api/auth/refresh').set('Cookie', cookie).expect(200);
    expect(refreshed.body.accessToken).toEqual(expect.any(String));
    // Refresh tokens rotate: the one just spent is refused.
    await request(h.app).post('/api/auth/refresh').set('Cookie', cookie).expect(401);

    const current = refreshCookie(refreshed);
    await request(h.app).post('/api/auth/sign-out').set('Cookie', current).expect(204);
    const after = await request(h.app).post('/api/auth/refresh').set('Cookie', current).expect(401);
    expect(after.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(after.body.code).toBe('unauthenticated');
  });

  it('returns 409 and writes nothing when the e-mail already has an account', async () => {
    await signUpFirm(h, 'First Firm', 'taken@example.org');
    const before = await countRows(h.dataSource);
    const res = await request(h.app)
      .post('/api/auth/sign-up')
      .send({ firmName: 'Second Firm', ownerName: 'Someone', email: 'taken@example.org', password: PASSWORD })
      .expect(409);
    expect(res.body).toMatchObject({ status: 409, code: 'already-exists' });
    expect(await countRows(h.dataSource)).toEqual(before);
  });

  it('refuses a wrong password and an unknown e-mail with the same answer', async () => {
    await signUpFirm(h, 'Firm', 'real@example.org');
    const wrong = await request(h.app).post('/api/auth/sign-in').send({ email: 'real@example.org', password: 'not-the-password' }).expect(401);
    const unknown = await request(h.app).post('/api/auth/sign-in').send({ email: 'nobody@example.org', password: 'not-the-password' }).expect(401);
    expect(wrong.body.code).toBe('bad-credentials');
    expect(unknown.body).toEqual(wrong.body);
  });
});

describe('access tokens', () => {
  it('refuses an expired token', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    const claims = jwt.decode(owner.token) as Record<string, unknown>;
    const expired = jwt.sign({ sub: claims.sub, mid: claims.mid, fid: claims.fid, exp: Math.floor(Date.now() / 1000) - 60 }, TEST_SECRET);
    const res = await request(h.app).get('/api/crews').set('Authorization', `Bearer ${expired}`).expect(401);
    expect(res.body.code).toBe('token-expired');
  });

  it('refuses a token whose payload was altered', async () => {
    const owner = await signUpFirm(h, 'Firm A', 'a@example.org');
    const other = await signUpFirm(h, 'Firm B', 'b@example.org');
    const [header, , signature] = owner.token.split('.');
    const otherPayload = other.token.split('.')[1];
    const res = await request(h.app).get('/api/crews').set('Authorization', `Bearer ${header}.${otherPayload}.${signature}`).expect(401);
    expect(res.body.code).toBe('token-invalid');
  });

  it('refuses a token signed with another key', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    const claims = jwt.decode(owner.token) as Record<string, unknown>;
    const forged = jwt.sign({ sub: claims.sub, mid: claims.mid, fid: claims.fid }, 'some-other-secret-some-other-secret');
    await request(h.app).get('/api/crews').set('Authorization', `Bearer ${forged}`).expect(401);
  });

  it('asks for sign-in when no token is sent', async () => {
    const res = await request(h.app).get('/api/clients').expect(401);
    expect(res.body).toMatchObject({ code: 'unauthenticated', status: 401, type: '/problems/unauthenticated' });
  });

  it('stops a removed person at once, even with an unexpired token', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    const office = await addPerson(h, owner, 'office', 'office@example.org');
    await request(h.app).get('/api/clients').set(office.auth).expect(200);
    const people = await request(h.app).get('/api/people').set(owner.auth).expect(200);
    const officeMember = (people.body as Array<{ id: string; email: string }>).find((p) => p.email === 'office@example.org')!;
    await request(h.app).delete(`/api/people/${officeMember.id}`).set(owner.auth).expect(204);
    await request(h.app).get('/api/clients').set(office.auth).expect(401);
  });
});

describe('a changed role', () => {
  it("refuses an office user's old token on office work once they are made an operative", async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    const office = await addPerson(h, owner, 'office', 'office@example.org');
    const client = await request(h.app).post('/api/clients').set(office.auth).send({ name: 'Wold Top Farm' }).expect(201);
    await request(h.app).get('/api/people').set(office.auth).expect(200);
    const people = await request(h.app).get('/api/people').set(owner.auth).expect(200);
    const officeMember = (people.body as Array<{ id: string; email: string }>).find((p) => p.email === 'office@example.org')!;
    const demoted = await request(h.app).patch(`/api/people/${officeMember.id}`).set(owner.auth).send({ role: 'operative' }).expect(200);
    expect(demoted.body.role).toBe('operative');

    const before = await countRows(h.dataSource);
    const write = await request(h.app).post('/api/clients').set(office.auth).send({ name: 'Sneaked In Ltd' }).expect(403);
    expect(write.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(write.body.code).toBe('forbidden');
    await request(h.app).put(`/api/clients/${client.body.id}`).set(office.auth).send({ name: 'Renamed' }).expect(403);
    for (const officeOnly of ['/api/clients', `/api/clients/${client.body.id}`, '/api/people']) {
      const read = await request(h.app).get(officeOnly).set(office.auth);
      expect(read.status, officeOnly).toBe(403);
      expect(JSON.stringify(read.body), officeOnly).not.toContain('Wold Top');
    }
    expect(await countRows(h.dataSource)).toEqual(before);
    expect((await request(h.app).get('/api/auth/me').set(office.auth).expect(200)).body.role).toBe('operative');
  });

  it('takes the role from the database, not from a role claim added to a correctly signed token', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    const operative = await addPerson(h, owner, 'operative', 'op@example.org');
    const claims = jwt.decode(operative.token) as Record<string, unknown>;
    const promoted = jwt.sign({ sub: claims.sub, mid: claims.mid, fid: claims.fid, role: 'owner' }, TEST_SECRET, { expiresIn: 600 });
    const auth = { Authorization: `Bearer ${promoted}` };
    expect((await request(h.app).get('/api/auth/me').set(auth).expect(200)).body.role).toBe('operative');
    await request(h.app).put('/api/firm').set(auth).send({ name: 'Taken Over Ltd' }).expect(403);
    await request(h.app).get('/api/clients').set(auth).expect(403);
    await request(h.app).post('/api/people/invite').set(auth).send({ email: 'friend@example.org', name: 'Friend', role: 'owner' }).expect(403);
    expect((await request(h.app).get('/api/firm').set(owner.auth).expect(200)).body.name).toBe('Firm');
  });
});

describe('invitations and password resets', () => {
  it('accepts an invitation once and refuses the same link again', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    await request(h.app).post('/api/people/invite').set(owner.auth).send({ email: 'new@example.org', name: 'New Person', role: 'operative' }).expect(201);
    const token = inviteTokenFrom(h.mailer, 'new@example.org');
    const accepted = await request(h.app).post('/api/auth/accept-invite').send({ token, name: 'New Person', password: PASSWORD }).expect(200);
    expect(accepted.body.role).toBe('operative');
    const again = await request(h.app).post('/api/auth/accept-invite').send({ token, name: 'Intruder', password: 'Another-pass-99' }).expect(401);
    expect(again.body.code).toBe('token-invalid');
    await signIn(h, 'new@example.org', PASSWORD);
  });

  it('resets a password once; the old password and the used link stop working', async () => {
    await signUpFirm(h, 'Firm', 'owner@example.org');
    await request(h.app).post('/api/auth/forgot-password').send({ email: 'owner@example.org' }).expect(202);
    const token = inviteTokenFrom(h.mailer, 'owner@example.org', 'reset-password');
    await request(h.app).post('/api/auth/reset-password').send({ token, password: 'Brand-new-pass-7' }).expect(204);
    await request(h.app).post('/api/auth/reset-password').send({ token, password: 'Third-pass-777' }).expect(401);
    await request(h.app).post('/api/auth/sign-in').send({ email: 'owner@example.org', password: PASSWORD }).expect(401);
    await signIn(h, 'owner@example.org', 'Brand-new-pass-7');
  });

  it('refuses a reset link after it has expired', async () => {
    await signUpFirm(h, 'Firm', 'owner@example.org');
    await request(h.app).post('/api/auth/forgot-password').send({ email: 'owner@example.org' }).expect(202);
    const token = inviteTokenFrom(h.mailer, 'owner@example.org', 'reset-password');
    h.now.value = new Date(h.now.value.getTime() + 2 * 3_600_000);
    const res = await request(h.app).post('/api/auth/reset-password').send({ token, password: 'Brand-new-pass-7' }).expect(401);
    expect(res.body.code).toBe('token-expired');
  });

  it('answers a reset request for an unknown e-mail the same way and sends nothing', async () => {
    const res = await request(h.app).post('/api/auth/forgot-password').send({ email: 'ghost@example.org' }).expect(202);
    expect(res.body.detail).toMatch(/If an account uses this e-mail/);
    expect(h.mailer.outbox).toHaveLength(0);
  });
});

/** The same token with one character changed, as a hand-edited or truncated-and-retyped link would be. */
function tamper(token: string): string {
  const i = Math.floor(token.length / 2);
  return `${token.slice(0, i)}${token[i] === 'A' ? 'B' : 'A'}${token.slice(i + 1)}`;
}

describe('refresh, invite and reset tokens', () => {
  it('refuses a refresh token after it has expired and clears the cookie', async () => {
    await signUpFirm(h, 'Firm', 'owner@example.org');
    const signedIn = await request(h.app).post('/api/auth/sign-in').send({ email: 'owner@example.org', password: PASSWORD }).expect(200);
    const cookie = refreshCookie(signedIn);
    // The default refresh lifetime is 30 days.
    h.now.value = new Date(h.now.value.getTime() + 31 * 24 * 3_600_000);
    const res = await request(h.app).post('/api/auth/refresh').set('Cookie', cookie).expect(401);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.code).toBe('token-expired');
    expect(([] as string[]).concat(res.headers['set-cookie'] ?? []).join(';')).toMatch(/hb_refresh=;.*Expires=Thu, 01 Jan 1970/);
  });

  it('refuses a tampered refresh token and leaves the real one working', async () => {
    await signUpFirm(h, 'Firm', 'owner@example.org');
    const signedIn = await request(h.app).post('/api/auth/sign-in').send({ email: 'owner@example.org', password: PASSWORD }).expect(200);
    const cookie = refreshCookie(signedIn);
    const value = decodeURIComponent(cookie.slice('hb_refresh='.length));
    const res = await request(h.app).post('/api/auth/refresh').set('Cookie', `hb_refresh=${encodeURIComponent(tamper(value))}`).expect(401);
    expect(res.body).toMatchObject({ code: 'unauthenticated', status: 401 });
    await request(h.app).post('/api/auth/refresh').set('Cookie', `hb_refresh=${encodeURIComponent(`${value}x`)}`).expect(401);
    await request(h.app).post('/api/auth/refresh').set('Cookie', cookie).expect(200);
  });

  it('refuses an invitation after it has expired and writes nothing', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    await request(h.app).post('/api/people/invite').set(owner.auth).send({ email: 'late@example.org', name: 'Late Person', role: 'operative' }).expect(201);
    const token = inviteTokenFrom(h.mailer, 'late@example.org');
    // Invitations last seven days.
    h.now.value = new Date(h.now.value.getTime() + 8 * 24 * 3_600_000);
    const before = await countRows(h.dataSource);
    const res = await request(h.app).post('/api/auth/accept-invite').send({ token, name: 'Late Person', password: PASSWORD }).expect(401);
    expect(res.body).toMatchObject({ code: 'token-expired', status: 401, type: '/problems/token-expired' });
    expect(await countRows(h.dataSource)).toEqual(before);
    await request(h.app).post('/api/auth/sign-in').send({ email: 'late@example.org', password: PASSWORD }).expect(401);
  });

  it('refuses a tampered invitation and still accepts the real one once', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    await request(h.app).post('/api/people/invite').set(owner.auth).send({ email: 'new@example.org', name: 'New Person', role: 'office' }).expect(201);
    const token = inviteTokenFrom(h.mailer, 'new@example.org');
    const before = await countRows(h.dataSource);
    const res = await request(h.app).post('/api/auth/accept-invite').send({ token: tamper(token), name: 'Intruder', password: PASSWORD }).expect(401);
    expect(res.body.code).toBe('token-invalid');
    expect(await countRows(h.dataSource)).toEqual(before);
    const accepted = await request(h.app).post('/api/auth/accept-invite').send({ token, name: 'New Person', password: PASSWORD }).expect(200);
    expect(accepted.body.role).toBe('office');
    await request(h.app).post('/api/auth/accept-invite').send({ token, name: 'New Person', password: PASSWORD }).expect(401);
  });

  it('refuses a tampered reset link and keeps the password until the real one is used', async () => {
    await signUpFirm(h, 'Firm', 'owner@example.org');
    await request(h.app).post('/api/auth/forgot-password').send({ email: 'owner@example.org' }).expect(202);
    const token = inviteTokenFrom(h.mailer, 'owner@example.org', 'reset-password');
    const res = await request(h.app).post('/api/auth/reset-password').send({ token: tamper(token), password: 'Hijacked-pass-01' }).expect(401);
    expect(res.body.code).toBe('token-invalid');
    await request(h.app).post('/api/auth/sign-in').send({ email: 'owner@example.org', password: 'Hijacked-pass-01' }).expect(401);
    await signIn(h, 'owner@example.org', PASSWORD);
    await request(h.app).post('/api/auth/reset-password').send({ token, password: 'Brand-new-pass-7' }).expect(204);
    await signIn(h, 'owner@example.org', 'Brand-new-pass-7');
  });

  it('does not take one kind of link for another', async () => {
    const owner = await signUpFirm(h, 'Firm', 'owner@example.org');
    await request(h.app).post('/api/people/invite').set(owner.auth).send({ email: 'new@example.org', name: 'New Person', role: 'operative' }).expect(201);
    const invite = inviteTokenFrom(h.mailer, 'new@example.org');
    await request(h.app).post('/api/auth/forgot-password').send({ email: 'owner@example.org' }).expect(202);
    const reset = inviteTokenFrom(h.mailer, 'owner@example.org', 'reset-password');
    expect((await request(h.app).post('/api/auth/reset-password').send({ token: invite, password: 'Brand-new-pass-7' }).expect(401)).body.code).toBe('token-invalid');
    expect((await request(h.app).post('/api/auth/accept-invite').send({ token: reset, name: 'Owner', password: 'Brand-new-pass-7' }).expect(401)).body.code).toBe('token-invalid');
    await request(h.app).post('/api/auth/refresh').set('Cookie', `hb_refresh=${encodeURIComponent(reset)}`).expect(401);
  });
});

function expectRateLimited(res: request.Response): void {
  expect(res.status).toBe(429);
  expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  expect(res.body).toMatchObject({ type: '/problems/rate-limited', title: expect.any(String), status: 429, code: 'rate-limited', detail: expect.any(String) });
}

describe('rate limits', () => {
  const routes: Array<[string, (i: number) => object, number]> = [
    ['/api/auth/sign-in', () => ({ email: 'x@example.org', password: 'wrong-password' }), 401],
    ['/api/auth/forgot-password', () => ({ email: 'x@example.org' }), 202],
    ['/api/auth/reset-password', (i) => ({ token: `not-a-real-reset-token-${i}`, password: 'Brand-new-pass-7' }), 401],
  ];

  it.each(routes)('answers %s with 429 problem JSON once the attempts for one e-mail run out', async (path, body, ordinary) => {
    const limited = await createHarness({ authAttemptsPerWindow: 3 });
    for (let i = 0; i < 3; i += 1) expect((await request(limited.app).post(path).send(body(i))).status).toBe(ordinary);
    expectRateLimited(await request(limited.app).post(path).send(body(3)));
  });

  it.each(routes)('caps %s per address across different e-mails', async (path, body, ordinary) => {
    const limited = await createHarness({ authAttemptsPerWindow: 3, authAttemptsPerAddress: 5 });
    // A fresh e-mail each time, so only the per-address ceiling can stop them.
    const attempt = (i: number) => request(limited.app).post(path).send({ ...body(i), email: `person${i}@example.org` });
    for (let i = 0; i < 5; i += 1) expect((await attempt(i)).status).toBe(ordinary);
    expectRateLimited(await attempt(5));
  });

  it('shares the per-address ceiling between sign-in and the reset steps', async () => {
    const limited = await createHarness({ authAttemptsPerWindow: 100, authAttemptsPerAddress: 4 });
    await request(limited.app).post('/api/auth/sign-in').send({ email: 'a@example.org', password: 'wrong-password' }).expect(401);
    await request(limited.app).post('/api/auth/forgot-password').send({ email: 'b@example.org' }).expect(202);
    await request(limited.app).post('/api/auth/reset-password').send({ token: 'not-a-real-reset-token-0', password: 'Brand-new-pass-7' }).expect(401);
    await request(limited.app).post('/api/auth/sign-in').send({ email: 'c@example.org', password: 'wrong-password' }).expect(401);
    expectRateLimited(await request(limited.app).post('/api/auth/forgot-password').send({ email: 'd@example.org' }));
  });
});
