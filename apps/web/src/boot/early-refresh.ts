// No imports: the page's first script runs this before the app's code has arrived, let alone been evaluated.

const accept = 'application/json, application/problem+json';
/** An early read older than this was sent for a visit that never used it; it is not handed to a later one. */
const EARLY_READ_FRESH_MS = 20_000;

let early: Promise<Response> | null = null;
let earlyRead: { path: string; answer: Promise<Response | null>; at: number } | null = null;

/**
 * Sends the session-renewal request the app would send first (the same request the http client makes), so on a
 * slow signal its round trip overlaps the download of the app's code instead of following it.
 */
export function startEarlyRefresh(): void {
  early ??= fetch('/api/auth/refresh', {
    method: 'POST',
    headers: { Accept: accept, 'Content-Type': 'application/json' },
    credentials: 'include',
    body: '{}',
  });
  // Taken by takeEarlyRefresh(); this stops a failure counting as unhandled meanwhile.
  early.catch(() => undefined);
}

/** The early renewal's answer, once; null when none was sent or it has been taken already. */
export function takeEarlyRefresh(): Promise<Response> | null {
  const taken = early;
  early = null;
  return taken;
}

/**
 * As soon as the early renewal brings a token, asks for the opened screen's first data (an API path such as
 * '/crew-days'), so that read does not wait for the app's code either. Null when the renewal is refused.
 */
export function startEarlyRead(path: string): void {
  if (!early || earlyRead) return;
  const answer = early.then(async (renewal) => {
    if (!renewal.ok) return null;
    // A copy: the app's http client reads the renewal's own body.
    const { accessToken } = (await renewal.clone().json()) as { accessToken?: string };
    if (!accessToken) return null;
    return fetch(`/api${path}`, { headers: { Accept: accept, Authorization: `Bearer ${accessToken}` }, credentials: 'include' });
  });
  answer.catch(() => undefined);
  earlyRead = { path, answer, at: Date.now() };
}

/** The early read of this API path, once and while fresh; null when there is none. */
export function takeEarlyRead(path: string): Promise<Response | null> | null {
  if (!earlyRead || earlyRead.path !== path) return null;
  const taken = earlyRead;
  earlyRead = null;
  return Date.now() - taken.at < EARLY_READ_FRESH_MS ? taken.answer : null;
}
