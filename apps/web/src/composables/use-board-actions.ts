import { ref, type Ref } from 'vue';
import { useConfirm } from 'primevue/useconfirm';
import { useToast } from 'primevue/usetoast';
import type { ScheduleChangeDto } from '@hodboard/shared';
import { isApiError } from '@/api/http';
import { messageForError } from '@/api/problem-messages';
import { staleDetails, useScheduleStore, type MoveTarget } from '@/stores/schedule-store';
import { formatDay } from '@/utils/format';

export interface BoardActions {
  /** What the last action did, for the assertive live region (keyboard and screen-reader users). */
  announcement: Ref<string>;
  place(jobId: string, crewId: string, startDate: string, workingDays?: number): Promise<boolean>;
  move(assignmentId: string, target: MoveTarget): Promise<boolean>;
  unschedule(assignmentId: string): Promise<boolean>;
}

export function useBoardActions(): BoardActions {
  const store = useScheduleStore();
  const toast = useToast();
  const confirm = useConfirm();
  const announcement = ref('');

  function askToDoubleBook(detail: string): Promise<boolean> {
    return new Promise((resolve) => {
      confirm.require({
        header: 'Book this crew twice?',
        message: detail,
        icon: 'pi pi-exclamation-triangle',
        acceptProps: { label: 'Book anyway' },
        rejectProps: { label: 'Cancel', severity: 'secondary', outlined: true },
        accept: () => resolve(true),
        reject: () => resolve(false),
        onHide: () => resolve(false),
      });
    });
  }

  function describe(change: ScheduleChangeDto, verb: string): string {
    const { assignment, job } = change;
    if (!assignment) return `${job.reference} is back in the tray.`;
    const crew = store.crews.find((c) => c.id === assignment.crewId)?.name ?? 'the crew';
    const first = assignment.days[0];
    const last = assignment.days[assignment.days.length - 1];
    const span = first && last ? (first === last ? formatDay(first) : `${formatDay(first)} to ${formatDay(last)}`) : '';
    return `${job.reference} ${verb} ${crew}, ${span}, ${assignment.workingDays} working ${assignment.workingDays === 1 ? 'day' : 'days'}.`;
  }

  async function run(verb: string, attempt: (confirmDoubleBooking: boolean) => Promise<ScheduleChangeDto>): Promise<boolean> {
    try {
      const change = await attempt(false);
      announcement.value = describe(change, verb);
      return true;
    } catch (first) {
      if (isApiError(first, 'needs-confirmation')) {
        const detail = messageForError(first).detail;
        if (!(await askToDoubleBook(detail))) {
          announcement.value = 'Nothing changed.';
          return false;
        }
        try {
          const change = await attempt(true);
          announcement.value = describe(change, verb);
          return true;
        } catch (second) {
          return report(second);
        }
      }
      return report(first);
    }
  }

  function report(error: unknown): false {
    const stale = staleDetails(error);
    if (stale) {
      const who = stale.changedBy ?? 'Someone';
      const detail = `${who} just changed this job. The board now shows their version; try your change again if it still fits.`;
      toast.add({ severity: 'warn', summary: `${who} just changed this job`, detail, life: 8000 });
      announcement.value = detail;
      return false;
    }
    const { summary, detail } = messageForError(error);
    const text = error instanceof Error && !isApiError(error) ? error.message : detail;
    toast.add({ severity: 'error', summary, detail: text, life: 8000 });
    announcement.value = `${summary}. ${text}`;
    return false;
  }

  return {
    announcement,
    place: (jobId, crewId, startDate, workingDays) =>
      run('is now on', (confirmDoubleBooking) => store.place(jobId, crewId, startDate, { workingDays, confirmDoubleBooking })),
    move: (assignmentId, target) =>
      run('is now on', (confirmDoubleBooking) => store.move(assignmentId, target, { confirmDoubleBooking })),
    unschedule: (assignmentId) => run('is now on', () => store.unschedule(assignmentId)),
  };
}
