import type { JobPriority, JobStatus } from '../schemas/jobs.js';

/** Job statuses that may be put on a crew, and that the tray holds while the job is on none. */
export const TRAY_STATUSES: ReadonlySet<JobStatus> = new Set<JobStatus>(['booked', 'stood-down']);

// Spelled out rather than read from `jobPriorities`: that list lives with the zod schemas, which the board's first
// screens do not load. The Record type still refuses a priority left out.
const PRIORITY_RANK: Record<JobPriority, number> = { low: 0, normal: 1, high: 2, urgent: 3 };

/** The tray's order: the most urgent first, then by reference. */
export function compareTrayJobs(a: { priority: JobPriority; reference: string }, b: { priority: JobPriority; reference: string }): number {
  return PRIORITY_RANK[b.priority] - PRIORITY_RANK[a.priority] || a.reference.localeCompare(b.reference);
}

/**
 * Whether a board over these days lists this conflict: those on its own days, and those of no one day. A clash beyond
 * its last day is left to the board that shows that day, which holds the cards on it.
 */
export function conflictWithin(range: { from: string; to: string }, conflict: { date: string | null }): boolean {
  return conflict.date === null || (conflict.date >= range.from && conflict.date <= range.to);
}
