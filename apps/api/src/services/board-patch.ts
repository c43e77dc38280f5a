import { compareTrayJobs, conflictWithin, TRAY_STATUSES, type BoardAssignmentDto, type BoardDto, type ScheduleChangeDto } from '@hodboard/shared';
import type { JobEditedPayload } from './job-service.js';

/** Which board a cached copy is: its range, whose crews it shows (null: every crew) and whether it carries the tray. */
export interface BoardView {
  from: string;
  to: string;
  crewIds: string[] | null;
  hasTray: boolean;
}

/**
 * The board as a full rebuild would read it after one schedule change, made from the board before it and the change
 * the schedule service published. Null when the change cannot be applied from what it carries: a job coming onto this
 * board brings stood-down days the change does not describe, so the board must be read afresh.
 *
 * Conflicts are replaced for the change's affected assignments only; the schedule service recomputes every card on
 * the changed crews over the changed days, which are the only cards whose conflicts a move can alter.
 */
export function patchBoard(board: BoardDto, change: ScheduleChangeDto, eventId: number, view: BoardView): BoardDto | null {
  const job = change.job;
  const changedId = change.assignment?.id ?? change.removedAssignmentId;
  const before = board.assignments.find((a) => a.jobId === job.id || a.id === changedId);
  const after = change.assignment && shows(view, change.assignment) ? toCard(change.assignment) : null;
  if (after && !before) return null;

  const assignments = board.assignments.filter((a) => a !== before);
  if (after) assignments.splice(insertionIndex(assignments, after.startDate), 0, after);

  const inTray = view.hasTray && change.assignment === null && TRAY_STATUSES.has(job.status);
  const keepsJob = Boolean(after) || inTray;
  const heldJob = board.jobs[job.id];
  let jobs = board.jobs;
  if (keepsJob && (!heldJob || JSON.stringify(heldJob) !== JSON.stringify(job))) jobs = { ...board.jobs, [job.id]: job };
  if (!keepsJob && heldJob) {
    jobs = { ...board.jobs };
    delete jobs[job.id];
  }
  let trayJobIds = board.trayJobIds;
  if (inTray || trayJobIds.includes(job.id)) {
    trayJobIds = [...trayJobIds.filter((id) => id !== job.id), ...(inTray ? [job.id] : [])];
    trayJobIds.sort((a, b) => compareTrayJobs(jobs[a]!, jobs[b]!));
  }

  const shown = new Set(assignments.map((a) => a.id));
  const affected = new Set(change.affectedAssignmentIds);
  if (before) affected.add(before.id);
  const bookings = new Set(change.accessBands.map((band) => band.bookingId));

  // A list nothing left or joined stays the very same array, so the serialiser reuses its bytes (SectionedGzip).
  return {
    ...board,
    assignments,
    jobs,
    trayJobIds,
    conflicts: replaced(
      board.conflicts,
      (conflict) => !affected.has(conflict.assignmentId),
      change.conflicts.filter((conflict) => shown.has(conflict.assignmentId) && conflictWithin(view, conflict)),
    ),
    accessBands: replaced(
      board.accessBands,
      (band) => !bookings.has(band.bookingId) && !band.jobIds.includes(job.id),
      change.accessBands.filter((band) => band.jobIds.some((id) => id in jobs)),
    ),
    weather: replaced(board.weather, (day) => day.jobId !== job.id, after ? change.weather.filter((day) => day.assignmentId === after.id) : []),
    holdDays: after ? board.holdDays : replaced(board.holdDays, (day) => day.jobId !== job.id, []),
    lastEventId: Math.max(board.lastEventId, eventId),
  };
}

/**
 * Job fields a board draws as they are and no rule reads (the priority only orders the tray), and those no board
 * shows at all. An edit of these alone changes nothing but the job's own entry.
 */
const FIELDS_TAKEN_IN_PLACE = new Set(['title', 'priority', 'estimatedWorkingDays', 'description', 'siteNotes']);

/**
 * The board after a job edit, or null when the edit changed a field the rules read (its client or site, its work
 * types or access needs, its dates): then the board must be read afresh.
 */
export function patchJobEdit(board: BoardDto, edit: JobEditedPayload): BoardDto | null {
  if (!edit.changedFields.every((field) => FIELDS_TAKEN_IN_PLACE.has(field))) return null;
  const held = board.jobs[edit.job.id];
  if (!held) return board;
  const jobs = { ...board.jobs, [held.id]: { ...held, ...edit.job } };
  const trayJobIds = board.trayJobIds.includes(held.id) ? [...board.trayJobIds].sort((a, b) => compareTrayJobs(jobs[a]!, jobs[b]!)) : board.trayJobIds;
  return { ...board, jobs, trayJobIds };
}

/** The items kept, then the items added; the list itself when it keeps all and gains none. */
function replaced<T>(items: T[], keep: (item: T) => boolean, added: T[]): T[] {
  const kept = items.filter(keep);
  return kept.length === items.length && added.length === 0 ? items : [...kept, ...added];
}

function shows(view: BoardView, assignment: { crewId: string; days: string[]; startDate: string }): boolean {
  if (view.crewIds && !view.crewIds.includes(assignment.crewId)) return false;
  const last = assignment.days[assignment.days.length - 1] ?? assignment.startDate;
  return assignment.startDate <= view.to && last >= view.from;
}

function toCard(assignment: NonNullable<ScheduleChangeDto['assignment']>): BoardAssignmentDto {
  const { id, jobId, crewId, startDate, workingDays, days, version } = assignment;
  return { id, jobId, crewId, startDate, workingDays, days, version };
}

/** After the cards starting on or before the day, as the board's query orders them by first day. */
function insertionIndex(assignments: BoardAssignmentDto[], startDate: string): number {
  let low = 0;
  let high = assignments.length;
  while (low < high) {
    const mid = (low + high) >> 1;
    if (assignments[mid]!.startDate <= startDate) low = mid + 1;
    else high = mid;
  }
  return low;
}
