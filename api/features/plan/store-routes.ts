import { Router, type Request } from 'express';
import type { Knex } from 'knex';
import { parseBody } from '../../lib/validation';
import { requireUser } from '../auth/middleware';
import { authorizeProject, projectIdParam } from '../projects/policy';
import { resolveCampaignProjectId, type ProjectActor } from '../campaigns/service';
import { campaignPlanPutSchema, comparisonCreateSchema, specificationPutSchema } from './schemas';
import {
  createComparison,
  getCampaignPlan,
  getCampaignSpecification,
  getComparison,
  getProjectSpecification,
  listComparisons,
  putCampaignPlan,
  putSpecification,
  resolveComparisonProjectId,
} from './store';

const actorOf = (req: Request): ProjectActor => ({ projectId: req.project!.id, actorUserId: req.user!.id });

/**
 * Specifications (project default, campaign override), a campaign's stored plan and saved
 * comparisons. Viewers read, editors write; ids outside the caller's projects are 404.
 */
export function planStoreRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router();
  const byProject = (role: 'viewer' | 'editor') => authorizeProject(knex, role, projectIdParam);
  const byCampaign = (role: 'viewer' | 'editor') =>
    authorizeProject(knex, role, (req) => resolveCampaignProjectId(knex, req.params.campaignId));
  const campaignId = (req: Request) => String(req.params.campaignId);

  router.get('/projects/:projectId/specification', byProject('viewer'), async (req, res) => {
    res.json({ specification: await getProjectSpecification(knex, req.project!.id) });
  });

  router.put('/projects/:projectId/specification', byProject('editor'), async (req, res) => {
    res.json({ specification: await putSpecification(knex, actorOf(req), null, parseBody(specificationPutSchema, req.body)) });
  });

  router.get('/campaigns/:campaignId/specification', byCampaign('viewer'), async (req, res) => {
    res.json(await getCampaignSpecification(knex, req.project!.id, campaignId(req)));
  });

  router.put('/campaigns/:campaignId/specification', byCampaign('editor'), async (req, res) => {
    const input = parseBody(specificationPutSchema, req.body);
    await putSpecification(knex, actorOf(req), campaignId(req), input);
    res.json(await getCampaignSpecification(knex, req.project!.id, campaignId(req)));
  });

  router.get('/campaigns/:campaignId/plan', byCampaign('viewer'), async (req, res) => {
    res.set('Cache-Control', 'private, no-store').json({ plan: await getCampaignPlan(knex, req.project!.id, campaignId(req)) });
  });

  router.put('/campaigns/:campaignId/plan', byCampaign('editor'), async (req, res) => {
    const plan = await putCampaignPlan(knex, actorOf(req), campaignId(req), parseBody(campaignPlanPutSchema, req.body));
    res.set('ETag', `W/"${plan.version}"`).json({ plan });
  });

  router.get('/comparisons', requireUser, async (req, res) => {
    res.json({ comparisons: await listComparisons(knex, req.user!.id) });
  });

  // The project a comparison is saved in comes from the body: check its shape first (400), then the role.
  const byBodyProject = authorizeProject(knex, 'editor', (req) => parseBody(comparisonCreateSchema, req.body).projectId);
  router.post('/comparisons', byBodyProject, async (req, res) => {
    const view = await createComparison(knex, actorOf(req), parseBody(comparisonCreateSchema, req.body));
    res.status(201).location(`/api/v1/comparisons/${view.id}`).json(view);
  });

  router.get(
    '/comparisons/:comparisonId',
    authorizeProject(knex, 'viewer', (req) => resolveComparisonProjectId(knex, req.params.comparisonId)),
    async (req, res) => {
      res.json(await getComparison(knex, req.project!.id, req.user!.id, String(req.params.comparisonId)));
    },
  );

  return router;
}
