import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { z, ZodType } from 'zod';
import type { ProblemFieldError } from '@hodboard/shared';
import { errors } from '../errors.js';
import type { Actor } from '../services/actor.js';

export interface ValidationSpec {
  body?: ZodType;
  query?: ZodType;
  params?: ZodType;
}

type Parsed<S extends ValidationSpec, K extends keyof ValidationSpec> = S[K] extends ZodType ? z.output<S[K]> : undefined;

export interface ValidInput<S extends ValidationSpec> {
  body: Parsed<S, 'body'>;
  query: Parsed<S, 'query'>;
  params: Parsed<S, 'params'>;
  actor: Actor;
}

export function toFieldErrors(issues: z.core.$ZodIssue[], prefix?: string): ProblemFieldError[] {
  return issues.map((issue) => ({
    path: [prefix, ...issue.path.map(String)].filter(Boolean).join('.') || '(root)',
    message: issue.message,
  }));
}

const specs = new WeakMap<RequestHandler, ValidationSpec>();

/** The schemas a route validates with, found among its handlers: the fuzz tests and the API document read them. */
export function validationSpecOf(handlers: readonly unknown[]): ValidationSpec | undefined {
  for (const handler of handlers) {
    const spec = typeof handler === 'function' ? specs.get(handler as RequestHandler) : undefined;
    if (spec) return spec;
  }
  return undefined;
}

/** The path of the first string holding U+0000, which PostgreSQL text cannot store, or null. */
export function findNul(value: unknown, path: string[] = []): string[] | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path : null;
  if (value && typeof value === 'object') {
    for (const [key, inner] of Object.entries(value)) {
      const found = findNul(key, path) ?? findNul(inner, [...path, key]);
      if (found) return found;
    }
  }
  return null;
}

/** Parses body, query and params with shared zod schemas; unknown keys are stripped by zod objects. */
export function validate(spec: ValidationSpec): RequestHandler {
  return (req, res, next) => {
    const problems: ProblemFieldError[] = [];
    const parsed: Record<string, unknown> = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = spec[part];
      if (!schema) continue;
      const nul = findNul(part === 'body' ? req.body : req[part]);
      if (nul) {
        problems.push({ path: [part === 'body' ? undefined : part, ...nul].filter(Boolean).join('.') || '(root)', message: 'Remove the NUL character' });
        continue;
      }
      const result = schema.safeParse(part === 'body' ? (req.body ?? {}) : req[part]);
      if (result.success) parsed[part] = result.data;
      else problems.push(...toFieldErrors(result.error.issues, part === 'body' ? undefined : part));
    }
    if (problems.length) return next(errors.validation(problems));
    res.locals.valid = parsed;
    next();
  };
}

/** A route handler that receives parsed, typed input and the signed-in actor. */
export function endpoint<S extends ValidationSpec>(
  spec: S,
  handler: (input: ValidInput<S>, req: Request, res: Response) => Promise<void>,
): RequestHandler[] {
  const run: RequestHandler = async (req: Request, res: Response, next: NextFunction) => {
    const valid = (res.locals.valid ?? {}) as Record<string, unknown>;
    try {
      await handler({ ...valid, actor: res.locals.actor } as ValidInput<S>, req, res);
    } catch (error) {
      next(error);
    }
  };
  const check = validate(spec);
  specs.set(check, spec);
  return [check, run];
}
