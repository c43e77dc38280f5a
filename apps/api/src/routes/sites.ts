import { Router } from 'express';
import { idParamsSchema, siteInputSchema, siteListQuerySchema, versionSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { SiteService } from '../services/site-service.js';

export function sitesRouter(sites: SiteService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: siteListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await sites.list(actor, query));
  }));
  router.get('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await sites.get(actor, params.id));
  }));
  router.post('/', ...endpoint({ body: siteInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await sites.create(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: siteInputSchema.and(versionSchema) }, async ({ actor, params, body }, _req, res) => {
    res.json(await sites.update(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await sites.remove(actor, params.id);
    res.status(204).end();
  }));
  return router;
}
