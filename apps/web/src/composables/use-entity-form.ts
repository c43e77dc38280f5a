import { computed, reactive, ref, watch, type ComputedRef, type Ref } from 'vue';
import type { z } from 'zod';
import { isApiError } from '@/api/http';
import { useFormErrors, type FormErrors } from './use-form-errors';
import { useProblemToast } from './use-problem-toast';

interface Versioned {
  version: number;
}

export interface EntityFormOptions<TEntity extends Versioned, TForm extends object, TSchema extends z.ZodType, TSaved> {
  visible: Ref<boolean>;
  /** The record being edited; null, or no getter at all, to add a new one. */
  entity?: () => TEntity | null;
  /** The form's values for that record, or for a new one; the form is refilled each time the dialog opens. */
  initial(entity: TEntity | null): TForm;
  schema: TSchema;
  /** What the schema checks, when that is not the form as it stands (pickers' dates, derived fields). */
  input?(form: TForm, entity: TEntity | null): unknown;
  /**
   * Plain words for picks left empty, shown over the schema's messages when the check fails:
   * an empty pick fails as a malformed id or date, which says nothing about what to do.
   */
  emptyPicks?: NoInfer<Partial<Record<keyof TForm & string, string>>>;
  persist(input: z.output<TSchema>, entity: TEntity | null, version: number): Promise<TSaved>;
  /** The toast once saved: summary and detail. */
  savedToast(saved: TSaved, isNew: boolean): [summary: string, detail?: string];
  onSaved?(saved: TSaved, isNew: boolean): void;
  /** After a stale-version refusal while editing: fetch what is current; a returned record refills the form. */
  refetch?(entity: TEntity): Promise<TEntity | void>;
  /** Runs each time the dialog opens, after the form is refilled. */
  onOpen?(): void;
}

export interface EntityForm<TForm> extends FormErrors {
  /** Reactive form values. */
  form: TForm;
  /** The version the form was filled from; updates send it so a stale one is refused. */
  version: Ref<number>;
  isEditing: ComputedRef<boolean>;
  isSaving: Ref<boolean>;
  /** Checks the form with the shared schema, saves, closes and toasts; a refusal shows inline or as a toast. */
  save(): Promise<void>;
}

/** The open/fill/check/save/refuse cycle every add-or-edit dialog shares; the dialog keeps its fields and words. */
export function useEntityForm<TEntity extends Versioned, TForm extends object, TSchema extends z.ZodType, TSaved>(
  options: EntityFormOptions<TEntity, TForm, TSchema, TSaved>,
): EntityForm<TForm> {
  const formErrors = useFormErrors();
  const { errors, validate, applyProblem, clear } = formErrors;
  const { showProblem, showSaved } = useProblemToast();
  const entity = (): TEntity | null => options.entity?.() ?? null;
  const form = reactive(options.initial(null)) as TForm;
  const version = ref(0);
  const isSaving = ref(false);
  const isEditing = computed(() => entity() !== null);

  function fill(record: TEntity | null): void {
    clear();
    Object.assign(form, options.initial(record));
    version.value = record?.version ?? 0;
  }

  watch(options.visible, (isOpen) => {
    if (!isOpen) return;
    fill(entity());
    options.onOpen?.();
  });

  async function save(): Promise<void> {
    const current = entity();
    const input = validate(options.schema, options.input ? options.input(form, current) : form);
    if (!input) {
      for (const [field, message] of Object.entries(options.emptyPicks ?? {}) as [keyof TForm & string, string][]) {
        if (!form[field]) errors.value = { ...errors.value, [field]: message };
      }
      return;
    }
    isSaving.value = true;
    try {
      const saved = await options.persist(input, current, version.value);
      const isNew = current === null;
      options.onSaved?.(saved, isNew);
      options.visible.value = false;
      showSaved(...options.savedToast(saved, isNew));
    } catch (error) {
      if (current && options.refetch && isApiError(error, 'stale-version')) {
        showProblem(error);
        const fresh = await options.refetch(current);
        if (fresh) fill(fresh);
      } else if (!applyProblem(error)) {
        showProblem(error);
      }
    } finally {
      isSaving.value = false;
    }
  }

  return { ...formErrors, form, version, isEditing, isSaving, save };
}
