import { Router } from 'express';
import { crewDaysQuerySchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { CrewDayService } from '../services/crew-day-service.js';

export function crewDaysRouter(crewDays: CrewDayService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: crewDaysQuerySchema }, async ({ actor, query }, _req, res) => {
    res.set('Cache-Control', 'private, no-cache');
    res.json(await crewDays.days(actor, query));
  }));
  return router;
}
