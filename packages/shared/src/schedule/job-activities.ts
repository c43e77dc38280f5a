import type { PlannedActivity } from '../rules/index.js';
import type { AccessNeed, WorkType } from '../schemas/jobs.js';

const BY_WORK_TYPE: Record<WorkType, PlannedActivity[]> = {
  chimney: ['bricklaying', 'work-at-height'],
  repointing: ['pointing'],
  brickwork: ['bricklaying'],
  'garden-wall': ['bricklaying'],
  extension: ['bricklaying', 'concrete', 'groundworks'],
  rendering: ['rendering'],
  roofing: ['roof-work', 'work-at-height'],
  groundworks: ['groundworks'],
  concrete: ['concrete'],
  repairs: ['bricklaying'],
};

const BY_ACCESS: Record<AccessNeed, PlannedActivity[]> = {
  scaffold: ['work-at-height'],
  tower: ['tower'],
  mewp: ['mewp'],
  'roof-ladder': ['roof-work', 'work-at-height'],
  'edge-protection': ['work-at-height'],
};

/**
 * The weather-sensitive activities a job's days involve, read from its work types and access needs
 * (common practice, no source). Lime work takes the hydraulic-lime mortar rules.
 */
export function activitiesForJob(workTypes: readonly WorkType[], accessNeeds: readonly AccessNeed[], mortar: 'cement' | 'hydraulic-lime' = 'cement'): PlannedActivity[] {
  const names = new Set<string>();
  for (const type of workTypes) for (const a of BY_WORK_TYPE[type]) names.add(typeof a === 'string' ? a : a.activity);
  for (const need of accessNeeds) for (const a of BY_ACCESS[need]) names.add(typeof a === 'string' ? a : a.activity);
  const mortarWork = new Set(['bricklaying', 'pointing', 'rendering']);
  return [...names].map((activity) =>
    mortarWork.has(activity) ? { activity: activity as 'bricklaying', mortar } : (activity as PlannedActivity),
  );
}
