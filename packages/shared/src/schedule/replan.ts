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
  /** The span's length on the board from `startDate`: `toDays` is `spanFor(startDate, workingDays)`. */
  workingDays: number;
}

export interface ReplanRequest {
  target: PlacedSpan;
  /** Days stood down; only those among the job's own days count as lost. */
  heldDates: readonly string[];
  mode: 'push' | 'push-and-ripple' | 'move-crew' | 'none';
  /** The target crew's later jobs (any order); rippled only in push-and-ripple. */
  laterOnCrew: readonly PlacedSpan[];
  /** For move-crew: the receiving crew's jobs that end on or after the day asked for (any order). */
  onReceivingCrew?: readonly PlacedSpan[];
  calendarFor: (crewId: string) => WorkCalendar;
  /** For move-crew. */
  toCrewId?: string;
  startDate?: string;
}

export interface ReplanPlan {
  lostWorkingDays: number;
  moves: PlannedMove[];
  /**
   * For move-crew: the job's days before the first day stood down. The first crew worked them; they leave the
   * board with the move and stay in the job's history.
   */
  workedDays: string[];
  /** For move-crew: the first day the receiving crew could take the job from the day asked for. */
  requestedStart: string | null;
  /** For move-crew: the receiving crew's jobs begun before the day asked for that run past it, so the job starts after them. */
  blockedBy: string[];
}

/**
 * Works out a re-plan after a stand-down. A job is one contiguous span of working days, so:
 * - "push", when the days stood down start on the job's first day, moves the start past that first run of held days;
 *   otherwise the start stays (days already worked never move). Either way the span grows by the held days left inside
 *   it, which stay on the board marked by the stand-down, so the job ends later by exactly the working days lost.
 * - "push-and-ripple" then moves each of the same crew's later jobs just far enough not to run into a job moved ahead of
 *   it, on that crew's calendar and never before a job's earliest start; jobs already double-booked stay overlapped.
 * - "move-crew" gives another crew what is left of the job (its working days from the first day stood down) from the
 *   day chosen, after any job that crew has already begun, and ripples that crew's later jobs the same way.
 * Pure: the API previews and commits with the same function.
 */
export function planReplan(request: ReplanRequest): ReplanPlan {
  const { target } = request;
  const held = new Set(request.heldDates);
  const heldOwn = target.days.filter((day) => held.has(day));
  const lost = heldOwn.length;
  const plan: ReplanPlan = { lostWorkingDays: lost, moves: [], workedDays: [], requestedStart: null, blockedBy: [] };
  if (request.mode === 'none' || lost === 0) return plan;
  const firstHeld = [...heldOwn].sort()[0]!;

  if (request.mode === 'move-crew') {
    const toCrewId = request.toCrewId ?? target.crewId;
    const calendar = request.calendarFor(toCrewId);
    plan.workedDays = target.days.filter((day) => day < firstHeld);
    const remaining = target.workingDays - plan.workedDays.length;
    // A job already begun keeps its start; only one not yet begun still waits for its earliest start.
    const requested = atOrAfterWorkingDay(request.startDate ?? firstHeld, calendar, plan.workedDays.length ? null : target.earliestStart);
    const others = (request.onReceivingCrew ?? []).filter((other) => other.assignmentId !== target.assignmentId && other.crewId === toCrewId);
    let start = requested;
    for (const other of others.filter((o) => o.startDate < requested).sort(byStart)) {
      const last = other.days[other.days.length - 1]!;
      if (last < start) continue;
      start = atOrAfterWorkingDay(addWorkingDays(last, 1, calendar), calendar, null);
      plan.blockedBy.push(other.assignmentId);
    }
    plan.requestedStart = requested;
    const toDays = spanFor(start, remaining, calendar);
    plan.moves.push(move(target, toCrewId, toDays, remaining));
    plan.moves.push(...ripple({ fromEnd: null, toDays }, others.filter((o) => o.startDate >= requested), calendar));
    return plan;
  }

  const calendar = request.calendarFor(target.crewId);
  let leading = 0;
  while (leading < target.days.length && held.has(target.days[leading]!)) leading += 1;
  const start = leading === 0
    ? target.startDate
    : atOrAfterWorkingDay(addWorkingDays(target.days[leading - 1]!, 1, calendar), calendar, target.earliestStart);
  const workingDays = target.workingDays + lost - leading;
  const pushedDays = spanFor(start, workingDays, calendar);
  plan.moves.push(move(target, target.crewId, pushedDays, workingDays));
  if (request.mode === 'push-and-ripple') {
    const later = request.laterOnCrew.filter(
      (other) => other.assignmentId !== target.assignmentId && other.crewId === target.crewId && other.startDate >= target.startDate,
    );
    plan.moves.push(...ripple({ fromEnd: target.days[target.days.length - 1]!, toDays: pushedDays }, later, calendar));
  }
  return plan;
}

/**
 * Moves each later job, in start order, to the first working day after any moved job that used to end before it began
 * and now runs into it. Jobs that already overlapped (a double booking, which the board shows as a conflict) keep that
 * overlap rather than being queued one after the other, so losing a day moves the crew's later work by the days lost
 * and what calendars and earliest starts add, never by the length of a double booking it had before.
 * `fromEnd` is null for a job arriving from another crew: it ended before none of this crew's jobs.
 */
function ripple(first: { fromEnd: string | null; toDays: readonly string[] }, candidates: readonly PlacedSpan[], calendar: WorkCalendar): PlannedMove[] {
  const moves: PlannedMove[] = [];
  const moved = [{ fromEnd: first.fromEnd, toEnd: first.toDays[first.toDays.length - 1]! }];
  for (const other of [...candidates].sort(byStart)) {
    const begins = other.days[0]!;
    let pushedPast: string | null = null;
    for (const earlier of moved) {
      const wasBefore = earlier.fromEnd === null || earlier.fromEnd < begins;
      if (wasBefore && earlier.toEnd >= begins && (pushedPast === null || earlier.toEnd > pushedPast)) pushedPast = earlier.toEnd;
    }
    if (pushedPast === null) continue;
    const start = atOrAfterWorkingDay(addWorkingDays(pushedPast, 1, calendar), calendar, other.earliestStart);
    const days = spanFor(start, other.workingDays, calendar);
    moves.push(move(other, other.crewId, days, other.workingDays));
    moved.push({ fromEnd: other.days[other.days.length - 1]!, toEnd: days[days.length - 1]! });
  }
  return moves;
}

function byStart(a: PlacedSpan, b: PlacedSpan): number {
  return a.startDate.localeCompare(b.startDate) || a.assignmentId.localeCompare(b.assignmentId);
}

function move(span: PlacedSpan, toCrewId: string, toDays: string[], workingDays: number): PlannedMove {
  return {
    assignmentId: span.assignmentId, jobId: span.jobId, fromCrewId: span.crewId, toCrewId,
    fromDays: span.days, toDays, startDate: toDays[0]!, workingDays,
  };
}

function atOrAfterWorkingDay(date: string, calendar: WorkCalendar, earliest: string | null): string {
  const from = earliest && earliest > date ? earliest : date;
  return nextWorkingDay(from, calendar);
}
