import type { AccessNeed, JobPriority, WorkType } from '@hodboard/shared';

export const workTypeLabels: Record<WorkType, string> = {
  chimney: 'Chimney',
  repointing: 'Repointing',
  brickwork: 'Brickwork',
  'garden-wall': 'Garden wall',
  extension: 'Extension',
  rendering: 'Rendering',
  roofing: 'Roofing',
  groundworks: 'Groundworks',
  concrete: 'Concrete',
  repairs: 'Repairs',
};

export const accessNeedLabels: Record<AccessNeed, string> = {
  scaffold: 'Scaffold',
  tower: 'Mobile tower',
  mewp: 'MEWP (powered access platform)',
  'roof-ladder': 'Roof ladder',
  'edge-protection': 'Edge protection',
};

export const priorityLabels: Record<JobPriority, string> = {
  low: 'Low',
  normal: 'Normal',
  high: 'High',
  urgent: 'Urgent',
};

export function optionsFrom<T extends string>(labels: Record<T, string>): { value: T; label: string }[] {
  return (Object.entries(labels) as [T, string][]).map(([value, label]) => ({ value, label }));
}
