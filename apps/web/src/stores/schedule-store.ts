import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import {
  type AssignmentDto,
  type BoardAssignmentDto,
  type BoardCrewDto,
  type BoardDayDto,
  type BoardDto,
  type BoardHoldDayDto,
  type BoardJobDto,
  type ConflictDto,
  type ConflictKind,
  type ScheduleChangeDto,
  compareTrayJobs,
  conflictWithin,
  SCHEDULE_CHANGES_PAGE,
  TRAY_STATUSES,
} from '@hodboard/shared';
import * as boardApi from '@/api/board';
import { isApiError } from '@/api/http';
import { useSessionStore } from './session-store';
import { compareCodes } from '@/utils/compare';

export interface ScheduleRange {
  from: string;
  to: string;
  crewId?: string;
}

export interface PlaceOptions {
  workingDays?: number;
  confirmDoubleBooking?: boolean;
}

export interface ConflictGroup {
  kind: ConflictKind;
  severity: ConflictDto['severity'];
  message: string;
  assignmentId: string;
  jobId: string;
  crewId: string;
  dates: string[];
}

export interface MoveTarget {
  crewId: string;
  startDate: string;
  workingDays: number;
}

/** Placements waiting for the server carry this id until the real one comes back. */
export const pendingAssignmentId = (jobId: string) => `pending:${jobId}`;

export function addDaysIso(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

export function isoWeekday(date: string): number {
  const day = new Date(`${date}T00:00:00Z`).getUTCDay();
  return day === 0 ? 7 : day;
}

/** Stale-version problems carry the server's copy and who wrote it. */
export function staleDetails(error: unknown): { current: AssignmentDto | null; changedBy: string | null } | null {
  if (!isApiError(error, 'stale-version')) return null;
  const current = error.problem.current as AssignmentDto | undefined;
  const changedBy = typeof error.problem.changedBy === 'string' ? error.problem.changedBy : null;
  return { current: current && typeof current.id === 'string' ? current : null, changedBy };
}

export const useScheduleStore = defineStore('schedule', () => {
  const session = useSessionStore();

  const range = shallowRef<ScheduleRange | null>(null);
  const days = shallowRef<BoardDayDto[]>([]);
  const crews = shallowRef<BoardCrewDto[]>([]);
  const assignments = ref<Record<string, BoardAssignmentDto>>({});
  const jobs = ref<Record<string, BoardJobDto>>({});
  const trayJobIds = ref<string[]>([]);
  const conflicts = shallowRef<ConflictDto[]>([]);
  const holdDays = shallowRef<BoardHoldDayDto[]>([]);
  const lastEventId = ref(0);
  const isLoading = ref(false);
  const error = shallowRef<unknown>(null);
  const savingIds = ref<Set<string>>(new Set());
  let loadSeq = 0;

  const dayIndex = computed(() => new Map(days.value.map((day, index) => [day.date, index])));
  const crewLeave = computed(() => {
    const byCrew = new Map<string, Map<string, string>>();
    for (const crew of crews.value) byCrew.set(crew.id, new Map(crew.leave.map((leave) => [leave.date, leave.label])));
    return byCrew;
  });

  const assignmentsByCrew = computed(() => {
    const byCrew = new Map<string, BoardAssignmentDto[]>();
    for (const crew of crews.value) byCrew.set(crew.id, []);
    for (const assignment of Object.values(assignments.value)) byCrew.get(assignment.crewId)?.push(assignment);
    for (const list of byCrew.values()) list.sort((a, b) => compareCodes(a.startDate, b.startDate) || compareCodes(a.id, b.id));
    return byCrew;
  });

  /** Stood-down days by job, in date order. */
  const holdDaysByJob = computed(() => {
    const byJob = new Map<string, BoardHoldDayDto[]>();
    for (const day of holdDays.value) byJob.set(day.jobId, [...(byJob.get(day.jobId) ?? []), day]);
    for (const list of byJob.values()) list.sort((a, b) => compareCodes(a.date, b.date));
    return byJob;
  });

  const conflictsByAssignment = computed(() => {
    const byId = new Map<string, ConflictDto[]>();
    for (const conflict of conflicts.value) {
      const list = byId.get(conflict.assignmentId) ?? [];
      list.push(conflict);
      byId.set(conflict.assignmentId, list);
    }
    return byId;
  });

  /** The API reports a clash once per day; people read it once per job, with the days it hits. */
  const conflictGroups = computed(() => {
    const byAssignment = new Map<string, ConflictGroup[]>();
    for (const conflict of conflicts.value) {
      const groups = byAssignment.get(conflict.assignmentId) ?? [];
      let group = groups.find((g) => g.kind === conflict.kind && g.message === conflict.message);
      if (!group) {
        group = { kind: conflict.kind, severity: conflict.severity, message: conflict.message, assignmentId: conflict.assignmentId, jobId: conflict.jobId, crewId: conflict.crewId, dates: [] };
        groups.push(group);
      }
      if (conflict.severity === 'stop') group.severity = 'stop';
      if (conflict.date && !group.dates.includes(conflict.date)) group.dates.push(conflict.date);
      byAssignment.set(conflict.assignmentId, groups);
    }
    for (const groups of byAssignment.values()) for (const group of groups) group.dates.sort();
    return byAssignment;
  });

  const conflictCounts = computed(() => {
    const counts: Partial<Record<ConflictKind, number>> = {};
    for (const groups of conflictGroups.value.values()) for (const group of groups) counts[group.kind] = (counts[group.kind] ?? 0) + 1;
    return counts;
  });

  const trayJobs = computed(() => trayJobIds.value.map((id) => jobs.value[id]).filter((job): job is BoardJobDto => Boolean(job)));
  const canEdit = computed(() => session.hasPermission('jobs:manage'));

  /** Inside the loaded range the API's calendar decides; outside it, a plain Monday-to-Friday week stands in until the server answers. */
  function isCrewWorkingDay(crewId: string, date: string): boolean {
    const index = dayIndex.value.get(date);
    if (index === undefined) return isoWeekday(date) <= 5;
    return Boolean(days.value[index]?.isWorkingDay) && !crewLeave.value.get(crewId)?.has(date);
  }

  function predictSpan(crewId: string, startDate: string, workingDays: number): string[] {
    const span: string[] = [];
    let date = startDate;
    for (let guard = 0; span.length < workingDays && guard < 800; guard += 1) {
      if (isCrewWorkingDay(crewId, date)) span.push(date);
      date = addDaysIso(date, 1);
    }
    return span;
  }

  /** Working days from `start` to `end`, both included, on that crew's calendar. */
  function countWorkingDays(crewId: string, start: string, end: string): number {
    let count = 0;
    for (let date = start, guard = 0; date <= end && guard < 800; date = addDaysIso(date, 1), guard += 1) {
      if (isCrewWorkingDay(crewId, date)) count += 1;
    }
    return count;
  }

  function stepWorkingDay(crewId: string, date: string, direction: 1 | -1): string {
    let next = addDaysIso(date, direction);
    for (let guard = 0; !isCrewWorkingDay(crewId, next) && guard < 60; guard += 1) next = addDaysIso(next, direction);
    return next;
  }

  function isVisible(assignment: BoardAssignmentDto): boolean {
    const current = range.value;
    if (!current || !crews.value.some((crew) => crew.id === assignment.crewId)) return false;
    const first = assignment.days[0] ?? assignment.startDate;
    const last = assignment.days[assignment.days.length - 1] ?? assignment.startDate;
    return first <= current.to && last >= current.from;
  }

  function removeFromTray(jobId: string): void {
    if (trayJobIds.value.includes(jobId)) trayJobIds.value = trayJobIds.value.filter((id) => id !== jobId);
  }

  function addToTray(jobId: string): void {
    if (!canEdit.value || trayJobIds.value.includes(jobId)) return;
    const job = jobs.value[jobId];
    if (!job) return;
    const next = [...trayJobIds.value];
    const at = next.findIndex((id) => {
      const other = jobs.value[id];
      return other ? compareTrayJobs(job, other) < 0 : false;
    });
    next.splice(at === -1 ? next.length : at, 0, jobId);
    trayJobIds.value = next;
  }

  function setAssignment(assignment: BoardAssignmentDto): void {
    if (isVisible(assignment)) assignments.value[assignment.id] = assignment;
    else delete assignments.value[assignment.id];
  }

  /** Folds a committed change into the board; returns false when it is older than what the board already shows. */
  function applyChange(change: ScheduleChangeDto): boolean {
    const { assignment, removedAssignmentId, job } = change;
    const existing = assignment ? assignments.value[assignment.id] : undefined;
    if (assignment && existing && existing.version > assignment.version) return false;

    jobs.value[job.id] = job;
    if (assignment) {
      delete assignments.value[pendingAssignmentId(job.id)];
      setAssignment(assignment);
      removeFromTray(job.id);
    }
    if (removedAssignmentId) {
      delete assignments.value[removedAssignmentId];
      if (TRAY_STATUSES.has(job.status)) addToTray(job.id);
    }
    const affected = new Set(change.affectedAssignmentIds);
    conflicts.value = [
      ...conflicts.value.filter((conflict) => !affected.has(conflict.assignmentId)),
      ...change.conflicts.filter((conflict) => assignments.value[conflict.assignmentId] && (!range.value || conflictWithin(range.value, conflict))),
    ];
    return true;
  }

  /** A push from the socket, or one replayed from /board/changes after a reconnect. */
  function applyEvent(change: ScheduleChangeDto, eventId: number): boolean {
    if (eventId <= lastEventId.value) return false;
    lastEventId.value = eventId;
    return applyChange(change);
  }

  function applyBoard(board: BoardDto): void {
    days.value = board.days;
    crews.value = board.crews;
    assignments.value = Object.fromEntries(board.assignments.map((assignment) => [assignment.id, assignment]));
    jobs.value = { ...board.jobs };
    trayJobIds.value = [...board.trayJobIds];
    conflicts.value = board.conflicts;
    holdDays.value = board.holdDays;
    lastEventId.value = board.lastEventId;
  }

  async function load(next: ScheduleRange, options: { quiet?: boolean } = {}): Promise<void> {
    const seq = ++loadSeq;
    range.value = next;
    if (!options.quiet) isLoading.value = true;
    error.value = null;
    try {
      const board = await boardApi.getBoard(next);
      if (seq !== loadSeq) return;
      const newestShown = lastEventId.value;
      applyBoard(board);
      // A board read before a change this screen has already shown would undo it: replay what came after the read.
      if (board.lastEventId < newestShown) await catchUp();
    } catch (caught) {
      if (seq === loadSeq) error.value = caught;
    } finally {
      if (seq === loadSeq) isLoading.value = false;
    }
  }

  function reload(): Promise<void> {
    return range.value ? load(range.value, { quiet: true }) : Promise.resolve();
  }

  /** Asks for every change after the last one applied, a page at a time; a socket that was away misses nothing. */
  async function catchUp(): Promise<void> {
    if (!range.value) return;
    for (;;) {
      const after = lastEventId.value;
      const events = await boardApi.getBoardChanges(after);
      for (const event of events) applyEvent(event.payload, event.id);
      // A short page is the last; so is one that moved nothing on (a board read meanwhile may have passed it).
      if (events.length < SCHEDULE_CHANGES_PAGE || lastEventId.value === after) return;
    }
  }

  async function saving<T>(id: string, task: () => Promise<T>): Promise<T> {
    savingIds.value = new Set(savingIds.value).add(id);
    try {
      return await task();
    } finally {
      const next = new Set(savingIds.value);
      next.delete(id);
      savingIds.value = next;
    }
  }

  async function place(jobId: string, crewId: string, startDate: string, options: PlaceOptions = {}): Promise<ScheduleChangeDto> {
    const job = jobs.value[jobId];
    const workingDays = options.workingDays ?? job?.estimatedWorkingDays ?? 1;
    const tempId = pendingAssignmentId(jobId);
    const wasInTray = trayJobIds.value.includes(jobId);
    assignments.value[tempId] = {
      id: tempId, jobId, crewId, startDate, workingDays, days: predictSpan(crewId, startDate, workingDays), version: 0,
    };
    removeFromTray(jobId);
    try {
      const change = await saving(tempId, () =>
        boardApi.placeAssignment({ jobId, crewId, startDate, workingDays, confirmDoubleBooking: options.confirmDoubleBooking ?? false }),
      );
      applyChange(change);
      return change;
    } catch (caught) {
      delete assignments.value[tempId];
      if (wasInTray) addToTray(jobId);
      throw caught;
    }
  }

  async function move(id: string, target: MoveTarget, options: { confirmDoubleBooking?: boolean } = {}): Promise<ScheduleChangeDto> {
    const before = assignments.value[id];
    if (!before) throw new Error('That job is no longer on the board.');
    assignments.value[id] = { ...before, ...target, days: predictSpan(target.crewId, target.startDate, target.workingDays) };
    try {
      const change = await saving(id, () =>
        boardApi.updateAssignment(id, { ...target, version: before.version, confirmDoubleBooking: options.confirmDoubleBooking ?? false }),
      );
      applyChange(change);
      return change;
    } catch (caught) {
      const stale = staleDetails(caught);
      if (stale?.current) setAssignment(stale.current);
      else if (assignments.value[id]?.version === before.version) assignments.value[id] = before;
      throw caught;
    }
  }

  async function unschedule(id: string): Promise<ScheduleChangeDto> {
    const before = assignments.value[id];
    if (!before) throw new Error('That job is no longer on the board.');
    delete assignments.value[id];
    addToTray(before.jobId);
    try {
      const change = await saving(id, () => boardApi.removeAssignment(id, before.version));
      applyChange(change);
      return change;
    } catch (caught) {
      removeFromTray(before.jobId);
      const stale = staleDetails(caught);
      setAssignment(stale?.current ?? before);
      throw caught;
    }
  }

  function clear(): void {
    loadSeq += 1;
    range.value = null;
    applyBoard({ from: '', to: '', days: [], crews: [], assignments: [], jobs: {}, trayJobIds: [], conflicts: [], holdDays: [], lastEventId: 0 } as unknown as BoardDto);
    error.value = null;
  }

  return {
    range,
    days,
    crews,
    assignments,
    jobs,
    trayJobIds,
    conflicts,
    holdDays,
    lastEventId,
    isLoading,
    error,
    savingIds,
    assignmentsByCrew,
    conflictsByAssignment,
    holdDaysByJob,
    conflictGroups,
    conflictCounts,
    trayJobs,
    canEdit,
    isCrewWorkingDay,
    predictSpan,
    countWorkingDays,
    stepWorkingDay,
    load,
    reload,
    catchUp,
    place,
    move,
    unschedule,
    applyEvent,
    applyChange,
    clear,
  };
});
