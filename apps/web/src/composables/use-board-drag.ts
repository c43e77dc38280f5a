import { computed, ref, type ComputedRef, type Ref } from 'vue';
import { useScheduleStore } from '@/stores/schedule-store';

export type BoardDragPayload =
  | { kind: 'tray'; jobId: string }
  /** `grabOffset`: working days between the bar's first day and the day under the pointer, so the bar lands where it was held. */
  | { kind: 'bar'; assignmentId: string; grabOffset: number }
  | { kind: 'end'; assignmentId: string };

export interface BoardDropTarget {
  crewId: string;
  date: string;
}

export interface BoardDragPlan {
  kind: 'place' | 'move' | 'resize';
  id: string;
  crewId: string;
  startDate: string;
  workingDays: number;
  days: string[];
}

export interface BoardDrag {
  payload: Ref<BoardDragPayload | null>;
  hover: Ref<BoardDropTarget | null>;
  isOverTray: Ref<boolean>;
  /** What dropping here would do, worked out on the visible calendar; the API has the final word. */
  plan: ComputedRef<BoardDragPlan | null>;
  begin(event: DragEvent, payload: BoardDragPayload): void;
  finish(): void;
}

const mime = 'application/x-hodboard-board';
const payload = ref<BoardDragPayload | null>(null);
const hover = ref<BoardDropTarget | null>(null);
const isOverTray = ref(false);

export function useBoardDrag(): BoardDrag {
  const store = useScheduleStore();

  const plan = computed<BoardDragPlan | null>(() => {
    const current = payload.value;
    const target = hover.value;
    if (!current || !target) return null;
    if (current.kind === 'tray') {
      const job = store.jobs[current.jobId];
      if (!job) return null;
      const workingDays = job.estimatedWorkingDays;
      return { kind: 'place', id: job.id, crewId: target.crewId, startDate: target.date, workingDays, days: store.predictSpan(target.crewId, target.date, workingDays) };
    }
    const assignment = store.assignments[current.assignmentId];
    if (!assignment) return null;
    if (current.kind === 'end') {
      if (target.crewId !== assignment.crewId || target.date < assignment.startDate) return null;
      const workingDays = Math.max(1, store.countWorkingDays(assignment.crewId, assignment.startDate, target.date));
      return { kind: 'resize', id: assignment.id, crewId: assignment.crewId, startDate: assignment.startDate, workingDays, days: store.predictSpan(assignment.crewId, assignment.startDate, workingDays) };
    }
    let startDate = target.date;
    for (let step = 0; step < current.grabOffset; step += 1) startDate = store.stepWorkingDay(target.crewId, startDate, -1);
    const { workingDays } = assignment;
    return { kind: 'move', id: assignment.id, crewId: target.crewId, startDate, workingDays, days: store.predictSpan(target.crewId, startDate, workingDays) };
  });

  function begin(event: DragEvent, next: BoardDragPayload): void {
    payload.value = next;
    if (event.dataTransfer) {
      event.dataTransfer.effectAllowed = 'move';
      // Some browsers start no drag without data; the payload itself stays in memory, as dragover cannot read it.
      event.dataTransfer.setData(mime, JSON.stringify(next));
      event.dataTransfer.setData('text/plain', next.kind === 'tray' ? next.jobId : next.assignmentId);
    }
  }

  function finish(): void {
    payload.value = null;
    hover.value = null;
    isOverTray.value = false;
  }

  return { payload, hover, isOverTray, plan, begin, finish };
}
