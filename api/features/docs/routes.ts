import { Router } from 'express';
import { buildOpenApiDocument } from '../../lib/openapi';
import { openApiRegistrars } from './registrars';

/** GET /api/v1/openapi.json (mounted there) — generated once from the zod schemas, then served from memory. */
export function docsRouter(deps: { version: string }): Router {
  const router = Router();
  let document: ReturnType<typeof buildOpenApiDocument> | null = null;
  router.get('/', (_req, res) => {
    document ??= buildOpenApiDocument(openApiRegistrars, deps.version);
    res.json(document);
  });
  return router;
}
