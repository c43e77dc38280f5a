import { describe, expect, it } from 'vitest';
import type { RouteLocationNormalized } from 'vue-router';
import type { Role } from '@hodboard/shared';
import { landOnBoard, redirectSignedIn, requirePermission, requireSession, runGuards, safeRedirect, type GuardSession } from './guards';
import { routes } from './routes';

function target(name: string, fullPath?: string, query: Record<string, string> = {}) {
  const record = routes.find((route) => route.name === name);
  if (!record) throw new Error(`no route ${name}`);
  return {
    name,
    fullPath: fullPath ?? record.path,
    meta: record.meta ?? { title: '' },
    query,
  } as Pick<RouteLocationNormalized, 'meta' | 'fullPath' | 'name' | 'query'>;
}

const signedOut: GuardSession = { isSignedIn: false, role: null };
const as = (role: Role): GuardSession => ({ isSignedIn: true, role });

describe('requireSession', () => {
  it('sends a visitor without a session to sign-in, remembering where they were going', () => {
    expect(requireSession(target('crews'), signedOut)).toEqual({ name: 'sign-in', query: { redirect: '/crews' } });
    expect(requireSession(target('home'), signedOut)).toEqual({ name: 'sign-in', query: {} });
  });

  it('lets public pages and signed-in people through', () => {
    expect(requireSession(target('reset-password'), signedOut)).toBeUndefined();
    expect(requireSession(target('crews'), as('operative'))).toBeUndefined();
  });
});

describe('requirePermission', () => {
  it.each([
    ['people', 'operative', false],
    ['people', 'crew-lead', false],
    ['people', 'office', true],
    ['clients', 'operative', false],
    ['sites', 'crew-lead', false],
    ['clients', 'office', true],
    ['firm-settings', 'office', false],
    ['firm-settings', 'owner', true],
    ['crews', 'operative', true],
    ['jobs', 'crew-lead', true],
  ] as const)('%s for %s: allowed=%s (shared permission table)', (name, role, isAllowed) => {
    const result = requirePermission(target(name), as(role));
    if (isAllowed) expect(result).toBeUndefined();
    else expect(result).toEqual({ name: 'not-allowed' });
  });
});

describe('redirectSignedIn', () => {
  it('sends a signed-in person away from sign-in to home or a safe redirect', () => {
    expect(redirectSignedIn(target('sign-in'), as('office'))).toEqual({ name: 'home' });
    expect(redirectSignedIn(target('sign-in', '/sign-in', { redirect: '/sites' }), as('office'))).toBe('/sites');
    expect(redirectSignedIn(target('sign-in', '/sign-in', { redirect: '//evil.test' }), as('office'))).toEqual({ name: 'home' });
  });

  it('leaves sign-in alone for visitors', () => {
    expect(redirectSignedIn(target('sign-in'), signedOut)).toBeUndefined();
  });
});

describe('runGuards', () => {
  it('asks for a session before checking the role', () => {
    expect(runGuards(target('people'), signedOut)).toEqual({ name: 'sign-in', query: { redirect: '/people' } });
    expect(runGuards(target('people'), as('operative'))).toEqual({ name: 'not-allowed' });
    expect(runGuards(target('people'), as('owner'))).toBeUndefined();
  });
});

describe('safeRedirect', () => {
  it.each([
    ['/clients?page=2', '/clients?page=2'],
    ['https://elsewhere.test/', undefined],
    ['//elsewhere.test', undefined],
    [undefined, undefined],
  ])('accepts only same-app paths: %s', (input, expected) => {
    expect(safeRedirect(input)).toBe(expected);
  });
});

describe('landOnBoard', () => {
  const arriving = { matched: [], meta: { title: '' } } as unknown as Pick<RouteLocationNormalized, 'matched' | 'meta'>;
  const fromSignIn = { matched: [{}], meta: { title: 'Sign in', isGuestOnly: true } } as unknown as Pick<RouteLocationNormalized, 'matched' | 'meta'>;
  const fromJobs = { matched: [{}], meta: { title: 'Jobs' } } as unknown as Pick<RouteLocationNormalized, 'matched' | 'meta'>;

  it('opens the board for the office when it arrives or has just signed in', () => {
    expect(landOnBoard(arriving, as('office'))).toEqual({ name: 'board' });
    expect(landOnBoard(fromSignIn, as('owner'))).toEqual({ name: 'board' });
  });

  it('keeps the overview for crews, and for the office when it picks the overview from the navigation', () => {
    expect(landOnBoard(fromSignIn, as('crew-lead'))).toBeUndefined();
    expect(landOnBoard(arriving, as('operative'))).toBeUndefined();
    expect(landOnBoard(fromJobs, as('office'))).toBeUndefined();
  });
});
