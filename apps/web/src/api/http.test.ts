import { describe, expect, it, vi } from 'vitest';
import type { SessionDto } from '@hodboard/shared';
import { ApiError, buildQuery, createHttpClient, toProblem } from './http';

function json(status: number, body: unknown, contentType = 'application/json'): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), { status, headers: { 'Content-Type': contentType } });
}

const session: SessionDto = {
  accessToken: 'fresh-token',
  expiresIn: 900,
  user: { id: 'u1', name: 'Ida Marsh', email: 'ida@example.test' },
  firm: { id: 'f1', name: 'Marsh & Lyle Builders' },
  role: 'office',
  crewIds: [],
};

type Call = { url: string; init: RequestInit };

function fakeFetch(responses: Array<(call: Call) => Response>) {
  const calls: Call[] = [];
  const fetchImpl = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const call = { url: String(input), init: init ?? {} };
    calls.push(call);
    const next = responses.shift();
    if (!next) throw new Error(`unexpected request ${call.url}`);
    return next(call);
  });
  return { calls, fetchImpl };
}

function authHeader(call: Call | undefined): string | undefined {
  return (call?.init.headers as Record<string, string> | undefined)?.Authorization;
}

describe('createHttpClient', () => {
  it('sends credentials, JSON and the bearer token under the /api base', async () => {
    const { calls, fetchImpl } = fakeFetch([() => json(201, { id: 'c1' })]);
    const client = createHttpClient({ fetch: fetchImpl });
    client.setAccessToken('abc');
    const result = await client.post<{ id: string }>('/crews', { name: 'North' }, { query: { page: 2, q: '' } });

    expect(result).toEqual({ id: 'c1' });
    expect(calls[0]?.url).toBe('/api/crews?page=2');
    expect(calls[0]?.init.credentials).toBe('include');
    expect(calls[0]?.init.body).toBe(JSON.stringify({ name: 'North' }));
    expect(authHeader(calls[0])).toBe('Bearer abc');
  });

  it('refreshes once on 401 and retries the request with the new token', async () => {
    const { calls, fetchImpl } = fakeFetch([
      () => json(401, { type: 'about:blank', title: 'Sign-in needed', status: 401, code: 'token-expired' }),
      () => json(200, session),
      () => json(200, [{ id: 'm1' }]),
    ]);
    const client = createHttpClient({ fetch: fetchImpl });
    const listener = vi.fn();
    client.onSessionChange(listener);
    client.setAccessToken('stale-token');

    const result = await client.get('/people');

    expect(result).toEqual([{ id: 'm1' }]);
    expect(calls.map((call) => call.url)).toEqual(['/api/people', '/api/auth/refresh', '/api/people']);
    expect(authHeader(calls[2])).toBe('Bearer fresh-token');
    expect(listener).toHaveBeenCalledWith(session);
  });

  it('does not refresh a second time when the retried request is also refused', async () => {
    const unauthorised = () => json(401, { type: 'about:blank', title: 'Sign-in needed', status: 401, code: 'unauthenticated' });
    const { calls, fetchImpl } = fakeFetch([unauthorised, () => json(200, session), unauthorised]);
    const client = createHttpClient({ fetch: fetchImpl });

    await expect(client.get('/firm')).rejects.toMatchObject({ status: 401, code: 'unauthenticated' });
    expect(calls).toHaveLength(3);
  });

  it('reports a lost session and throws the original error when refresh fails', async () => {
    const { calls, fetchImpl } = fakeFetch([
      () => json(401, { type: 'about:blank', title: 'Sign-in needed', status: 401, code: 'token-expired' }),
      () => json(401, { type: 'about:blank', title: 'Sign-in needed', status: 401, code: 'token-invalid' }),
    ]);
    const client = createHttpClient({ fetch: fetchImpl });
    const listener = vi.fn();
    client.onSessionChange(listener);
    client.setAccessToken('stale-token');

    await expect(client.get('/crews')).rejects.toMatchObject({ code: 'token-expired' });
    expect(calls).toHaveLength(2);
    expect(listener).toHaveBeenCalledWith(null);
    expect(client.getAccessToken()).toBeNull();
  });

  it('shares one refresh between requests that fail together', async () => {
    const expired = () => json(401, { type: 'about:blank', title: 'x', status: 401, code: 'token-expired' });
    const { calls, fetchImpl } = fakeFetch([expired, expired, () => json(200, session), () => json(200, 1), () => json(200, 2)]);
    const client = createHttpClient({ fetch: fetchImpl });

    const results = await Promise.all([client.get('/a'), client.get('/b')]);

    expect(results.sort()).toEqual([1, 2]);
    expect(calls.filter((call) => call.url === '/api/auth/refresh')).toHaveLength(1);
  });

  it('leaves auth endpoints alone on 401 so bad credentials surface as they are', async () => {
    const { calls, fetchImpl } = fakeFetch([
      () => json(401, { type: 'about:blank', title: 'No', status: 401, code: 'bad-credentials', detail: 'Wrong password' }),
    ]);
    const client = createHttpClient({ fetch: fetchImpl });

    const error = await client.post('/auth/sign-in', { email: 'a@b.test', password: 'x' }, { skipRefresh: true }).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect((error as ApiError).code).toBe('bad-credentials');
    expect((error as ApiError).message).toBe('Wrong password');
    expect(calls).toHaveLength(1);
  });

  it('maps a validation problem with its field errors onto ApiError', async () => {
    const problem = {
      type: 'https://hodboard.test/problems/validation-failed',
      title: 'Some details need fixing',
      status: 400,
      detail: 'The request has invalid fields.',
      code: 'validation-failed',
      errors: [{ path: 'postcode', message: 'Enter a UK postcode like LS6 2AB' }],
    };
    const { fetchImpl } = fakeFetch([() => json(400, problem, 'application/problem+json')]);
    const client = createHttpClient({ fetch: fetchImpl });

    const error = (await client.post('/sites', {}).catch((e: unknown) => e)) as ApiError;

    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(400);
    expect(error.code).toBe('validation-failed');
    expect(error.problem.errors).toEqual(problem.errors);
  });

  it('returns undefined for 204 answers', async () => {
    const { fetchImpl } = fakeFetch([() => new Response(null, { status: 204 })]);
    const client = createHttpClient({ fetch: fetchImpl });
    await expect(client.delete('/crews/1')).resolves.toBeUndefined();
  });

  it('turns a network failure into a service-unavailable ApiError', async () => {
    const client = createHttpClient({ fetch: vi.fn().mockRejectedValue(new TypeError('Failed to fetch')) });
    await expect(client.get('/jobs')).rejects.toMatchObject({ status: 0, code: 'service-unavailable' });
  });
});

describe('toProblem', () => {
  it.each([
    [502, 'Bad Gateway', '<html>proxy</html>', 'service-unavailable'],
    [404, 'Not Found', undefined, 'not-found'],
    [409, 'Conflict', { title: 'x', code: 'made-up-code' }, 'conflict'],
    [500, '', 'oops', 'internal'],
  ] as const)('derives a code from status %i when the body is not a known problem', (status, text, body, code) => {
    expect(toProblem(status, text, body).code).toBe(code);
  });

  it('keeps the server title and detail', () => {
    expect(toProblem(409, 'Conflict', { title: 'Changed', detail: 'Crew was changed', code: 'stale-version' })).toMatchObject({
      title: 'Changed',
      detail: 'Crew was changed',
      code: 'stale-version',
      status: 409,
    });
  });

  it('keeps extension members such as the current state of a stale record', () => {
    const current = { id: 'a1', version: 3 };
    expect(toProblem(409, 'Conflict', { title: 'Changed', code: 'stale-version', current, changedBy: 'Ruth' })).toMatchObject({
      code: 'stale-version',
      current,
      changedBy: 'Ruth',
    });
  });
});

describe('buildQuery', () => {
  it('drops empty values and encodes the rest', () => {
    expect(buildQuery({ q: 'Smith & Co', page: 1, status: undefined, clientId: null, sort: '' })).toBe('?q=Smith+%26+Co&page=1');
    expect(buildQuery({})).toBe('');
  });
});

describe('renewing the session with no signal', () => {
  const offline = (): Response => {
    throw new TypeError('Failed to fetch');
  };
  const expired = () => json(401, { type: 'about:blank', title: 'x', status: 401, code: 'token-expired' });

  it('tells no answer apart from a refusal: renew() rejects with status 0, refresh() resolves null', async () => {
    const { fetchImpl } = fakeFetch([offline, offline, () => json(401, { type: 'about:blank', title: 'x', status: 401, code: 'token-invalid' })]);
    const client = createHttpClient({ fetch: fetchImpl });

    await expect(client.renew()).rejects.toMatchObject({ status: 0, code: 'service-unavailable' });
    await expect(client.refresh()).resolves.toBeNull();
    await expect(client.renew()).resolves.toBeNull();
  });

  it('counts a server error on renewal as no answer, not as a refused session', async () => {
    const { fetchImpl } = fakeFetch([() => json(503, { type: 'about:blank', title: 'Down', status: 503, code: 'service-unavailable' })]);
    const client = createHttpClient({ fetch: fetchImpl });
    client.setAccessToken('kept');

    await expect(client.renew()).rejects.toMatchObject({ status: 0 });
    expect(client.getAccessToken()).toBe('kept');
  });

  it('keeps the session when the signal drops between a 401 and its renewal', async () => {
    const { fetchImpl } = fakeFetch([expired, offline]);
    const client = createHttpClient({ fetch: fetchImpl });
    const listener = vi.fn();
    client.onSessionChange(listener);

    await expect(client.get('/crew-days')).rejects.toMatchObject({ status: 0 });
    expect(listener).not.toHaveBeenCalled();
  });

  it('sends a request made while a renewal is under way with the renewed token', async () => {
    let answer: (response: Response) => void = () => undefined;
    const renewal = new Promise<Response>((resolve) => {
      answer = resolve;
    });
    const { calls, fetchImpl } = fakeFetch([() => renewal as unknown as Response, () => json(200, { ok: true })]);
    const client = createHttpClient({ fetch: fetchImpl });

    const renewing = client.renew();
    const reading = client.get('/crew-days');
    answer(json(200, session));
    await renewing;

    await expect(reading).resolves.toEqual({ ok: true });
    expect(calls.map((call) => call.url)).toEqual(['/api/auth/refresh', '/api/crew-days']);
    expect(authHeader(calls[1])).toBe('Bearer fresh-token');
  });

  it('takes the renewal the page sent before the client existed, once, and asks the server itself after that', async () => {
    const early = [Promise.resolve(json(200, session))];
    const { calls, fetchImpl } = fakeFetch([() => json(200, { ...session, accessToken: 'second-token' }), () => json(200, { ok: true })]);
    const client = createHttpClient({ fetch: fetchImpl, takeEarlyRefresh: () => early.shift() ?? null });

    await expect(client.renew()).resolves.toMatchObject({ accessToken: 'fresh-token' });
    expect(calls).toHaveLength(0);
    await expect(client.renew()).resolves.toMatchObject({ accessToken: 'second-token' });
    await client.get('/crew-days');
    expect(calls.map((call) => call.url)).toEqual(['/api/auth/refresh', '/api/crew-days']);
    expect(authHeader(calls[1])).toBe('Bearer second-token');
  });

  it('takes a read the page sent before the client existed once, and asks the server again when that read failed', async () => {
    const early: Record<string, Promise<Response | null>> = {
      '/crew-days': Promise.resolve(json(200, { days: ['early'] })),
      '/board?from=2026-01-05': Promise.resolve(json(401, { code: 'unauthenticated' })),
    };
    const { calls, fetchImpl } = fakeFetch([() => json(200, { days: ['asked'] }), () => json(200, { days: ['again'] })]);
    const client = createHttpClient({
      fetch: fetchImpl,
      takeEarlyRead: (pathAndQuery) => {
        const taken = early[pathAndQuery] ?? null;
        delete early[pathAndQuery];
        return taken;
      },
    });

    await expect(client.get('/crew-days')).resolves.toEqual({ days: ['early'] });
    expect(calls).toHaveLength(0);
    await expect(client.get('/board', { query: { from: '2026-01-05' } })).resolves.toEqual({ days: ['asked'] });
    await expect(client.get('/crew-days')).resolves.toEqual({ days: ['again'] });
    expect(calls.map((call) => call.url)).toEqual(['/api/board?from=2026-01-05', '/api/crew-days']);
  });
});
