export const activities = [
  'scaffold-erection',
  'work-at-height',
  'mewp',
  'tower',
  'roof-work',
  'sheet-handling',
  'bricklaying',
  'pointing',
  'rendering',
  'concrete',
  'groundworks',
] as const;

/**
 * `scaffold-erection`: erecting, altering or striking scaffold · `work-at-height`: from a
 * scaffold or roof edge · `mewp`: mobile elevating work platform · `tower`: mobile access
 * tower · `roof-work`: slates, tiles, felt · `sheet-handling`: sheets over 5 m, large boards ·
 * `bricklaying`: laying units in mortar · `pointing` · `rendering` · `concrete` · `groundworks`.
 */
export type Activity = (typeof activities)[number];

export const mortarKinds = ['cement', 'hydraulic-lime'] as const;
/** Cement-gauged mortar, or hydraulic lime:sand mortar. */
export type MortarKind = (typeof mortarKinds)[number];

export const mortarActivities: ReadonlySet<Activity> = new Set<Activity>(['bricklaying', 'pointing', 'rendering']);
export const heightActivities: ReadonlySet<Activity> = new Set<Activity>([
  'scaffold-erection',
  'work-at-height',
  'mewp',
  'tower',
  'roof-work',
  'sheet-handling',
]);
