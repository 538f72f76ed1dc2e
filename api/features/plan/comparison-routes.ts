import { Router } from 'express';
import type { Knex } from 'knex';
import { parseBody } from '../../lib/validation';
import { requireUser } from '../auth/middleware';
import { authorizeProject } from '../projects/policy';
import { actorOf } from '../campaigns/route-helpers';
import { comparisonCreateSchema } from './schemas';
import { createComparison, getComparison, listComparisons, resolveComparisonProjectId } from './store';

/**
 * Saved comparisons, mounted at /v1/comparisons: the caller's list, save one in a project
 * (editors), read one (viewers of its project; other ids are 404).
 */
export function comparisonsRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router();

  router.get('/', requireUser, async (req, res) => {
    res.json({ comparisons: await listComparisons(knex, req.user!.id) });
  });

  // The project a comparison is saved in comes from the body: check its shape first (400), then the role.
  const byBodyProject = authorizeProject(knex, 'editor', (req) => parseBody(comparisonCreateSchema, req.body).projectId);
  router.post('/', byBodyProject, async (req, res) => {
    const view = await createComparison(knex, actorOf(req), parseBody(comparisonCreateSchema, req.body));
    res.status(201).location(`/api/v1/comparisons/${view.id}`).json(view);
  });

  router.get(
    '/:comparisonId',
    authorizeProject(knex, 'viewer', (req) => resolveComparisonProjectId(knex, req.params.comparisonId)),
    async (req, res) => {
      res.json(await getComparison(knex, req.project!.id, req.user!.id, String(req.params.comparisonId)));
    },
  );

  return router;
}
