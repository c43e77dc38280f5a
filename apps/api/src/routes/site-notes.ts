import { Router } from 'express';
import { siteNoteInputSchema, siteNoteListQuerySchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { SiteNoteService } from '../services/site-note-service.js';

export function siteNotesRouter(notes: SiteNoteService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: siteNoteListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await notes.list(actor, query.jobId));
  }));
  router.post('/', ...endpoint({ body: siteNoteInputSchema }, async ({ actor, body }, _req, res) => {
    const { note, isNew } = await notes.add(actor, body);
    res.status(isNew ? 201 : 200).json(note);
  }));
  return router;
}
