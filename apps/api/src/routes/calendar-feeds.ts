import { Router } from 'express';
import { calendarFeedTokenParamsSchema, idParamsSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import type { CalendarFeedService } from '../services/calendar-feed-service.js';

export function calendarFeedsRouter(feeds: CalendarFeedService): Router {
  const router = Router();
  router.get('/', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await feeds.list(actor));
  }));
  router.post('/', ...endpoint({}, async ({ actor }, _req, res) => {
    res.status(201).json(await feeds.create(actor));
  }));
  router.delete('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    await feeds.revoke(actor, params.id);
    res.status(204).end();
  }));
  return router;
}

/** Calendar apps fetch this with no session; the secret in the path is the whole permission. */
export function publicCalendarRouter(feeds: CalendarFeedService): Router {
  const router = Router();
  router.get('/:token', ...endpoint({ params: calendarFeedTokenParamsSchema }, async ({ params }, _req, res) => {
    const body = await feeds.render(params.token);
    res.set({ 'Content-Type': 'text/calendar; charset=utf-8', 'Cache-Control': 'private, max-age=900', 'Content-Disposition': 'inline; filename="hodboard.ics"' });
    res.send(body);
  }));
  return router;
}
