import { Router } from 'express';
import { costingReportQuerySchema, costingSettingsSchema, idParamsSchema, jobActualInputSchema } from '@hodboard/shared';
import { z } from 'zod';
import { endpoint } from '../middleware/validate.js';
import type { CostingReportService } from '../services/costing-report-service.js';
import type { CostingSettingsService } from '../services/costing-settings-service.js';

export function costingRouter(settings: CostingSettingsService, reports: CostingReportService): Router {
  const router = Router();
  router.get('/settings', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await settings.get(actor));
  }));
  router.put('/settings', ...endpoint({ body: costingSettingsSchema.and(z.object({ version: z.number().int().min(0) })) }, async ({ actor, body }, _req, res) => {
    res.json(await settings.update(actor, body));
  }));
  router.get('/report', ...endpoint({ query: costingReportQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await reports.report(actor, query));
  }));
  /** :id is the job's id: the figures belong to the job, compared with its accepted quote. */
  router.put('/actuals/:id', ...endpoint({ params: idParamsSchema, body: jobActualInputSchema }, async ({ actor, params, body }, _req, res) => {
    await reports.saveActual(actor, params.id, body);
    res.status(204).end();
  }));
  return router;
}
