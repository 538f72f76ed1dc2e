import { Router } from 'express';
import type { Knex } from 'knex';
import { parseBody } from '../../lib/validation';
import { authorizeProject, projectIdParam } from '../projects/policy';
import { historyCsv, readHistory } from '../audit/history';
import { compareCampaigns } from './analysis-comparison';
import { comparisonQuerySchema } from './analysis-schemas';
import { actorOf, etag, safeFileName, sendDownload } from './route-helpers';
import { historyQuerySchema } from './routes';
import { campaignCreateSchema } from './schemas';
import { createCampaign, listCampaigns } from './service';

/**
 * The campaign views reached through a project, mounted at /v1/projects/:projectId: its campaigns
 * (list, create), its history (owners) and the comparison of its campaigns at one temperature.
 */
export function projectCampaignsRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router({ mergeParams: true });
  const byProject = (role: 'viewer' | 'editor' | 'owner') => authorizeProject(knex, role, projectIdParam);

  router.get('/campaigns', byProject('viewer'), async (req, res) => {
    const list = await listCampaigns(knex, req.project!.id);
    res.json({ campaigns: list.map(({ campaign, ...stats }) => ({ ...campaign.toJSON(), ...stats })) });
  });

  router.post('/campaigns', byProject('editor'), async (req, res) => {
    const campaign = await createCampaign(knex, actorOf(req), parseBody(campaignCreateSchema, req.body));
    res.status(201).location(`/api/v1/campaigns/${campaign.id}`).set('ETag', etag(campaign.version)).json(campaign);
  });

  router.get('/history', byProject('owner'), async (req, res) => {
    res
      .set('Cache-Control', 'private, no-store')
      .json(await readHistory(knex, { projectId: req.project!.id }, parseBody(historyQuerySchema, req.query)));
  });

  router.get('/history.csv', byProject('owner'), async (req, res) => {
    const project = await knex('projects').where({ id: req.project!.id }).first('name');
    const csv = await historyCsv(knex, { projectId: req.project!.id });
    sendDownload(res, 'csv', `${safeFileName(String(project?.name ?? 'project'))}-history.csv`, csv);
  });

  router.get('/comparison', byProject('viewer'), async (req, res) => {
    const { at } = parseBody(comparisonQuerySchema, req.query);
    res.json(await compareCampaigns(knex, req.project!.id, at));
  });

  return router;
}
