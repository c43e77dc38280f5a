import type { RouteLocationNormalized, RouteLocationRaw } from 'vue-router';
import { can, type Role } from '@hodboard/shared';

/** The slice of the session a guard needs; keeps guards testable without Pinia or a router. */
export interface GuardSession {
  isSignedIn: boolean;
  role: Role | null;
}

type GuardResult = RouteLocationRaw | undefined;
type GuardTarget = Pick<RouteLocationNormalized, 'meta' | 'fullPath' | 'name' | 'query'>;

export function requireSession(to: GuardTarget, session: GuardSession): GuardResult {
  if (to.meta.isPublic || session.isSignedIn) return undefined;
  const redirect = to.fullPath !== '/' ? to.fullPath : undefined;
  return { name: 'sign-in', query: redirect ? { redirect } : {} };
}

export function requirePermission(to: GuardTarget, session: GuardSession): GuardResult {
  const permission = to.meta.permission;
  if (!permission) return undefined;
  if (session.role && can(session.role, permission)) return undefined;
  return { name: 'not-allowed' };
}

/** Only same-app paths are followed, so a crafted ?redirect= cannot send people to another site. */
export function safeRedirect(value: unknown): string | undefined {
  if (typeof value !== 'string') return undefined;
  return value.startsWith('/') && !value.startsWith('//') ? value : undefined;
}

export function redirectSignedIn(to: GuardTarget, session: GuardSession): GuardResult {
  if (!to.meta.isGuestOnly || !session.isSignedIn) return undefined;
  return safeRedirect(to.query.redirect) ?? { name: 'home' };
}

export const guards = [requireSession, requirePermission, redirectSignedIn] as const;

export function runGuards(to: GuardTarget, session: GuardSession): GuardResult {
  for (const guard of guards) {
    const result = guard(to, session);
    if (result !== undefined) return result;
  }
  return undefined;
}

/**
 * The office works from the board, so arriving in the app (a fresh visit to /, or just signed in) opens it;
 * the overview stays one click away in the navigation.
 */
export function landOnBoard(from: Pick<RouteLocationNormalized, 'matched' | 'meta'>, session: GuardSession): GuardResult {
  const isArrival = from.matched.length === 0 || Boolean(from.meta.isGuestOnly);
  if (!isArrival || !session.role || !can(session.role, 'jobs:manage')) return undefined;
  return { name: 'board' };
}
