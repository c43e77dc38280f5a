import express, { Router } from 'express';
import { idParamsSchema, materialInputSchema, versionSchema } from '@hodboard/shared';
import { z } from 'zod';
import { endpoint } from '../middleware/validate.js';
import { errors } from '../errors.js';
import type { MaterialService } from '../services/material-service.js';

export function materialsRouter(materials: MaterialService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: z.object({ q: z.string().trim().max(200).optional() }) }, async ({ actor, query }, _req, res) => {
    res.json(await materials.list(actor, query.q));
  }));
  router.get('/export', ...endpoint({}, async ({ actor }, _req, res) => {
    const csv = await materials.exportCsv(actor);
    res.status(200).type('text/csv; charset=utf-8').set('Content-Disposition', 'attachment; filename="price-list.csv"').send(csv);
  }));
  // A price list can be far larger than the JSON limit, so CSV comes as text/csv with its own cap.
  router.post('/import', express.text({ type: ['text/csv', 'text/plain'], limit: '2mb' }), ...endpoint({}, async ({ actor }, req, res) => {
    if (typeof req.body !== 'string' || req.body.trim() === '') {
      throw errors.validation([{ path: '(body)', message: 'Send the CSV file as text/csv' }]);
    }
    res.json(await materials.importCsv(actor, req.body));
  }));
  router.post('/', ...endpoint({ body: materialInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await materials.create(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: materialInputSchema.and(versionSchema) }, async ({ actor, params, body }, _req, res) => {
    res.json(await materials.update(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await materials.remove(actor, params.id);
    res.status(204).end();
  }));
  return router;
}
