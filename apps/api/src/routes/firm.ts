import { Router } from 'express';
import { firmSettingsSchema, versionSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { FirmService } from '../services/firm-service.js';

export function firmRouter(firms: FirmService): Router {
  const router = Router();
  router.get('/', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await firms.get(actor));
  }));
  router.put('/', ...endpoint({ body: firmSettingsSchema.and(versionSchema) }, async ({ actor, body }, _req, res) => {
    res.json(await firms.update(actor, body));
  }));
  return router;
}
