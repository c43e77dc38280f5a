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
  attemptsPerWindow: number;
}

export function authRouter(auth: AuthService, authenticated: RequestHandler, options: AuthRouterOptions): Router {
  const router = Router();
  const cookie: CookieOptions = { httpOnly: true, sameSite: 'strict', secure: options.secureCookies, path: '/api/auth' };
  const attempts = rateLimit({
    windowMs: 15 * 60_000,
    limit: options.attemptsPerWindow,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    // Keyed by address and e-mail so one noisy office does not lock out its colleagues.
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String((req.body as { email?: unknown } | undefined)?.email ?? '').toLowerCase()}`,
    handler: (_req, _res, next) => next(errors.rateLimited()),
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
  router.post('/sign-in', attempts, ...endpoint({ body: signInSchema }, async ({ body }, _req, res) => {
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
  router.post('/forgot-password', attempts, ...endpoint({ body: forgotPasswordSchema }, async ({ body }, _req, res) => {
    await auth.forgotPassword(body);
    res.status(202).json({ detail: 'If an account uses this e-mail, a reset link is on its way.' });
  }));
  router.post('/reset-password', attempts, ...endpoint({ body: resetPasswordSchema }, async ({ body }, _req, res) => {
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
