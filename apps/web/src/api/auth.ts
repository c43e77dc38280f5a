import type {
  AcceptInviteInput,
  ForgotPasswordInput,
  ResetPasswordInput,
  SessionDto,
  SignInInput,
  SignUpInput,
} from '@hodboard/shared';
import { http } from './http';

const noRefresh = { skipRefresh: true } as const;

export function signUp(input: SignUpInput): Promise<SessionDto> {
  return http.post<SessionDto>('/auth/sign-up', input, noRefresh);
}

export function signIn(input: SignInInput): Promise<SessionDto> {
  return http.post<SessionDto>('/auth/sign-in', input, noRefresh);
}

let early: Promise<SessionDto | null> | null = null;

/**
 * Starts renewing the session from the refresh cookie before the rest of the app has loaded, so the round trip
 * overlaps the start-up work; the next refreshSession() takes this answer instead of asking again.
 */
export function startSessionRenewal(): void {
  early ??= http.renew();
  // Read later by refreshSession(); this stops an early failure counting as unhandled meanwhile.
  early.catch(() => undefined);
}

/** The session from the refresh cookie: null when the server refuses it, a status-0 ApiError when it cannot be reached. */
export function refreshSession(): Promise<SessionDto | null> {
  const pending = early ?? http.renew();
  early = null;
  return pending;
}

export function signOut(): Promise<void> {
  return http.post<void>('/auth/sign-out', undefined, noRefresh);
}

export function forgotPassword(input: ForgotPasswordInput): Promise<void> {
  return http.post<void>('/auth/forgot-password', input, noRefresh);
}

export function resetPassword(input: ResetPasswordInput): Promise<void> {
  return http.post<void>('/auth/reset-password', input, noRefresh);
}

export function acceptInvite(input: AcceptInviteInput): Promise<SessionDto> {
  return http.post<SessionDto>('/auth/accept-invite', input, noRefresh);
}
