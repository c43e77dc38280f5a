import { Router } from 'express';
import { pushSubscriptionInputSchema, pushUnsubscribeSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { PushService } from '../services/push-service.js';

export function pushRouter(push: PushService): Router {
  const router = Router();
  router.get('/config', ...endpoint({}, async (_input, _req, res) => {
    res.json(push.config());
  }));
  router.post('/subscriptions', ...endpoint({ body: pushSubscriptionInputSchema }, async ({ actor, body }, _req, res) => {
    await push.subscribe(actor, body);
    res.status(204).end();
  }));
  router.post('/subscriptions/remove', ...endpoint({ body: pushUnsubscribeSchema }, async ({ actor, body }, _req, res) => {
    await push.unsubscribe(actor, body.endpoint);
    res.status(204).end();
  }));
  return router;
}
