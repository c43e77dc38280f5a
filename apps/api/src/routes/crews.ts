import { Router } from 'express';
import { crewInputSchema, crewListQuerySchema, idParamsSchema, versionSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { CrewService } from '../services/crew-service.js';

export function crewsRouter(crews: CrewService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: crewListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await crews.list(actor, query));
  }));
  router.get('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await crews.get(actor, params.id));
  }));
  router.post('/', ...endpoint({ body: crewInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await crews.create(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: crewInputSchema.and(versionSchema) }, async ({ actor, params, body }, _req, res) => {
    res.json(await crews.update(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await crews.remove(actor, params.id);
    res.status(204).end();
  }));
  return router;
}
