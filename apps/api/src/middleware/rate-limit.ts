import type { RequestHandler, Response } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { errors } from '../errors.js';

export interface LinkLimits {
  /** Requests per client address per window to the e-mailed links, whatever the answer. */
  requests: number;
  /** Of those, requests that fail (a link that is unknown, replaced or spent; a refused answer) before the address must wait. */
  misses: number;
}

const WINDOW_MS = 15 * 60_000;

function retryAfterMinutes(res: Response): number {
  const seconds = Number(res.getHeader('Retry-After'));
  return Number.isFinite(seconds) && seconds > 0 ? Math.ceil(seconds / 60) : WINDOW_MS / 60_000;
}

/**
 * For the links sent by e-mail to people without an account (a client's quote, its deposit, a supplier's answer):
 * the link is the only key, so guessing at links is cut short by counting failures apart from ordinary use.
 * Both limiters are shared by every link route, so one address has one budget across them.
 */
export function publicLinkLimiters(limits: LinkLimits): RequestHandler[] {
  const common = {
    windowMs: WINDOW_MS,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    keyGenerator: (req: { ip?: string }) => ipKeyGenerator(req.ip ?? ''),
    handler: (_req: unknown, res: Response, next: (error: unknown) => void) => {
      const minutes = retryAfterMinutes(res);
      next(errors.rateLimited(`Too many requests from your connection to these links; try again in ${minutes} ${minutes === 1 ? 'minute' : 'minutes'}.`));
    },
  };
  return [
    rateLimit({ ...common, limit: limits.requests, identifier: 'links' }),
    rateLimit({ ...common, limit: limits.misses, identifier: 'link-misses', skipSuccessfulRequests: true }),
  ];
}
