import type { ConflictDto } from '../schemas/board.js';

export interface PlacedJob {
  assignmentId: string;
  jobId: string;
  crewId: string;
  reference: string;
  days: readonly string[];
  earliestStart: string | null;
  targetFinish: string | null;
}

export interface MemberAbsence {
  crewId: string;
  date: string;
  name: string;
  label: string;
}

/**
 * The schedule's own conflicts (access and weather conflicts are added by their services). Each comes with
 * a reason in words; none blocks the office except a double booking, which the API asks to confirm.
 */
export function scheduleConflicts(placed: readonly PlacedJob[], absences: readonly MemberAbsence[] = []): ConflictDto[] {
  const conflicts: ConflictDto[] = [];
  const byCrewDay = new Map<string, PlacedJob[]>();
  for (const job of placed) {
    for (const date of job.days) {
      const key = `${job.crewId}|${date}`;
      const list = byCrewDay.get(key);
      if (list) list.push(job);
      else byCrewDay.set(key, [job]);
    }
  }
  for (const [key, jobs] of byCrewDay) {
    if (jobs.length < 2) continue;
    const date = key.slice(key.indexOf('|') + 1);
    for (const job of jobs) {
      const others = jobs.filter((other) => other !== job).map((other) => other.reference);
      conflicts.push({
        kind: 'double-booked', assignmentId: job.assignmentId, jobId: job.jobId, crewId: job.crewId, date, severity: 'warning',
        message: `Crew is also booked on ${others.join(', ')} this day`,
      });
    }
  }
  const absencesByCrewDay = new Map<string, MemberAbsence[]>();
  for (const absence of absences) {
    const key = `${absence.crewId}|${absence.date}`;
    absencesByCrewDay.set(key, [...(absencesByCrewDay.get(key) ?? []), absence]);
  }
  for (const job of placed) {
    for (const date of job.days) {
      for (const absence of absencesByCrewDay.get(`${job.crewId}|${date}`) ?? []) {
        conflicts.push({
          kind: 'member-on-leave', assignmentId: job.assignmentId, jobId: job.jobId, crewId: job.crewId, date, severity: 'warning',
          message: `${absence.name} is off (${absence.label})`,
        });
      }
    }
    const first = job.days[0];
    const last = job.days[job.days.length - 1];
    if (first && job.earliestStart && first < job.earliestStart) {
      conflicts.push({
        kind: 'before-earliest-start', assignmentId: job.assignmentId, jobId: job.jobId, crewId: job.crewId, date: first, severity: 'warning',
        message: `Starts before the earliest start of ${job.earliestStart}`,
      });
    }
    if (last && job.targetFinish && last > job.targetFinish) {
      conflicts.push({
        kind: 'after-target-finish', assignmentId: job.assignmentId, jobId: job.jobId, crewId: job.crewId, date: last, severity: 'warning',
        message: `Finishes after the target of ${job.targetFinish}`,
      });
    }
  }
  return conflicts;
}

/** Days on which `candidate` would share a crew with another placed job. */
export function doubleBookedDays(candidate: Pick<PlacedJob, 'assignmentId' | 'crewId' | 'days'>, placed: readonly PlacedJob[]): string[] {
  const days = new Set(candidate.days);
  const clashes = new Set<string>();
  for (const job of placed) {
    if (job.assignmentId === candidate.assignmentId || job.crewId !== candidate.crewId) continue;
    for (const date of job.days) if (days.has(date)) clashes.add(date);
  }
  return [...clashes].sort();
}
