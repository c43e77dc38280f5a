import { Router, type CookieOptions, type RequestHandler, type Response } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import {
  acceptInviteSchema,
  forgotPasswordSchema,
  resetPasswordSchema,
  signInSchema,
  signUpSchema,
} from '@hodboard/shared';
import { errors } from '../errors.js';
import { endpoint } from '../middleware/validate.js';
import type { AuthService, IssuedSession } from '../services/auth-service.js';

export const REFRESH_COOKIE = 'hb_refresh';

export interface AuthRouterOptions {
  secureCookies: boolean;
  /** Attempts per client address and e-mail per window. */
  attemptsPerWindow: number;
  /** Attempts per client address per window, whatever the e-mail: one address cannot try password after password across accounts. */
  attemptsPerAddress: number;
}

export function authRouter(auth: AuthService, authenticated: RequestHandler, options: AuthRouterOptions): Router {
  const router = Router();
  const cookie: CookieOptions = { httpOnly: true, sameSite: 'strict', secure: options.secureCookies, path: '/api/auth' };
  const common = {
    windowMs: 15 * 60_000,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    handler: (_req: unknown, _res: unknown, next: (error: unknown) => void) => next(errors.rateLimited()),
  };
  const attempts = rateLimit({
    ...common,
    limit: options.attemptsPerWindow,
    identifier: 'auth-email',
    // Keyed by address and e-mail so one noisy office does not lock out its colleagues.
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String((req.body as { email?: unknown } | undefined)?.email ?? '').toLowerCase()}`,
  });
  // A higher ceiling per address alone, shared by sign-in and both reset steps.
  const addressAttempts = rateLimit({
    ...common,
    limit: options.attemptsPerAddress,
    identifier: 'auth-address',
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
  });

  const sendSession = (res: Response, issued: IssuedSession, status = 200) => {
    res.cookie(REFRESH_COOKIE, issued.refreshToken, { ...cookie, expires: issued.refreshExpiresAt });
    res.status(status).json(issued.session);
  };
  const readRefresh = (cookies: unknown): string | undefined =>
    typeof (cookies as Record<string, unknown> | undefined)?.[REFRESH_COOKIE] === 'string'
      ? ((cookies as Record<string, string>)[REFRESH_COOKIE])
      : undefined;

  router.post('/sign-up', attempts, ...endpoint({ body: signUpSchema }, async ({ body }, _req, res) => {
    sendSession(res, await auth.signUp(body), 201);
  }));
  router.post('/sign-in', addressAttempts, attempts, ...endpoint({ body: signInSchema }, async ({ body }, _req, res) => {
    sendSession(res, await auth.signIn(body));
  }));
  router.post('/refresh', ...endpoint({}, async (_input, req, res) => {
    try {
      sendSession(res, await auth.refresh(readRefresh(req.cookies)));
    } catch (error) {
      res.clearCookie(REFRESH_COOKIE, cookie);
      throw error;
    }
  }));
  router.post('/sign-out', ...endpoint({}, async (_input, req, res) => {
    await auth.signOut(readRefresh(req.cookies));
    res.clearCookie(REFRESH_COOKIE, cookie);
    res.status(204).end();
  }));
  router.post('/forgot-password', addressAttempts, attempts, ...endpoint({ body: forgotPasswordSchema }, async ({ body }, _req, res) => {
    await auth.forgotPassword(body);
    res.status(202).json({ detail: 'If an account uses this e-mail, a reset link is on its way.' });
  }));
  router.post('/reset-password', addressAttempts, attempts, ...endpoint({ body: resetPasswordSchema }, async ({ body }, _req, res) => {
    await auth.resetPassword(body);
    res.status(204).end();
  }));
  router.post('/accept-invite', attempts, ...endpoint({ body: acceptInviteSchema }, async ({ body }, _req, res) => {
    sendSession(res, await auth.acceptInvite(body));
  }));
  router.get('/me', authenticated, ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await auth.sessionFor(actor));
  }));
  return router;
}
