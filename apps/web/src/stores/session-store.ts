import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import {
  can,
  type AcceptInviteInput,
  type Permission,
  type SessionDto,
  type SignInInput,
  type SignUpInput,
} from '@hodboard/shared';
import * as authApi from '@/api/auth';
import { http, isApiError } from '@/api/http';
import { clearLastSession, readLastSession, writeLastSession, type SessionProfile } from '@/offline/last-session';

export const useSessionStore = defineStore('session', () => {
  const profile = shallowRef<SessionProfile | null>(null);
  const isLoading = ref(false);
  const error = shallowRef<unknown>(null);
  const isRestored = ref(false);
  /**
   * The profile came from this device, not (yet) from the server: the server could not be reached, or is still
   * answering. Nothing can be sent until it is confirmed; what the crew saw last can still be shown.
   */
  const isFromDevice = ref(false);
  /** The last renewal got no answer at all: there is no signal, or the server is down. */
  const isUnreachable = ref(false);
  let restoring: Promise<void> | null = null;
  let confirming: Promise<void> | null = null;
  /** The page load's first check of the session with the server; settled once it has answered (or cannot be reached). */
  let firstAnswer: Promise<void> = Promise.resolve();

  const user = computed(() => profile.value?.user ?? null);
  const firm = computed(() => profile.value?.firm ?? null);
  const role = computed(() => profile.value?.role ?? null);
  const crewIds = computed(() => profile.value?.crewIds ?? []);
  const isSignedIn = computed(() => profile.value !== null);

  function applySession(session: SessionDto | null): void {
    isFromDevice.value = false;
    isUnreachable.value = false;
    if (!session) {
      const hadSession = profile.value !== null;
      http.setAccessToken(null);
      profile.value = null;
      clearLastSession();
      // What the crew saw is theirs: it does not stay on a phone after their session ends.
      if (hadSession) void import('@/offline/idb').then((idb) => idb.clearCrewCopies()).catch(() => undefined);
      return;
    }
    http.setAccessToken(session.accessToken);
    const { accessToken: _token, expiresIn: _expires, ...rest } = session;
    profile.value = rest;
    writeLastSession(rest);
  }

  // A background refresh can change the role (an owner demoted someone) or end the session entirely.
  http.onSessionChange(applySession);

  async function run<T>(task: () => Promise<T>): Promise<T> {
    isLoading.value = true;
    error.value = null;
    try {
      return await task();
    } catch (caught) {
      error.value = caught;
      throw caught;
    } finally {
      isLoading.value = false;
    }
  }

  async function signIn(input: SignInInput): Promise<void> {
    applySession(await run(() => authApi.signIn(input)));
  }

  async function signUp(input: SignUpInput): Promise<void> {
    applySession(await run(() => authApi.signUp(input)));
  }

  async function acceptInvite(input: AcceptInviteInput): Promise<void> {
    applySession(await run(() => authApi.acceptInvite(input)));
  }

  /**
   * Asks the server for the session behind the refresh cookie. A refusal ends the session; no answer keeps
   * the profile this device last saw (if any), to be confirmed when the signal is back.
   */
  function confirm(): Promise<void> {
    confirming ??= (async () => {
      try {
        applySession(await authApi.refreshSession());
      } catch (caught) {
        if (isApiError(caught) && caught.status === 0 && profile.value) {
          isUnreachable.value = true;
        } else {
          applySession(null);
        }
      } finally {
        confirming = null;
      }
    })();
    return confirming;
  }

  /**
   * Restores the session once per page load; later calls wait for the first. With a profile saved on this
   * device the app opens at once on it while the server confirms in the background (a refusal still signs
   * out); a first visit waits for the server's answer.
   */
  function restore(): Promise<void> {
    restoring ??= (async () => {
      const saved = readLastSession();
      const confirmed = confirm();
      firstAnswer = confirmed;
      if (saved && !profile.value) {
        profile.value = saved;
        isFromDevice.value = true;
      } else {
        await confirmed;
      }
      isRestored.value = true;
    })();
    return restoring;
  }

  /**
   * Restores the session and waits for the server's answer even when a saved profile opened the app at once: for a
   * page only a signed-out visitor sees (an e-mailed invitation or reset link), which a stale profile would send away.
   */
  async function restoreConfirmed(): Promise<void> {
    await restore();
    await firstAnswer;
  }

  if (typeof window !== 'undefined') {
    // Back in signal after opening offline: confirm now, so queued work and live updates can go out.
    window.addEventListener('online', () => {
      if (isFromDevice.value) void confirm();
    });
  }

  async function signOut(): Promise<void> {
    try {
      await authApi.signOut();
    } catch {
      // The local session ends regardless; a stale cookie is revoked server-side when it next fails to refresh.
    } finally {
      applySession(null);
      error.value = null;
    }
  }

  function hasPermission(permission: Permission): boolean {
    return role.value !== null && can(role.value, permission);
  }

  function renameFirm(name: string): void {
    if (profile.value) profile.value = { ...profile.value, firm: { ...profile.value.firm, name } };
  }

  return {
    user,
    firm,
    role,
    crewIds,
    isSignedIn,
    isLoading,
    isRestored,
    isFromDevice,
    isUnreachable,
    error,
    signIn,
    signUp,
    acceptInvite,
    restore,
    restoreConfirmed,
    signOut,
    hasPermission,
    renameFirm,
  };
});
