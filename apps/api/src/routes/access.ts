import { Router } from 'express';
import { z } from 'zod';
import {
  accessBookingInputSchema,
  accessListQuerySchema,
  accessQuotedWeeksQuerySchema,
  accessStateChangeSchema,
  handoverUpdateSchema,
  idParamsSchema,
  inspectionInputSchema,
  inspectionParamsSchema,
  supplierInputSchema,
  supplierResponseSchema,
  versionSchema,
} from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { AccessService } from '../services/access-service.js';

export function suppliersRouter(access: AccessService): Router {
  const router = Router();
  router.get('/', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await access.listSuppliers(actor));
  }));
  router.post('/', ...endpoint({ body: supplierInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await access.createSupplier(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: supplierInputSchema.and(versionSchema) }, async ({ actor, params, body }, _req, res) => {
    res.json(await access.updateSupplier(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await access.removeSupplier(actor, params.id);
    res.status(204).end();
  }));
  return router;
}

export function accessBookingsRouter(access: AccessService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: accessListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await access.list(actor, query));
  }));
  router.get('/quoted-weeks', ...endpoint({ query: accessQuotedWeeksQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await access.quotedHireWeeks(actor, query.jobIds, query.accessType));
  }));
  router.get('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await access.get(actor, params.id));
  }));
  router.post('/', ...endpoint({ body: accessBookingInputSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await access.create(actor, body));
  }));
  router.post('/:id/state', ...endpoint({ params: idParamsSchema, body: accessStateChangeSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await access.changeState(actor, params.id, body));
  }));
  router.put('/:id/handover', ...endpoint({ params: idParamsSchema, body: handoverUpdateSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await access.recordHandover(actor, params.id, body));
  }));
  router.get('/:id/inspections', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await access.listInspections(actor, params.id));
  }));
  router.post('/:id/inspections', ...endpoint({ params: idParamsSchema, body: inspectionInputSchema }, async ({ actor, params, body }, _req, res) => {
    res.status(201).json(await access.recordInspection(actor, params.id, body));
  }));
  router.get('/:id/inspections/pdf', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    const pdf = await access.inspectionReport(actor, params.id);
    res.status(200).type('application/pdf').set('Content-Disposition', `attachment; filename="${pdf.filename}"`).set('Cache-Control', 'private, no-store').send(pdf.body);
  }));
  router.delete('/:id/inspections/:inspectionId', ...endpoint({ params: inspectionParamsSchema }, async ({ actor, params }, _req, res) => {
    await access.discardInspection(actor, params.id, params.inspectionId);
    res.status(204).end();
  }));
  return router;
}

const tokenParams = z.object({ token: z.string().min(20).max(200) });

/** Reached from a supplier's e-mail without signing in; the token alone names the one request. */
export function supplierLinksRouter(access: AccessService): Router {
  const router = Router();
  router.get('/:token', ...endpoint({ params: tokenParams }, async ({ params }, _req, res) => {
    res.json(await access.supplierLink(params.token));
  }));
  router.post('/:token', ...endpoint({ params: tokenParams, body: supplierResponseSchema }, async ({ params, body }, _req, res) => {
    res.json(await access.answerSupplierLink(params.token, body));
  }));
  return router;
}
