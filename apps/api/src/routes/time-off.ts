import { Router } from 'express';
import { idParamsSchema, timeOffInputSchema, timeOffListQuerySchema, versionSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { TimeOffService } from '../services/time-off-service.js';

export function timeOffRouter(timeOff: TimeOffService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: timeOffListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await timeOff.list(actor, query));
  }));
  router.post('/', ...endpoint({ body: timeOffInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await timeOff.create(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: timeOffInputSchema.and(versionSchema) }, async ({ actor, params, body }, _req, res) => {
    res.json(await timeOff.update(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await timeOff.remove(actor, params.id);
    res.status(204).end();
  }));
  return router;
}
