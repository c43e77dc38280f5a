import { Router } from 'express';
import { clientInputSchema, clientListQuerySchema, idParamsSchema, versionSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { ClientService } from '../services/client-service.js';

export function clientsRouter(clients: ClientService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: clientListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await clients.list(actor, query));
  }));
  router.get('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await clients.get(actor, params.id));
  }));
  router.post('/', ...endpoint({ body: clientInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await clients.create(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: clientInputSchema.and(versionSchema) }, async ({ actor, params, body }, _req, res) => {
    res.json(await clients.update(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await clients.remove(actor, params.id);
    res.status(204).end();
  }));
  return router;
}
