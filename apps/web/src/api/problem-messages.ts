import type { ErrorCode } from '@hodboard/shared';
import { ApiError } from './http';

export interface UserMessage {
  summary: string;
  detail: string;
}

const messages: Record<ErrorCode, UserMessage> = {
  'validation-failed': { summary: 'Check the form', detail: 'Some details need fixing before this can be saved.' },
  unauthenticated: { summary: 'Signed out', detail: 'Your session has ended. Sign in again to carry on.' },
  'token-invalid': { summary: 'Link not valid', detail: 'This link is not valid. Ask for a new one.' },
  'token-expired': { summary: 'Link expired', detail: 'This link has expired or was already used. Ask for a new one.' },
  forbidden: { summary: 'Not for your role', detail: 'Your role in this firm does not allow that.' },
  'not-found': { summary: 'Not found', detail: 'That record no longer exists. It may have been removed.' },
  conflict: { summary: 'Cannot do that now', detail: 'That clashes with the current state of the record.' },
  'already-exists': { summary: 'Already exists', detail: 'A record with those details already exists.' },
  'stale-version': {
    summary: 'Changed by someone else',
    detail: 'Someone saved this record after you opened it. The latest version has been loaded; check it and save again.',
  },
  'needs-confirmation': {
    summary: 'Please confirm',
    detail: 'This change needs your confirmation before Hodboard makes it.',
  },
  'illegal-transition': { summary: 'Status change not allowed', detail: 'A job cannot move to that status from here.' },
  'rate-limited': { summary: 'Too many attempts', detail: 'Wait a few minutes, then try again.' },
  'payload-too-large': { summary: 'Too large', detail: 'That is more than Hodboard accepts in one go.' },
  'bad-credentials': { summary: 'Sign-in failed', detail: 'That e-mail and password do not match an account.' },
  'service-unavailable': {
    summary: 'Server not reachable',
    detail: 'Hodboard could not reach the server. Check the connection and try again.',
  },
  internal: { summary: 'Something went wrong', detail: 'Hodboard hit an error on its side. Try again in a moment.' },
};

export function messageForCode(code: ErrorCode): UserMessage {
  return messages[code];
}

/** Prefers the server's own detail for conflicts, where it names the clashing record, and for limits, where it says how long to wait. */
export function messageForError(error: unknown): UserMessage {
  if (error instanceof ApiError) {
    const base = messages[error.code];
    const specific =
      error.code === 'conflict' ||
      error.code === 'already-exists' ||
      error.code === 'illegal-transition' ||
      error.code === 'needs-confirmation' ||
      error.code === 'rate-limited';
    return specific && error.problem.detail ? { summary: base.summary, detail: error.problem.detail } : base;
  }
  return messages.internal;
}
