import { ref, shallowRef, type Ref, type ShallowRef } from 'vue';

export interface CrudDialog<T> {
  /** The record the dialog edits; null when it adds a new one. */
  editing: ShallowRef<T | null>;
  isOpen: Ref<boolean>;
  openCreate(): void;
  openEdit(item: T): void;
}

/** Which record a list's form dialog is open for, if any. */
export function useCrudDialog<T>(): CrudDialog<T> {
  const editing = shallowRef<T | null>(null) as ShallowRef<T | null>;
  const isOpen = ref(false);

  function openCreate(): void {
    editing.value = null;
    isOpen.value = true;
  }

  function openEdit(item: T): void {
    editing.value = item;
    isOpen.value = true;
  }

  return { editing, isOpen, openCreate, openEdit };
}
