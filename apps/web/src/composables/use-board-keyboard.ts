import type { BoardAssignmentDto } from '@hodboard/shared';
import { useScheduleStore } from '@/stores/schedule-store';
import type { BoardActions } from './use-board-actions';

export interface BoardKeyboard {
  onBarKeydown(event: KeyboardEvent, assignment: BoardAssignmentDto): void;
}

export interface BoardKeyboardHooks {
  openMenu(event: Event, assignmentId: string): void;
  /** A moved bar may be drawn in another crew row; focus follows it there. */
  refocus(assignmentId: string): void;
}

export function useBoardKeyboard(actions: BoardActions, hooks: BoardKeyboardHooks): BoardKeyboard {
  const store = useScheduleStore();

  function adjacentCrew(crewId: string, direction: 1 | -1): string | null {
    const index = store.crews.findIndex((crew) => crew.id === crewId);
    return store.crews[index + direction]?.id ?? null;
  }

  async function moveTo(assignment: BoardAssignmentDto, crewId: string, startDate: string, workingDays: number): Promise<void> {
    await actions.move(assignment.id, { crewId, startDate, workingDays });
    hooks.refocus(assignment.id);
  }

  function onBarKeydown(event: KeyboardEvent, assignment: BoardAssignmentDto): void {
    if (event.key === 'Enter' || event.key === ' ' || event.key === 'ContextMenu' || (event.key === 'F10' && event.shiftKey)) {
      event.preventDefault();
      hooks.openMenu(event, assignment.id);
      return;
    }
    if (!store.canEdit) return;
    // One change at a time per job: a second key press before the first is saved would carry a stale version.
    if (store.savingIds.has(assignment.id)) {
      if (event.key.startsWith('Arrow') || event.key === 'Delete') event.preventDefault();
      return;
    }
    const { crewId, startDate, workingDays } = assignment;
    if (event.key === 'ArrowRight' || event.key === 'ArrowLeft') {
      event.preventDefault();
      const direction = event.key === 'ArrowRight' ? 1 : -1;
      if (event.shiftKey) {
        const next = workingDays + direction;
        if (next >= 1) void moveTo(assignment, crewId, startDate, next);
      } else {
        void moveTo(assignment, crewId, store.stepWorkingDay(crewId, startDate, direction), workingDays);
      }
      return;
    }
    if ((event.key === 'ArrowUp' || event.key === 'ArrowDown') && event.altKey) {
      event.preventDefault();
      const other = adjacentCrew(crewId, event.key === 'ArrowDown' ? 1 : -1);
      if (other) void moveTo(assignment, other, startDate, workingDays);
      return;
    }
    if (event.key === 'Delete' || event.key === 'Backspace') {
      event.preventDefault();
      void actions.unschedule(assignment.id);
    }
  }

  return { onBarKeydown };
}
