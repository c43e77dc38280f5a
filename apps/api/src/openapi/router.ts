import { Router } from 'express';
import { buildOpenApiDocument, type DocumentedRoute } from './document.js';

/** Serves the document built from the live routes; built on first request, since the routes never change at run time. */
export function openApiRouter(routes: () => DocumentedRoute[]): Router {
  const router = Router();
  let document: string | undefined;
  router.get('/', (_req, res) => {
    document ??= JSON.stringify(buildOpenApiDocument(routes()));
    res.type('application/json').set('Cache-Control', 'public, max-age=300').send(document);
  });
  return router;
}
