import { describe, expect, it } from 'vitest';
import { canTransition, jobStatuses, type JobStatus } from './jobs.js';

// Source: common practice, no source. The lifecycle of a building job as the office moves it by hand, written out here
// pair by pair so a change to the rule has to be made twice, on purpose.
const allowed = new Set([
  'enquiry → quoted', 'enquiry → booked', 'enquiry → cancelled',
  'quoted → booked', 'quoted → enquiry', 'quoted → cancelled',
  'booked → scheduled', 'booked → quoted', 'booked → cancelled',
  'scheduled → on-site', 'scheduled → booked', 'scheduled → stood-down', 'scheduled → cancelled',
  'on-site → complete', 'on-site → stood-down', 'on-site → scheduled',
  'stood-down → scheduled', 'stood-down → on-site', 'stood-down → booked', 'stood-down → cancelled',
  'complete → invoiced', 'complete → on-site',
  'cancelled → enquiry',
]);

const everyPair = jobStatuses.flatMap((from) => jobStatuses.map((to) => [from, to] as [JobStatus, JobStatus]));

describe('job status lifecycle', () => {
  it.each(everyPair)('%s → %s is allowed only if the lifecycle lists it', (from, to) => {
    expect(canTransition(from, to)).toBe(allowed.has(`${from} → ${to}`));
  });

  it('names only real statuses, and checks every one of the 81 pairs', () => {
    const named = [...allowed].flatMap((pair) => pair.split(' → '));
    expect(named.filter((status) => !(jobStatuses as readonly string[]).includes(status))).toEqual([]);
    expect(everyPair).toHaveLength(81);
  });

  it('never lets a job stay where it is, and an invoiced job goes nowhere', () => {
    expect(jobStatuses.filter((status) => canTransition(status, status))).toEqual([]);
    expect(jobStatuses.filter((to) => canTransition('invoiced', to))).toEqual([]);
  });

  it('reaches every status from a new enquiry', () => {
    const reached = new Set<JobStatus>(['enquiry']);
    for (let grew = true; grew; ) {
      grew = false;
      for (const [from, to] of everyPair) {
        if (reached.has(from) && !reached.has(to) && canTransition(from, to)) {
          reached.add(to);
          grew = true;
        }
      }
    }
    expect([...reached].sort()).toEqual([...jobStatuses].sort());
  });
});
