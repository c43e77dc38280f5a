import type { Permission, Role } from '@hodboard/shared';
import { can } from '@hodboard/shared';
import { errors } from '../errors.js';

/** The signed-in person as every service sees them: who, in which firm, with which role. */
export interface Actor {
  userId: string;
  firmId: string;
  membershipId: string;
  role: Role;
  crewIds: string[];
}

export function requirePermission(actor: Actor, permission: Permission): void {
  if (!can(actor.role, permission)) throw errors.forbidden();
}
