// No imports: the page's first script runs this before the app's code has arrived, let alone been evaluated.

let early: Promise<Response> | null = null;

/**
 * Sends the session-renewal request the app would send first (the same request the http client makes), so on a
 * slow signal its round trip overlaps the download of the app's code instead of following it.
 */
export function startEarlyRefresh(): void {
  early ??= fetch('/api/auth/refresh', {
    method: 'POST',
    headers: { Accept: 'application/json, application/problem+json', 'Content-Type': 'application/json' },
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
