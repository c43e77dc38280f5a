import { useToast } from 'primevue/usetoast';
import { messageForError } from '@/api/problem-messages';

export interface ProblemToast {
  showProblem(error: unknown): void;
  showSaved(summary: string, detail?: string): void;
}

export function useProblemToast(): ProblemToast {
  const toast = useToast();
  return {
    showProblem(error) {
      const { summary, detail } = messageForError(error);
      toast.add({ severity: 'error', summary, detail, life: 7000 });
    },
    showSaved(summary, detail) {
      toast.add({ severity: 'success', summary, detail, life: 3500 });
    },
  };
}
