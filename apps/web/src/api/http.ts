import { errorCodes, type ErrorCode, type Problem, type SessionDto } from '@hodboard/shared';
import { takeEarlyRead, takeEarlyRefresh } from '@/boot/early-refresh';

export type QueryValue = string | number | boolean | null | undefined;

export interface RequestOptions {
  query?: Record<string, QueryValue>;
  body?: unknown;
  /** Auth endpoints answer 401 for bad credentials or links; refreshing there would only mask the real error. */
  skipRefresh?: boolean;
  signal?: AbortSignal;
}

export class ApiError extends Error {
  readonly status: number;
  readonly code: ErrorCode;
  readonly problem: Problem;

  constructor(problem: Problem) {
    super(problem.detail ?? problem.title);
    this.name = 'ApiError';
    this.status = problem.status;
    this.code = problem.code;
    this.problem = problem;
  }
}

export function isApiError(error: unknown, code?: ErrorCode): error is ApiError {
  return error instanceof ApiError && (code === undefined || error.code === code);
}

const knownCodes = new Set<string>(errorCodes);

function codeForStatus(status: number): ErrorCode {
  if (status === 400 || status === 422) return 'validation-failed';
  if (status === 401) return 'unauthenticated';
  if (status === 403) return 'forbidden';
  if (status === 404) return 'not-found';
  if (status === 409) return 'conflict';
  if (status === 413) return 'payload-too-large';
  if (status === 429) return 'rate-limited';
  if (status === 502 || status === 503 || status === 504) return 'service-unavailable';
  return 'internal';
}

/** Turns any non-2xx answer into a Problem, even when a proxy or crash sent HTML or nothing at all. */
export function toProblem(status: number, statusText: string, body: unknown): Problem {
  const fallback: Problem = {
    type: 'about:blank',
    title: statusText || `HTTP ${status}`,
    status,
    code: codeForStatus(status),
  };
  if (typeof body !== 'object' || body === null) return fallback;
  const raw = body as Record<string, unknown>;
  const code = typeof raw.code === 'string' && knownCodes.has(raw.code) ? (raw.code as ErrorCode) : fallback.code;
  const errors = Array.isArray(raw.errors)
    ? raw.errors
        .filter((item): item is { path: unknown; message: unknown } => typeof item === 'object' && item !== null)
        .map((item) => ({ path: String(item.path ?? ''), message: String(item.message ?? '') }))
    : undefined;
  // Extension members (the current state on a stale write, the clashing days to confirm) ride along untouched.
  const { type: _type, title: _title, status: _status, detail: _detail, code: _code, errors: _errors, ...extensions } = raw;
  return {
    ...extensions,
    type: typeof raw.type === 'string' ? raw.type : fallback.type,
    title: typeof raw.title === 'string' ? raw.title : fallback.title,
    status,
    detail: typeof raw.detail === 'string' ? raw.detail : undefined,
    code,
    ...(errors ? { errors } : {}),
  };
}

function networkProblem(): Problem {
  return {
    type: 'about:blank',
    title: 'Network error',
    status: 0,
    detail: 'Hodboard could not reach the server. Check the connection and try again.',
    code: 'service-unavailable',
  };
}

export interface HttpClientOptions {
  baseUrl?: string;
  fetch?: typeof fetch;
  /** A renewal request already sent before the client existed (the page's first script sends one); used once. */
  takeEarlyRefresh?: () => Promise<Response> | null;
  /** A GET the page's first script already sent for this path and query (with the early renewal's token); used once. */
  takeEarlyRead?: (pathAndQuery: string) => Promise<Response | null> | null;
}

type SessionListener = (session: SessionDto | null) => void;

export interface HttpClient {
  request<T>(method: string, path: string, options?: RequestOptions): Promise<T>;
  get<T>(path: string, options?: Omit<RequestOptions, 'body'>): Promise<T>;
  post<T>(path: string, body?: unknown, options?: Omit<RequestOptions, 'body'>): Promise<T>;
  put<T>(path: string, body?: unknown, options?: Omit<RequestOptions, 'body'>): Promise<T>;
  patch<T>(path: string, body?: unknown, options?: Omit<RequestOptions, 'body'>): Promise<T>;
  delete<T = void>(path: string, options?: Omit<RequestOptions, 'body'>): Promise<T>;
  setAccessToken(token: string | null): void;
  getAccessToken(): string | null;
  /** Asks the server for a fresh session from the refresh cookie; concurrent callers share one request. */
  refresh(): Promise<SessionDto | null>;
  /** As refresh(), but with no answer at all (offline) it rejects with a status-0 ApiError instead of resolving null. */
  renew(): Promise<SessionDto | null>;
  /** Called with the new session after every renewal, or with null when the server refused to renew it. */
  onSessionChange(listener: SessionListener): () => void;
}

export function buildQuery(query: Record<string, QueryValue> | undefined): string {
  if (!query) return '';
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `?${text}` : '';
}

export function createHttpClient(options: HttpClientOptions = {}): HttpClient {
  const baseUrl = options.baseUrl ?? '/api';
  const doFetch = options.fetch ?? ((input: RequestInfo | URL, init?: RequestInit) => globalThis.fetch(input, init));
  let accessToken: string | null = null;
  // `undefined`: the server gave no answer, which is not the same as refusing the cookie (null).
  let refreshInFlight: Promise<SessionDto | null | undefined> | null = null;
  const listeners = new Set<SessionListener>();

  function notify(session: SessionDto | null): void {
    for (const listener of listeners) listener(session);
  }

  async function send(method: string, path: string, opts: RequestOptions): Promise<Response> {
    const headers: Record<string, string> = { Accept: 'application/json, application/problem+json' };
    if (opts.body !== undefined) headers['Content-Type'] = 'application/json';
    if (accessToken) headers.Authorization = `Bearer ${accessToken}`;
    try {
      return await doFetch(`${baseUrl}${path}${buildQuery(opts.query)}`, {
        method,
        headers,
        credentials: 'include',
        body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
        signal: opts.signal,
      });
    } catch (error) {
      if (error instanceof DOMException && error.name === 'AbortError') throw error;
      throw new ApiError(networkProblem());
    }
  }

  async function readBody(response: Response): Promise<unknown> {
    if (response.status === 204) return undefined;
    const text = await response.text();
    if (!text) return undefined;
    try {
      return JSON.parse(text) as unknown;
    } catch {
      return text;
    }
  }

  function renewal(): Promise<SessionDto | null | undefined> {
    refreshInFlight ??= (async () => {
      try {
        const early = options.takeEarlyRefresh?.();
        const response = await (early ?? send('POST', '/auth/refresh', {}));
        // A server in trouble has not refused the session; the next try may well renew it.
        if (response.status >= 500) return undefined;
        if (!response.ok) {
          accessToken = null;
          notify(null);
          return null;
        }
        const session = (await readBody(response)) as SessionDto;
        accessToken = session.accessToken;
        notify(session);
        return session;
      } catch {
        return undefined;
      } finally {
        refreshInFlight = null;
      }
    })();
    return refreshInFlight;
  }

  async function refresh(): Promise<SessionDto | null> {
    return (await renewal()) ?? null;
  }

  async function renew(): Promise<SessionDto | null> {
    const session = await renewal();
    if (session === undefined) throw new ApiError(networkProblem());
    return session;
  }

  /** The early answer to this read when it succeeded; anything else is asked again the ordinary way. */
  async function earlyAnswer(pathAndQuery: string): Promise<Response | null> {
    const pending = options.takeEarlyRead?.(pathAndQuery);
    if (!pending) return null;
    try {
      const response = await pending;
      return response?.ok ? response : null;
    } catch {
      return null;
    }
  }

  async function request<T>(method: string, path: string, opts: RequestOptions = {}): Promise<T> {
    // A renewal under way (the page just opened) brings the token this request needs: wait rather than be refused.
    if (refreshInFlight && !opts.skipRefresh) await refreshInFlight;
    let response = (method === 'GET' ? await earlyAnswer(`${path}${buildQuery(opts.query)}`) : null) ?? (await send(method, path, opts));
    if (response.status === 401 && !opts.skipRefresh) {
      const session = await renewal();
      // No answer is a lost signal, not a lost session: keep it and fail like any other offline request.
      if (session === undefined) throw new ApiError(networkProblem());
      if (session) response = await send(method, path, opts);
    }
    const body = await readBody(response);
    if (!response.ok) throw new ApiError(toProblem(response.status, response.statusText, body));
    return body as T;
  }

  return {
    request,
    get: (path, opts) => request('GET', path, opts),
    post: (path, body, opts) => request('POST', path, { ...opts, body }),
    put: (path, body, opts) => request('PUT', path, { ...opts, body }),
    patch: (path, body, opts) => request('PATCH', path, { ...opts, body }),
    delete: (path, opts) => request('DELETE', path, opts),
    setAccessToken(token) {
      accessToken = token;
    },
    getAccessToken: () => accessToken,
    refresh,
    renew,
    onSessionChange(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

export const http = createHttpClient({ takeEarlyRefresh, takeEarlyRead });
