import { roles, type Role, type SessionDto } from '@hodboard/shared';

/** Who was signed in on this device last: enough to open the app with no signal. Never a password or a token. */
export type SessionProfile = Omit<SessionDto, 'accessToken' | 'expiresIn'>;

const KEY = 'hodboard:last-session';

function isText(value: unknown): value is string {
  return typeof value === 'string' && value.length > 0;
}

/** Anything stored by another version of the app, or edited by hand, is ignored rather than trusted. */
function asProfile(value: unknown): SessionProfile | null {
  if (typeof value !== 'object' || value === null) return null;
  const { user, firm, role, crewIds } = value as Record<string, unknown>;
  const u = user as Record<string, unknown> | null | undefined;
  const f = firm as Record<string, unknown> | null | undefined;
  if (!u || !isText(u.id) || typeof u.name !== 'string' || typeof u.email !== 'string') return null;
  if (!f || !isText(f.id) || typeof f.name !== 'string') return null;
  if (!roles.includes(role as Role)) return null;
  if (!Array.isArray(crewIds) || !crewIds.every(isText)) return null;
  return {
    user: { id: u.id, name: u.name, email: u.email },
    firm: { id: f.id, name: f.name },
    role: role as Role,
    crewIds: [...crewIds],
  };
}

function storage(): Storage | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    // Storage switched off (private mode, a locked-down browser): the app still works, only not offline.
    return null;
  }
}

export function readLastSession(): SessionProfile | null {
  try {
    const raw = storage()?.getItem(KEY);
    return raw ? asProfile(JSON.parse(raw)) : null;
  } catch {
    return null;
  }
}

export function writeLastSession(profile: SessionProfile): void {
  try {
    storage()?.setItem(KEY, JSON.stringify(asProfile(profile)));
  } catch {
    // A full or blocked storage only costs the offline start.
  }
}

export function clearLastSession(): void {
  try {
    storage()?.removeItem(KEY);
  } catch {
    // Nothing stored, nothing to clear.
  }
}
