import type { RequestHandler } from 'express';
import { errors } from '../errors.js';
import type { AuthService } from '../services/auth-service.js';

export function authenticate(auth: AuthService): RequestHandler {
  return async (req, res, next) => {
    const header = req.get('authorization');
    const match = header ? /^Bearer (.+)$/i.exec(header) : null;
    if (!match?.[1]) return next(errors.unauthenticated());
    try {
      res.locals.actor = await auth.authenticate(match[1]);
      next();
    } catch (error) {
      next(error);
    }
  };
}
