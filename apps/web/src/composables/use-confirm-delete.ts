import { useConfirm } from 'primevue/useconfirm';
import { useProblemToast } from './use-problem-toast';

export interface ConfirmDeleteOptions<T> {
  /** How the record is named in the question ("Delete …?") and in the toast once it is gone. */
  name(item: T): string;
  /** What deleting it does, in the firm's terms. */
  message: string | ((item: T) => string);
  keepLabel: string;
  deletedSummary: string;
  remove(item: T): Promise<unknown>;
  /** Runs after the delete, e.g. to reload the list. */
  onDeleted?(item: T): Promise<unknown> | void;
}

export interface ConfirmDelete<T> {
  confirmDelete(item: T): void;
}

/** Asks before deleting a list's record, then deletes it, says so, and lets the list reload; a refusal is toasted. */
export function useConfirmDelete<T>(options: ConfirmDeleteOptions<T>): ConfirmDelete<T> {
  const confirm = useConfirm();
  const { showProblem, showSaved } = useProblemToast();

  function confirmDelete(item: T): void {
    const name = options.name(item);
    confirm.require({
      header: `Delete ${name}?`,
      message: typeof options.message === 'function' ? options.message(item) : options.message,
      icon: 'pi pi-exclamation-triangle',
      rejectProps: { label: options.keepLabel, severity: 'secondary', outlined: true },
      acceptProps: { label: 'Delete', severity: 'danger' },
      accept: async () => {
        try {
          await options.remove(item);
          showSaved(options.deletedSummary, name);
          await options.onDeleted?.(item);
        } catch (error) {
          showProblem(error);
        }
      },
    });
  }

  return { confirmDelete };
}
