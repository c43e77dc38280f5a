import { addWorkingDays, nextWorkingDay, spanFor, type WorkCalendar } from '../rules/index.js';

export interface PlacedSpan {
  assignmentId: string;
  jobId: string;
  crewId: string;
  startDate: string;
  workingDays: number;
  days: readonly string[];
  earliestStart: string | null;
}

export interface PlannedMove {
  assignmentId: string;
  jobId: string;
  fromCrewId: string;
  toCrewId: string;
  fromDays: readonly string[];
  toDays: string[];
  startDate: string;
  workingDays: number;
}

export interface ReplanRequest {
  target: PlacedSpan;
  /** Days stood down; only those among the job's own days count as lost. */
  heldDates: readonly string[];
  mode: 'push' | 'push-and-ripple' | 'move-crew' | 'none';
  /** The target crew's later jobs (any order); rippled only in push-and-ripple. */
  laterOnCrew: readonly PlacedSpan[];
  calendarFor: (crewId: string) => WorkCalendar;
  /** For move-crew. */
  toCrewId?: string;
  startDate?: string;
}

export interface ReplanPlan {
  lostWorkingDays: number;
  moves: PlannedMove[];
}

/**
 * Works out a re-plan after a stand-down. "push" moves the job later by the working days lost; "ripple" then
 * moves each of the same crew's later jobs just far enough not to overlap the one before, on that crew's
 * calendar and never before a job's earliest start; "move-crew" hands the job to another crew from the first
 * day stood down. Pure: the API previews and commits with the same function.
 */
export function planReplan(request: ReplanRequest): ReplanPlan {
  const { target } = request;
  const ownDays = new Set(target.days);
  const lost = [...new Set(request.heldDates)].filter((date) => ownDays.has(date)).length;
  if (request.mode === 'none' || lost === 0) return { lostWorkingDays: lost, moves: [] };

  if (request.mode === 'move-crew') {
    const toCrewId = request.toCrewId ?? target.crewId;
    const calendar = request.calendarFor(toCrewId);
    const firstHeld = [...request.heldDates].sort()[0]!;
    const start = atOrAfterWorkingDay(request.startDate ?? firstHeld, calendar, target.earliestStart);
    const toDays = spanFor(start, target.workingDays, calendar);
    return { lostWorkingDays: lost, moves: [move(target, toCrewId, toDays)] };
  }

  const calendar = request.calendarFor(target.crewId);
  const pushedStart = atOrAfterWorkingDay(addWorkingDays(nextWorkingDay(target.startDate, calendar), lost, calendar), calendar, target.earliestStart);
  const pushedDays = spanFor(pushedStart, target.workingDays, calendar);
  const moves: PlannedMove[] = [move(target, target.crewId, pushedDays)];
  if (request.mode === 'push-and-ripple') {
    let lastBusy = pushedDays[pushedDays.length - 1]!;
    const later = [...request.laterOnCrew]
      .filter((other) => other.assignmentId !== target.assignmentId && other.crewId === target.crewId && other.startDate >= target.startDate)
      .sort((a, b) => a.startDate.localeCompare(b.startDate) || a.assignmentId.localeCompare(b.assignmentId));
    for (const other of later) {
      if (other.days[0]! > lastBusy) break;
      const start = atOrAfterWorkingDay(addWorkingDays(lastBusy, 1, calendar), calendar, other.earliestStart);
      const days = spanFor(start, other.workingDays, calendar);
      moves.push(move(other, other.crewId, days));
      lastBusy = days[days.length - 1]!;
    }
  }
  return { lostWorkingDays: lost, moves };
}

function move(span: PlacedSpan, toCrewId: string, toDays: string[]): PlannedMove {
  return {
    assignmentId: span.assignmentId, jobId: span.jobId, fromCrewId: span.crewId, toCrewId,
    fromDays: span.days, toDays, startDate: toDays[0]!, workingDays: span.workingDays,
  };
}

function atOrAfterWorkingDay(date: string, calendar: WorkCalendar, earliest: string | null): string {
  const from = earliest && earliest > date ? earliest : date;
  return nextWorkingDay(from, calendar);
}
