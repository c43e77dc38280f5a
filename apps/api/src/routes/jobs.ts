import { Router } from 'express';
import { idParamsSchema, jobInputSchema, jobListQuerySchema, jobStatusChangeSchema, versionSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { JobService } from '../services/job-service.js';

export function jobsRouter(jobs: JobService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: jobListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await jobs.list(actor, query));
  }));
  router.get('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await jobs.get(actor, params.id));
  }));
  router.get('/:id/history', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await jobs.history(actor, params.id));
  }));
  router.post('/', ...endpoint({ body: jobInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await jobs.create(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: jobInputSchema.and(versionSchema) }, async ({ actor, params, body }, _req, res) => {
    res.json(await jobs.update(actor, params.id, body));
  }));
  router.post('/:id/status', ...endpoint({ params: idParamsSchema, body: jobStatusChangeSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await jobs.changeStatus(actor, params.id, body));
  }));
  return router;
}
