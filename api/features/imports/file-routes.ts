import { Router } from 'express';
import type { Knex } from 'knex';
import { authorizeProject } from '../projects/policy';
import { safeFileName } from '../campaigns/route-helpers';
import { readImportFile, resolveImportFileProjectId } from './files';

/** A stored import file, byte for byte, mounted at /v1/import-files (viewers of its project). */
export function importFilesRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router();

  router.get(
    '/:fileId',
    authorizeProject(knex, 'viewer', (req) => resolveImportFileProjectId(knex, req.params.fileId)),
    async (req, res) => {
      const file = await readImportFile(knex, req.project!.id, String(req.params.fileId));
      res
        .status(200)
        .type(file.mediaType)
        .attachment(safeFileName(file.fileName))
        .set({
          'Cache-Control': 'private, no-store',
          'X-Content-Type-Options': 'nosniff',
          'Content-Digest': `sha-256=:${Buffer.from(file.sha256, 'hex').toString('base64')}:`,
        })
        .send(file.content);
    },
  );

  return router;
}
