import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createPinia, setActivePinia } from 'pinia';
import type { Problem, SessionDto } from '@hodboard/shared';
import { ApiError, http } from '@/api/http';
import * as authApi from '@/api/auth';
import { useSessionStore } from './session-store';

vi.mock('@/api/auth', () => ({
  signIn: vi.fn(),
  signUp: vi.fn(),
  acceptInvite: vi.fn(),
  refreshSession: vi.fn(),
  signOut: vi.fn(),
}));

const session: SessionDto = {
  accessToken: 'token-1',
  expiresIn: 900,
  user: { id: 'u1', name: 'Tamsin Hale', email: 'tamsin@example.test' },
  firm: { id: 'f1', name: 'Hale & Brook Masonry' },
  role: 'crew-lead',
  crewIds: ['c1'],
};

const badCredentials: Problem = { type: 'about:blank', title: 'No', status: 401, code: 'bad-credentials' };

describe('useSessionStore', () => {
  beforeEach(() => {
    setActivePinia(createPinia());
    http.setAccessToken(null);
    vi.mocked(authApi.signIn).mockReset();
    vi.mocked(authApi.refreshSession).mockReset();
    vi.mocked(authApi.signOut).mockReset();
    localStorage.clear();
  });

  it('signs in, keeps the token in the HTTP client and exposes user, firm and role', async () => {
    vi.mocked(authApi.signIn).mockResolvedValue(session);
    const store = useSessionStore();

    const pending = store.signIn({ email: 'tamsin@example.test', password: 'long-enough-1' });
    expect(store.isLoading).toBe(true);
    await pending;

    expect(store.isLoading).toBe(false);
    expect(store.isSignedIn).toBe(true);
    expect(store.user?.name).toBe('Tamsin Hale');
    expect(store.firm?.name).toBe('Hale & Brook Masonry');
    expect(store.role).toBe('crew-lead');
    expect(store.crewIds).toEqual(['c1']);
    expect(http.getAccessToken()).toBe('token-1');
  });

  it('records the error and stays signed out when sign-in is refused', async () => {
    vi.mocked(authApi.signIn).mockRejectedValue(new ApiError(badCredentials));
    const store = useSessionStore();

    await expect(store.signIn({ email: 'x@example.test', password: 'wrong' })).rejects.toBeInstanceOf(ApiError);

    expect(store.isSignedIn).toBe(false);
    expect(store.isLoading).toBe(false);
    expect(store.error).toBeInstanceOf(ApiError);
  });

  it('restores a session from the refresh cookie only once per page load', async () => {
    vi.mocked(authApi.refreshSession).mockResolvedValue(session);
    const store = useSessionStore();

    await Promise.all([store.restore(), store.restore()]);
    await store.restore();

    expect(authApi.refreshSession).toHaveBeenCalledTimes(1);
    expect(store.isRestored).toBe(true);
    expect(store.isSignedIn).toBe(true);
  });

  it('finishes restoring signed out when there is no session to restore', async () => {
    vi.mocked(authApi.refreshSession).mockResolvedValue(null);
    const store = useSessionStore();
    await store.restore();
    expect(store.isRestored).toBe(true);
    expect(store.isSignedIn).toBe(false);
  });

  it('signs out locally even when the server cannot be reached', async () => {
    vi.mocked(authApi.signIn).mockResolvedValue(session);
    vi.mocked(authApi.signOut).mockRejectedValue(new Error('offline'));
    const store = useSessionStore();
    await store.signIn({ email: 'tamsin@example.test', password: 'long-enough-1' });

    await store.signOut();

    expect(store.isSignedIn).toBe(false);
    expect(http.getAccessToken()).toBeNull();
  });

  it('answers permission questions from the shared role table', async () => {
    vi.mocked(authApi.signIn).mockResolvedValue(session);
    const store = useSessionStore();
    expect(store.hasPermission('jobs:read')).toBe(false);
    await store.signIn({ email: 'tamsin@example.test', password: 'long-enough-1' });
    expect(store.hasPermission('jobs:read')).toBe(true);
    expect(store.hasPermission('people:manage')).toBe(false);
  });

  it('follows a background refresh that changed the role or ended the session', async () => {
    vi.mocked(authApi.signIn).mockResolvedValue(session);
    const fetchSpy = vi
      .spyOn(globalThis, 'fetch')
      .mockResolvedValueOnce(new Response(JSON.stringify({ status: 401, code: 'token-expired', title: 'x' }), { status: 401 }))
      .mockResolvedValueOnce(new Response(JSON.stringify({ ...session, role: 'operative', accessToken: 'token-2' }), { status: 200 }))
      .mockResolvedValueOnce(new Response(JSON.stringify([]), { status: 200 }))
      .mockResolvedValueOnce(new Response(JSON.stringify({ status: 401, code: 'token-expired', title: 'x' }), { status: 401 }))
      .mockResolvedValueOnce(new Response(JSON.stringify({ status: 401, code: 'token-invalid', title: 'x' }), { status: 401 }));
    const store = useSessionStore();
    await store.signIn({ email: 'tamsin@example.test', password: 'long-enough-1' });

    await http.get('/jobs');
    expect(store.role).toBe('operative');
    expect(http.getAccessToken()).toBe('token-2');

    await expect(http.get('/jobs')).rejects.toBeInstanceOf(ApiError);
    expect(store.isSignedIn).toBe(false);
    expect(fetchSpy).toHaveBeenCalledTimes(5);
  });

  describe('opening on a phone with no signal', () => {
    const noAnswer = (): ApiError =>
      new ApiError({ type: 'about:blank', title: 'Network error', status: 0, code: 'service-unavailable' });
    const refused = (): ApiError => new ApiError({ type: 'about:blank', title: 'No', status: 401, code: 'token-invalid' });

    it('keeps who signed in on this device, without the token', async () => {
      vi.mocked(authApi.signIn).mockResolvedValue(session);
      await useSessionStore().signIn({ email: 'tamsin@example.test', password: 'long-enough-1' });

      const saved = localStorage.getItem('hodboard:last-session') ?? '';
      expect(JSON.parse(saved)).toEqual({ user: session.user, firm: session.firm, role: 'crew-lead', crewIds: ['c1'] });
      expect(saved).not.toContain('token-1');
    });

    it('opens on the saved profile when the server cannot be reached, and says so', async () => {
      vi.mocked(authApi.signIn).mockResolvedValue(session);
      await useSessionStore().signIn({ email: 'tamsin@example.test', password: 'long-enough-1' });
      setActivePinia(createPinia());
      http.setAccessToken(null);
      vi.mocked(authApi.refreshSession).mockRejectedValue(noAnswer());

      const store = useSessionStore();
      await store.restore();
      await vi.waitFor(() => expect(store.isUnreachable).toBe(true));

      expect(store.isSignedIn).toBe(true);
      expect(store.isFromDevice).toBe(true);
      expect(store.user?.name).toBe('Tamsin Hale');
      expect(store.role).toBe('crew-lead');
      expect(http.getAccessToken()).toBeNull();
    });

    it('does not wait for the server to open on a saved profile, and takes its answer when it comes', async () => {
      localStorage.setItem('hodboard:last-session', JSON.stringify({ user: session.user, firm: session.firm, role: 'crew-lead', crewIds: ['c1'] }));
      let answer: (value: SessionDto) => void = () => undefined;
      vi.mocked(authApi.refreshSession).mockReturnValue(new Promise((resolve) => {
        answer = resolve;
      }));

      const store = useSessionStore();
      await store.restore();
      expect(store.isSignedIn).toBe(true);
      expect(store.isFromDevice).toBe(true);

      answer({ ...session, role: 'operative', accessToken: 'token-9' });
      await vi.waitFor(() => expect(store.isFromDevice).toBe(false));
      expect(store.role).toBe('operative');
      expect(http.getAccessToken()).toBe('token-9');
    });

    it('signs out and forgets the saved profile when the server refuses the session', async () => {
      localStorage.setItem('hodboard:last-session', JSON.stringify({ user: session.user, firm: session.firm, role: 'crew-lead', crewIds: ['c1'] }));
      vi.mocked(authApi.refreshSession).mockRejectedValue(refused());

      const store = useSessionStore();
      await store.restore();
      await vi.waitFor(() => expect(store.isSignedIn).toBe(false));
      expect(localStorage.getItem('hodboard:last-session')).toBeNull();
    });

    it('for a page only signed-out visitors see, waits for the server to refuse a stale saved profile', async () => {
      localStorage.setItem('hodboard:last-session', JSON.stringify({ user: session.user, firm: session.firm, role: 'operative', crewIds: [] }));
      let refuse: (error: ApiError) => void = () => undefined;
      vi.mocked(authApi.refreshSession).mockReturnValue(new Promise((_resolve, reject) => {
        refuse = reject;
      }));

      const store = useSessionStore();
      await store.restore();
      expect(store.isSignedIn).toBe(true);
      const confirmed = store.restoreConfirmed();
      refuse(refused());
      await confirmed;
      expect(store.isSignedIn).toBe(false);
      expect(store.isFromDevice).toBe(false);
    });

    it('stays signed out offline when nothing was saved on this device', async () => {
      vi.mocked(authApi.refreshSession).mockRejectedValue(noAnswer());
      const store = useSessionStore();
      await store.restore();
      expect(store.isSignedIn).toBe(false);
      expect(store.isRestored).toBe(true);
    });

    it('ignores a saved profile it cannot read', async () => {
      localStorage.setItem('hodboard:last-session', JSON.stringify({ user: { id: 'u1' }, role: 'admin' }));
      vi.mocked(authApi.refreshSession).mockRejectedValue(noAnswer());
      const store = useSessionStore();
      await store.restore();
      expect(store.isSignedIn).toBe(false);
    });

    it('forgets the saved profile on sign-out', async () => {
      vi.mocked(authApi.signIn).mockResolvedValue(session);
      vi.mocked(authApi.signOut).mockResolvedValue(undefined);
      const store = useSessionStore();
      await store.signIn({ email: 'tamsin@example.test', password: 'long-enough-1' });
      await store.signOut();
      expect(localStorage.getItem('hodboard:last-session')).toBeNull();
    });
  });
});
