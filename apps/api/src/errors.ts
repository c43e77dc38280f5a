import type { ErrorCode, ProblemFieldError } from '@hodboard/shared';

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    readonly status: number,
    message: string,
    readonly fieldErrors?: ProblemFieldError[],
    readonly extensions?: Record<string, unknown>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

const titles: Record<ErrorCode, string> = {
  'validation-failed': 'Some details need fixing',
  unauthenticated: 'Sign-in needed',
  'token-invalid': 'Link or token not valid',
  'token-expired': 'Link or token expired',
  forbidden: 'Not allowed for your role',
  'not-found': 'Not found',
  conflict: 'Conflicts with the current state',
  'already-exists': 'Already exists',
  'stale-version': 'Changed by someone else',
  'illegal-transition': 'That status change is not allowed',
  'needs-confirmation': 'Please confirm',
  'rate-limited': 'Too many attempts',
  'payload-too-large': 'Request too large',
  'bad-credentials': 'E-mail or password not recognised',
  'service-unavailable': 'Temporarily unavailable',
  internal: 'Something went wrong on our side',
};

export function titleFor(code: ErrorCode): string {
  return titles[code];
}

export const errors = {
  validation: (fieldErrors: ProblemFieldError[], message = 'The request has invalid fields.') =>
    new AppError('validation-failed', 400, message, fieldErrors),
  unauthenticated: (message = 'Sign in to continue.') => new AppError('unauthenticated', 401, message),
  badCredentials: () => new AppError('bad-credentials', 401, 'The e-mail or password is not right.'),
  tokenInvalid: (message = 'This link or token is not valid.') => new AppError('token-invalid', 401, message),
  tokenExpired: (message = 'This link or token has expired.') => new AppError('token-expired', 401, message),
  forbidden: (message = 'Your role does not allow this.') => new AppError('forbidden', 403, message),
  notFound: (what: string) => new AppError('not-found', 404, `${what} was not found.`),
  conflict: (message: string) => new AppError('conflict', 409, message),
  alreadyExists: (message: string) => new AppError('already-exists', 409, message),
  staleVersion: (what: string, extensions?: Record<string, unknown>) =>
    new AppError('stale-version', 409, `${what} was changed by someone else; reload and try again.`, undefined, extensions),
  needsConfirmation: (message: string, extensions?: Record<string, unknown>) =>
    new AppError('needs-confirmation', 409, message, undefined, extensions),
  illegalTransition: (message: string) => new AppError('illegal-transition', 409, message),
  rateLimited: (message = 'Too many attempts; wait a few minutes and try again.') => new AppError('rate-limited', 429, message),
  unavailable: (message = 'The database is not reachable; try again shortly.') =>
    new AppError('service-unavailable', 503, message),
};
