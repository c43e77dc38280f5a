import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { ConfirmationOptions } from 'primevue/confirmationoptions';
import type { Problem } from '@hodboard/shared';
import { ApiError } from '@/api/http';
import { useConfirmDelete } from './use-confirm-delete';

const confirm = vi.hoisted(() => ({ require: vi.fn() }));
const toast = vi.hoisted(() => ({ showProblem: vi.fn(), showSaved: vi.fn() }));
vi.mock('primevue/useconfirm', () => ({ useConfirm: () => confirm }));
vi.mock('./use-problem-toast', () => ({ useProblemToast: () => toast }));

type Crew = { id: string; name: string; memberCount: number };
const crew: Crew = { id: 'crew-1', name: 'Stack crew', memberCount: 3 };

function asked(): ConfirmationOptions {
  expect(confirm.require).toHaveBeenCalledTimes(1);
  return confirm.require.mock.calls[0]![0] as ConfirmationOptions;
}

describe('useConfirmDelete', () => {
  beforeEach(() => vi.clearAllMocks());

  it('asks by name, says what deleting does, and offers to keep the record', () => {
    const remove = vi.fn();
    const { confirmDelete } = useConfirmDelete<Crew>({
      name: (item) => item.name,
      message: (item) => `${item.memberCount} people stay in the firm.`,
      keepLabel: 'Keep crew',
      deletedSummary: 'Crew deleted',
      remove,
    });
    confirmDelete(crew);
    expect(asked()).toMatchObject({
      header: 'Delete Stack crew?',
      message: '3 people stay in the firm.',
      icon: 'pi pi-exclamation-triangle',
      rejectProps: { label: 'Keep crew', severity: 'secondary', outlined: true },
      acceptProps: { label: 'Delete', severity: 'danger' },
    });
    expect(remove).not.toHaveBeenCalled();
  });

  it('deletes on accept, says so, then lets the list reload', async () => {
    const calls: string[] = [];
    const remove = vi.fn(async () => void calls.push('remove'));
    const onDeleted = vi.fn(async () => void calls.push('reload'));
    const { confirmDelete } = useConfirmDelete<Crew>({
      name: (item) => item.name,
      message: 'Its people stay in the firm.',
      keepLabel: 'Keep crew',
      deletedSummary: 'Crew deleted',
      remove,
      onDeleted,
    });
    confirmDelete(crew);
    expect(asked().message).toBe('Its people stay in the firm.');
    await asked().accept!();
    expect(remove).toHaveBeenCalledWith(crew);
    expect(toast.showSaved).toHaveBeenCalledWith('Crew deleted', 'Stack crew');
    expect(calls).toEqual(['remove', 'reload']);
    expect(toast.showProblem).not.toHaveBeenCalled();
  });

  it('toasts a refused delete and leaves the list as it was', async () => {
    const refusal = new ApiError({ type: 'about:blank', title: 'Not allowed', status: 403, code: 'forbidden' } satisfies Problem);
    const onDeleted = vi.fn();
    const { confirmDelete } = useConfirmDelete<Crew>({
      name: (item) => item.name,
      message: 'Its people stay in the firm.',
      keepLabel: 'Keep crew',
      deletedSummary: 'Crew deleted',
      remove: () => Promise.reject(refusal),
      onDeleted,
    });
    confirmDelete(crew);
    await asked().accept!();
    expect(toast.showProblem).toHaveBeenCalledWith(refusal);
    expect(toast.showSaved).not.toHaveBeenCalled();
    expect(onDeleted).not.toHaveBeenCalled();
  });
});
