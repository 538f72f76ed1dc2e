import { Router, type Request } from 'express';
import type { Knex } from 'knex';
import { parseBody } from '../../lib/validation';
import { authorizeProject, projectIdParam } from '../projects/policy';
import { resolveCampaignProjectId } from '../campaigns/service';
import { actorOf } from '../campaigns/route-helpers';
import { campaignPlanPutSchema, specificationPutSchema } from './schemas';
import { getCampaignPlan, getCampaignSpecification, getProjectSpecification, putCampaignPlan, putSpecification } from './store';

/**
 * A project's default specification, mounted at /v1/projects/:projectId/specification.
 * Viewers read, editors write; ids outside the caller's projects are 404.
 */
export function projectSpecificationRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router({ mergeParams: true });
  const byProject = (role: 'viewer' | 'editor') => authorizeProject(knex, role, projectIdParam);

  router.get('/', byProject('viewer'), async (req, res) => {
    res.json({ specification: await getProjectSpecification(knex, req.project!.id) });
  });

  router.put('/', byProject('editor'), async (req, res) => {
    res.json({ specification: await putSpecification(knex, actorOf(req), null, parseBody(specificationPutSchema, req.body)) });
  });

  return router;
}

/**
 * A campaign's own specification (overriding the project's) and its stored plan, mounted at
 * /v1/campaigns/:campaignId beside the campaigns router. Viewers read, editors write; ids outside
 * the caller's projects are 404. Saved comparisons have their own prefix: comparison-routes.ts.
 */
export function campaignPlanRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router({ mergeParams: true });
  const byCampaign = (role: 'viewer' | 'editor') =>
    authorizeProject(knex, role, (req) => resolveCampaignProjectId(knex, req.params.campaignId));
  const campaignId = (req: Request) => String(req.params.campaignId);

  router.get('/specification', byCampaign('viewer'), async (req, res) => {
    res.json(await getCampaignSpecification(knex, req.project!.id, campaignId(req)));
  });

  router.put('/specification', byCampaign('editor'), async (req, res) => {
    const input = parseBody(specificationPutSchema, req.body);
    await putSpecification(knex, actorOf(req), campaignId(req), input);
    res.json(await getCampaignSpecification(knex, req.project!.id, campaignId(req)));
  });

  router.get('/plan', byCampaign('viewer'), async (req, res) => {
    res.set('Cache-Control', 'private, no-store').json({ plan: await getCampaignPlan(knex, req.project!.id, campaignId(req)) });
  });

  router.put('/plan', byCampaign('editor'), async (req, res) => {
    const plan = await putCampaignPlan(knex, actorOf(req), campaignId(req), parseBody(campaignPlanPutSchema, req.body));
    res.set('ETag', `W/"${plan.version}"`).json({ plan });
  });

  return router;
}
