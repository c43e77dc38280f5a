import { Router } from 'express';
import {
  assignmentCreateSchema,
  assignmentProgressSchema,
  assignmentRemoveSchema,
  assignmentUpdateSchema,
  boardQuerySchema,
  idParamsSchema,
  scheduleSinceSchema,
} from '@hodboard/shared';
import { gunzipSync } from 'node:zlib';
import { z } from 'zod';
import { endpoint } from '../middleware/validate.js';
import type { BoardCache } from '../services/board-cache.js';
import type { ScheduleService } from '../services/schedule-service.js';

export function boardRouter(schedule: ScheduleService, boards: BoardCache): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: boardQuerySchema }, async ({ actor, query }, req, res) => {
    const board = await boards.read(actor, query);
    // The browser keeps the body and asks again with If-None-Match; an unchanged board answers 304.
    res.set({ ETag: board.etag, 'Cache-Control': 'private, no-cache', 'Content-Type': 'application/json; charset=utf-8' });
    res.vary('Accept-Encoding');
    if (req.fresh) {
      res.status(304).end();
      return;
    }
    if (req.get('accept-encoding') && req.acceptsEncodings('gzip') === 'gzip') res.set('Content-Encoding', 'gzip').send(board.gzip);
    else res.send(gunzipSync(board.gzip));
  }));
  router.get('/changes', ...endpoint({ query: z.object({ afterEventId: z.coerce.number().int().min(0) }).pipe(scheduleSinceSchema) }, async ({ actor, query }, _req, res) => {
    res.json(await schedule.eventsSince(actor, query.afterEventId));
  }));
  return router;
}

export function assignmentsRouter(schedule: ScheduleService): Router {
  const router = Router();
  router.post('/', ...endpoint({ body: assignmentCreateSchema }, async ({ actor, body }, _req, res) => {
    res.status(201).json(await schedule.place(actor, body));
  }));
  router.put('/:id', ...endpoint({ params: idParamsSchema, body: assignmentUpdateSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await schedule.move(actor, params.id, body));
  }));
  router.post('/:id/progress', ...endpoint({ params: idParamsSchema, body: assignmentProgressSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await schedule.progress(actor, params.id, body));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema, query: assignmentRemoveSchema }, async ({ actor, params, query }, _req, res) => {
    res.json(await schedule.remove(actor, params.id, query.version));
  }));
  return router;
}
