import type { JobStatus } from '@hodboard/shared';

type TagSeverity = 'secondary' | 'info' | 'success' | 'warn' | 'danger' | 'contrast';

const severities: Record<JobStatus, TagSeverity> = {
  enquiry: 'secondary',
  quoted: 'info',
  booked: 'info',
  scheduled: 'contrast',
  'on-site': 'warn',
  complete: 'success',
  invoiced: 'success',
  cancelled: 'danger',
  'stood-down': 'warn',
};

export function statusSeverity(status: JobStatus): TagSeverity {
  return severities[status];
}
