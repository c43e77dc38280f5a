import { ref, type Ref } from 'vue';
import type { z } from 'zod';
import type { ProblemFieldError } from '@hodboard/shared';
import { ApiError } from '@/api/http';

export type FieldErrors = Record<string, string>;

type IssuePath = readonly PropertyKey[];

export function pathKey(path: IssuePath): string {
  return path.map((part) => String(part)).join('.');
}

/** First message per field wins: zod lists the most basic failure (required) before finer ones. */
export function issuesToFieldErrors(issues: readonly { path: IssuePath; message: string }[]): FieldErrors {
  const errors: FieldErrors = {};
  for (const issue of issues) {
    const key = pathKey(issue.path) || 'form';
    errors[key] ??= issue.message;
  }
  return errors;
}

/** The API may name fields as JSON pointers (/site/postcode) or dotted paths, sometimes prefixed with the request part. */
export function normaliseProblemPath(path: string): string {
  // "(body)", "(root)" and the like name the whole request rather than a field.
  if (/^\(.*\)$/.test(path)) return '';
  return path
    .replace(/^\//, '')
    .replaceAll('/', '.')
    .replace(/^(body|query|params)\./, '');
}

export function problemToFieldErrors(errors: readonly ProblemFieldError[] | undefined): FieldErrors {
  const result: FieldErrors = {};
  for (const error of errors ?? []) {
    const key = normaliseProblemPath(error.path) || 'form';
    result[key] ??= error.message;
  }
  return result;
}

export interface FormErrors {
  errors: Ref<FieldErrors>;
  /** The message for a field, or for any nested item under it (memberIds.2 shows against memberIds). */
  errorFor(field: string): string | undefined;
  validate<S extends z.ZodType>(schema: S, values: unknown): z.output<S> | null;
  /** Shows a problem's field errors inline; returns false when it had none, so the caller can toast instead. */
  applyProblem(error: unknown): boolean;
  clear(field?: string): void;
}

export function useFormErrors(): FormErrors {
  const errors = ref<FieldErrors>({});

  function errorFor(field: string): string | undefined {
    const exact = errors.value[field];
    if (exact) return exact;
    const nested = Object.keys(errors.value).find((key) => key.startsWith(`${field}.`));
    return nested ? errors.value[nested] : undefined;
  }

  function validate<S extends z.ZodType>(schema: S, values: unknown): z.output<S> | null {
    const parsed = schema.safeParse(values);
    if (parsed.success) {
      errors.value = {};
      return parsed.data;
    }
    errors.value = issuesToFieldErrors(parsed.error.issues);
    return null;
  }

  function applyProblem(error: unknown): boolean {
    if (!(error instanceof ApiError) || !error.problem.errors?.length) return false;
    const fieldErrors = problemToFieldErrors(error.problem.errors);
    if (Object.keys(fieldErrors).every((key) => key === 'form')) return false;
    errors.value = fieldErrors;
    return true;
  }

  function clear(field?: string): void {
    if (field === undefined) {
      errors.value = {};
      return;
    }
    const next = { ...errors.value };
    for (const key of Object.keys(next)) if (key === field || key.startsWith(`${field}.`)) delete next[key];
    errors.value = next;
  }

  return { errors, errorFor, validate, applyProblem, clear };
}
