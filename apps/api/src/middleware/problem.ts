import type { ErrorRequestHandler, RequestHandler, Response } from 'express';
import type { Logger } from 'pino';
import { QueryFailedError, QueryRunnerAlreadyReleasedError } from 'typeorm';
import type { Problem } from '@hodboard/shared';
import { AppError, errors, titleFor } from '../errors.js';

export function sendProblem(res: Response, error: AppError): void {
  const problem: Problem = {
    ...error.extensions,
    type: `/problems/${error.code}`,
    title: titleFor(error.code),
    status: error.status,
    detail: error.message,
    code: error.code,
    ...(error.fieldErrors ? { errors: error.fieldErrors } : {}),
  };
  res.status(error.status).type('application/problem+json').send(JSON.stringify(problem));
}

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(errors.notFound(`${req.method} ${req.path}`));
};

const CONNECTION_ERRORS = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', '57P01', '57P02', '57P03', '08006', '08001', '08003']);

/** Turns anything thrown into one problem+json shape; only truly unknown errors are logged with their stack. */
export function problemHandler(logger: Logger): ErrorRequestHandler {
  return (error: unknown, _req, res, _next) => {
    void _next;
    const known = translate(error);
    if (known) return sendProblem(res, known);
    logger.error({ err: error }, 'unhandled error');
    sendProblem(res, new AppError('internal', 500, 'An unexpected error occurred. It has been logged.'));
  };
}

function translate(error: unknown): AppError | null {
  if (error instanceof AppError) return error;
  const anyError = error as { type?: string; status?: number; code?: string; message?: string; driverError?: { code?: string; detail?: string } };
  if (anyError?.type === 'entity.too.large') return new AppError('payload-too-large', 413, 'The request body is too large.');
  if (anyError?.type === 'entity.parse.failed') {
    return errors.validation([{ path: '(body)', message: 'The body is not valid JSON' }], 'The request body could not be read.');
  }
  if (anyError?.type === 'encoding.unsupported' || anyError?.type === 'charset.unsupported') {
    return errors.validation([{ path: '(body)', message: 'Unsupported encoding' }]);
  }
  // The router cannot decode a path segment such as `%E0%A4%A`.
  if (error instanceof URIError && anyError.status === 400) {
    return errors.validation([{ path: '(path)', message: 'The address has a broken %-escape' }], 'The address could not be read.');
  }
  if (error instanceof QueryFailedError) {
    const code = anyError.driverError?.code ?? anyError.code;
    if (code === '23505') return errors.alreadyExists('A record with these details already exists.');
    if (code === '23503') return errors.conflict('This record is still referenced by other records.');
    // 22021/22P05: text PostgreSQL cannot store (NUL, bytes outside UTF-8), should it get past validation.
    if (code === '22P02' || code === '22007' || code === '22008' || code === '22021' || code === '22P05') {
      return errors.validation([{ path: '(request)', message: 'A value has the wrong format' }]);
    }
  }
  if (anyError?.code && CONNECTION_ERRORS.has(anyError.code)) return errors.unavailable();
  // The connection dropped mid-transaction and TypeORM let go of it before COMMIT was sent: nothing was written.
  if (error instanceof QueryRunnerAlreadyReleasedError) return errors.unavailable();
  if (typeof anyError?.message === 'string' && /Connection terminated|connect ECONNREFUSED|timeout exceeded when trying to connect/i.test(anyError.message)) {
    return errors.unavailable();
  }
  return null;
}
