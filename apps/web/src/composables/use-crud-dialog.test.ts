import { describe, expect, it } from 'vitest';
import { useCrudDialog } from './use-crud-dialog';

describe('useCrudDialog', () => {
  it('starts closed with nothing to edit', () => {
    const dialog = useCrudDialog<{ id: string }>();
    expect(dialog.isOpen.value).toBe(false);
    expect(dialog.editing.value).toBeNull();
  });

  it('opens on the chosen record to edit it, and on an empty form to add one', () => {
    const dialog = useCrudDialog<{ id: string }>();
    const crew = { id: 'crew-1' };
    dialog.openEdit(crew);
    expect(dialog.isOpen.value).toBe(true);
    expect(dialog.editing.value).toBe(crew);

    dialog.isOpen.value = false;
    dialog.openCreate();
    expect(dialog.isOpen.value).toBe(true);
    expect(dialog.editing.value).toBeNull();
  });
});
