import type { JobPriority, JobStatus } from '../schemas/jobs.js';

/** Job statuses that may be put on a crew, and that the tray holds while the job is on none. */
export const TRAY_STATUSES: ReadonlySet<JobStatus> = new Set<JobStatus>(['booked', 'stood-down']);

const PRIORITY_RANK: Record<JobPriority, number> = { low: 0, normal: 1, high: 2, urgent: 3 };

/** The tray's order: the most urgent first, then by reference. */
export function compareTrayJobs(a: { priority: JobPriority; reference: string }, b: { priority: JobPriority; reference: string }): number {
  return PRIORITY_RANK[b.priority] - PRIORITY_RANK[a.priority] || a.reference.localeCompare(b.reference);
}
