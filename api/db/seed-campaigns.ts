import type { Knex } from 'knex';
import { recordAudit } from '../lib/audit';
import { toKelvin, toSeconds } from '../science/quantities';
import { DEMO_CAMPAIGN_PROJECT_ID, DEMO_CAMPAIGNS } from './demo-campaigns';
import { DEMO_PROJECTS } from './demo';

/**
 * The invented temperature screens of the first demo project (see demo-campaigns.ts). A
 * campaign that already exists is left as it is, with whatever people did to its measurements;
 * a demo project someone deleted is not recreated here.
 */
export async function seedDemoCampaigns(trx: Knex.Transaction): Promise<number> {
  const project = await trx('projects').where({ id: DEMO_CAMPAIGN_PROJECT_ID }).first('id');
  if (!project) return 0;
  const benchChemistLogin = DEMO_PROJECTS.find((p) => p.id === DEMO_CAMPAIGN_PROJECT_ID)!.members.find((m) => m.role === 'editor')!.login;
  const author = await trx('users').where({ provider: 'local-demo', login: benchChemistLogin }).first('id');
  const authorId: string | null = author?.id ?? null;
  let created = 0;
  for (const c of DEMO_CAMPAIGNS) {
    if (await trx('campaigns').where({ id: c.id }).first('id')) continue;
    const fields = {
      id: c.id,
      projectId: DEMO_CAMPAIGN_PROJECT_ID,
      title: c.title,
      reactionDescription: c.reactionDescription,
      productNameA: c.productNameA,
      productNameB: c.productNameB,
      measure: c.measure ?? 'ee',
      assayMethod: c.assayMethod,
      defaultUncertainty: c.defaultUncertainty,
      status: c.status,
      notes: c.notes,
    };
    await trx('campaigns').insert({ ...fields, createdByUserId: authorId });
    await trx('measurements').insert(
      c.points.map((p) => ({
        campaignId: c.id,
        temperatureK: toKelvin(p.temperatureC, 'C'),
        measure: c.measure ?? 'ee',
        value: c.measure === 'dr' ? p.dr! : p.eePercent,
        isLowerBound: p.isLowerBound,
        uncertainty: p.uncertainty,
        replicateLabel: p.replicateLabel,
        sampleId: p.sampleId,
        conversionPercent: p.conversionPercent,
        reactionTimeS: toSeconds(p.reactionTimeH, 'h'),
        notes: p.notes,
        createdByUserId: authorId,
      })),
    );
    if (authorId) {
      await recordAudit(trx, {
        projectId: DEMO_CAMPAIGN_PROJECT_ID,
        actorUserId: authorId,
        action: 'create',
        entityType: 'campaign',
        entityId: c.id,
        campaignId: c.id,
        before: null,
        after: { ...fields, measurementCount: c.points.length },
      });
    }
    created += 1;
  }
  return created;
}
