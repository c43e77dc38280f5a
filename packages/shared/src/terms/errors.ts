// The API's error vocabulary (RFC 9457 problem details), used by the web app's every request: no zod here.
export const errorCodes = [
  'validation-failed',
  'unauthenticated',
  'token-invalid',
  'token-expired',
  'forbidden',
  'not-found',
  'conflict',
  'already-exists',
  'stale-version',
  'illegal-transition',
  'needs-confirmation',
  'rate-limited',
  'payload-too-large',
  'bad-credentials',
  'service-unavailable',
  'internal',
] as const;
export type ErrorCode = (typeof errorCodes)[number];

export interface ProblemFieldError {
  path: string;
  message: string;
}

/** RFC 9457 problem details, as every API error is sent. */
export interface Problem {
  type: string;
  title: string;
  status: number;
  detail?: string;
  code: ErrorCode;
  errors?: ProblemFieldError[];
  /** Extension members some problems carry, e.g. the current state on a stale write. */
  [extension: string]: unknown;
}
