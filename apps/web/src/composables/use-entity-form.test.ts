import { beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick, ref } from 'vue';
import { z } from 'zod';
import type { Problem } from '@hodboard/shared';
import { ApiError } from '@/api/http';
import { useEntityForm, type EntityFormOptions } from './use-entity-form';

const toast = vi.hoisted(() => ({ showProblem: vi.fn(), showSaved: vi.fn() }));
vi.mock('./use-problem-toast', () => ({ useProblemToast: () => toast }));

interface Yard {
  id: string;
  name: string;
  ownerId: string;
  version: number;
}
type YardForm = { name: string; ownerId: string };

const yardSchema = z.object({
  name: z.string().trim().min(1, { message: 'Yard name is required' }),
  ownerId: z.uuid({ message: 'Must be a valid id' }),
});
const ownerId = '6f1c2a4e-8b3d-4c5e-9f70-1a2b3c4d5e6f';
const yard: Yard = { id: 'yard-1', name: 'Canal yard', ownerId, version: 4 };

const problem = (overrides: Partial<Problem>): ApiError =>
  new ApiError({ type: 'about:blank', title: 'Refused', status: 400, code: 'validation-failed', ...overrides });

function yardForm(overrides: Partial<EntityFormOptions<Yard, YardForm, typeof yardSchema, Yard>> = {}) {
  const visible = ref(false);
  const editing = ref<Yard | null>(null);
  const persist = vi.fn(async (input: z.output<typeof yardSchema>, entity: Yard | null, version: number) => ({
    id: entity?.id ?? 'yard-new',
    ...input,
    version: version + 1,
  }));
  const onSaved = vi.fn();
  const form = useEntityForm<Yard, YardForm, typeof yardSchema, Yard>({
    visible,
    entity: () => editing.value,
    initial: (record) => ({ name: record?.name ?? '', ownerId: record?.ownerId ?? '' }),
    schema: yardSchema,
    emptyPicks: { ownerId: 'Choose an owner' },
    persist,
    savedToast: (saved, isNew) => [isNew ? 'Yard added' : 'Yard updated', saved.name],
    onSaved,
    ...overrides,
  });
  async function open(record: Yard | null): Promise<void> {
    editing.value = record;
    visible.value = true;
    await nextTick();
  }
  return { visible, persist, onSaved, open, ...form };
}

describe('useEntityForm', () => {
  beforeEach(() => vi.clearAllMocks());

  it('fills the form from the record each time it opens, and empties it for a new one', async () => {
    const dialog = yardForm();
    await dialog.open(yard);
    expect(dialog.form).toEqual({ name: 'Canal yard', ownerId });
    expect(dialog.version.value).toBe(4);
    expect(dialog.isEditing.value).toBe(true);

    dialog.form.name = 'Typed but not saved';
    dialog.errors.value = { name: 'old message' };
    dialog.visible.value = false;
    await nextTick();
    await dialog.open(null);
    expect(dialog.form).toEqual({ name: '', ownerId: '' });
    expect(dialog.version.value).toBe(0);
    expect(dialog.isEditing.value).toBe(false);
    expect(dialog.errors.value).toEqual({});
  });

  it('shows the schema messages, with plain words for an empty pick, and saves nothing', async () => {
    const dialog = yardForm();
    await dialog.open(null);
    await dialog.save();
    expect(dialog.errorFor('name')).toBe('Yard name is required');
    expect(dialog.errorFor('ownerId')).toBe('Choose an owner');
    expect(dialog.persist).not.toHaveBeenCalled();
    expect(dialog.visible.value).toBe(true);

    dialog.form.ownerId = 'not-an-id';
    await dialog.save();
    expect(dialog.errorFor('ownerId')).toBe('Must be a valid id');
  });

  it('adds a new record from the parsed input, hands it on, closes and says so', async () => {
    const dialog = yardForm();
    await dialog.open(null);
    Object.assign(dialog.form, { name: '  Quarry yard ', ownerId });
    const saving = dialog.save();
    expect(dialog.isSaving.value).toBe(true);
    await saving;

    expect(dialog.persist).toHaveBeenCalledWith({ name: 'Quarry yard', ownerId }, null, 0);
    expect(dialog.onSaved).toHaveBeenCalledWith(expect.objectContaining({ id: 'yard-new', name: 'Quarry yard' }), true);
    expect(dialog.visible.value).toBe(false);
    expect(dialog.isSaving.value).toBe(false);
    expect(toast.showSaved).toHaveBeenCalledWith('Yard added', 'Quarry yard');
  });

  it('updates the record with the version it was opened at', async () => {
    const dialog = yardForm();
    await dialog.open(yard);
    dialog.form.name = 'Canal yard east';
    await dialog.save();
    expect(dialog.persist).toHaveBeenCalledWith({ name: 'Canal yard east', ownerId }, yard, 4);
    expect(dialog.onSaved).toHaveBeenCalledWith(expect.objectContaining({ id: 'yard-1', version: 5 }), false);
    expect(toast.showSaved).toHaveBeenCalledWith('Yard updated', 'Canal yard east');
  });

  it('shows the API’s field errors against the fields and stays open', async () => {
    const dialog = yardForm();
    dialog.persist.mockRejectedValueOnce(problem({ errors: [{ path: '/name', message: 'A yard with that name exists' }] }));
    await dialog.open(yard);
    await dialog.save();
    expect(dialog.errorFor('name')).toBe('A yard with that name exists');
    expect(dialog.visible.value).toBe(true);
    expect(dialog.isSaving.value).toBe(false);
    expect(toast.showProblem).not.toHaveBeenCalled();
    expect(dialog.onSaved).not.toHaveBeenCalled();
  });

  it('toasts a refusal that names no field', async () => {
    const dialog = yardForm();
    const refusal = problem({ status: 403, code: 'forbidden' });
    dialog.persist.mockRejectedValueOnce(refusal);
    await dialog.open(yard);
    await dialog.save();
    expect(toast.showProblem).toHaveBeenCalledWith(refusal);
    expect(dialog.visible.value).toBe(true);
  });

  it('after a stale version, says so and refills the form with what is current', async () => {
    const current: Yard = { ...yard, name: 'Canal yard (renamed)', version: 6 };
    const refetch = vi.fn(async () => current);
    const dialog = yardForm({ refetch });
    const stale = problem({ status: 409, code: 'stale-version' });
    dialog.persist.mockRejectedValueOnce(stale);
    await dialog.open(yard);
    dialog.form.name = 'My edit';
    await dialog.save();

    expect(toast.showProblem).toHaveBeenCalledWith(stale);
    expect(refetch).toHaveBeenCalledWith(yard);
    expect(dialog.form.name).toBe('Canal yard (renamed)');
    expect(dialog.version.value).toBe(6);
    expect(dialog.visible.value).toBe(true);

    await dialog.save();
    expect(dialog.persist).toHaveBeenLastCalledWith(expect.anything(), yard, 6);
  });

  it('keeps the form as typed when the refetch only reloads elsewhere', async () => {
    const dialog = yardForm({ refetch: async () => undefined });
    dialog.persist.mockRejectedValueOnce(problem({ status: 409, code: 'stale-version' }));
    await dialog.open(yard);
    dialog.form.name = 'My edit';
    await dialog.save();
    expect(toast.showProblem).toHaveBeenCalledTimes(1);
    expect(dialog.form.name).toBe('My edit');
    expect(dialog.version.value).toBe(4);
  });

  it('runs the open hook after the form is refilled', async () => {
    let seen: YardForm | undefined;
    const dialog = yardForm({ onOpen: () => (seen = { ...dialog.form }) });
    await dialog.open(yard);
    expect(seen).toEqual({ name: 'Canal yard', ownerId });
  });
});
