import { Router } from 'express';
import { z } from 'zod';
import { forecastRefreshSchema, holdWithdrawSchema, idParamsSchema, idSchema, replanSchema, weatherHoldInputSchema, weatherLimitsInputSchema } from '@hodboard/shared';
import { endpoint } from '../middleware/validate.js';
import { requirePermission } from '../services/actor.js';
import { FirmScope } from '../services/firm-scope.js';
import type { ForecastService } from '../services/weather/forecast-service.js';
import type { WeatherService } from '../services/weather/weather-service.js';
import { Site } from '../entities/index.js';
import type { DataSource } from 'typeorm';

export function weatherHoldsRouter(weather: WeatherService): Router {
  const router = Router();
  router.get('/', ...endpoint({ query: z.object({ jobId: idSchema.optional(), status: z.enum(['open', 'replanned', 'withdrawn']).optional() }) }, async ({ actor, query }, _req, res) => {
    res.json(await weather.listHolds(actor, query));
  }));
  router.get('/summary', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await weather.summary(actor));
  }));
  router.post('/', ...endpoint({ body: weatherHoldInputSchema }, async ({ actor, body }, _req, res) => {
    const { hold, created } = await weather.raise(actor, body);
    res.status(created ? 201 : 200).json(hold);
  }));
  router.post('/:id/preview', ...endpoint({ params: idParamsSchema, body: replanSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await weather.preview(actor, params.id, body));
  }));
  router.post('/:id/commit', ...endpoint({ params: idParamsSchema, body: replanSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await weather.commit(actor, params.id, body));
  }));
  router.post('/:id/withdraw', ...endpoint({ params: idParamsSchema, body: holdWithdrawSchema }, async ({ actor, params, body }, _req, res) => {
    res.json(await weather.withdraw(actor, params.id, body));
  }));
  return router;
}

export function weatherRouter(weather: WeatherService, forecasts: ForecastService, dataSource: DataSource): Router {
  const router = Router();
  router.get('/outlook', ...endpoint({ query: z.object({ days: z.coerce.number().int().min(1).max(14).default(7) }) }, async ({ actor, query }, _req, res) => {
    res.json(await weather.outlook(actor, query.days));
  }));
  router.get('/limits', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await weather.limits(actor));
  }));
  router.put('/limits', ...endpoint({ body: weatherLimitsInputSchema }, async ({ actor, body }, _req, res) => {
    res.json(await weather.updateLimits(actor, body));
  }));
  router.post('/refresh', ...endpoint({ body: forecastRefreshSchema }, async ({ actor, body }, _req, res) => {
    requirePermission(actor, 'jobs:manage');
    if (body.siteId) {
      const site = await new FirmScope(dataSource.manager, actor.firmId).get(Site, body.siteId, 'Site');
      const ok = await forecasts.refreshSite(site);
      res.json({ refreshed: ok ? 1 : 0, failed: ok ? 0 : 1 });
      return;
    }
    res.json(await forecasts.refreshAll(actor.firmId));
  }));
  return router;
}
