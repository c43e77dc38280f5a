export const roles = ['owner', 'office', 'crew-lead', 'operative'] as const;
export type Role = (typeof roles)[number];

export const roleLabels: Record<Role, string> = {
  owner: 'Owner',
  office: 'Office',
  'crew-lead': 'Crew lead',
  operative: 'Operative',
};

/**
 * What each role may do. The API enforces it; the web app uses the same table to hide actions.
 * Crew-scoped permissions (a lead's own crew) are narrowed further by the services.
 */
export const permissions = {
  'firm:manage': ['owner'],
  'people:manage': ['owner', 'office'],
  'people:read': ['owner', 'office'],
  'crews:manage': ['owner', 'office'],
  'crews:read': ['owner', 'office', 'crew-lead', 'operative'],
  'clients:manage': ['owner', 'office'],
  'clients:read': ['owner', 'office'],
  'jobs:manage': ['owner', 'office'],
  'jobs:read': ['owner', 'office', 'crew-lead', 'operative'],
  'audit:read': ['owner', 'office'],
  'quotes:manage': ['owner', 'office'],
  'costing:manage': ['owner'],
  'access:manage': ['owner', 'office'],
  'access:read': ['owner', 'office', 'crew-lead', 'operative'],
  'inspections:record': ['owner', 'office', 'crew-lead'],
  'holds:raise': ['owner', 'office', 'crew-lead'],
  'holds:replan': ['owner', 'office'],
  /** The crew's phone home: the people who work on site. */
  'crew-home:use': ['crew-lead', 'operative'],
  'site-notes:add': ['owner', 'office', 'crew-lead', 'operative'],
  'photos:add': ['owner', 'office', 'crew-lead', 'operative'],
} as const satisfies Record<string, readonly Role[]>;
export type Permission = keyof typeof permissions;

export function can(role: Role, permission: Permission): boolean {
  return (permissions[permission] as readonly Role[]).includes(role);
}

/** Roles an inviter may hand out: only an owner can make another owner. */
export function assignableRoles(inviter: Role): Role[] {
  if (inviter === 'owner') return [...roles];
  if (inviter === 'office') return ['office', 'crew-lead', 'operative'];
  return [];
}
