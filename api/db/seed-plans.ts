/**
 * Invented demo data for the temperature planner: the two demo projects' default specifications,
 * one invented dr screen in the aldol project, and a stored plan in each project — one with a
 * feasible operating window, one where no temperature the jacket reaches meets the specification.
 * Everything here is made up. Idempotent: rows that exist are left as they are.
 */
import type { Knex } from 'knex';
import { recordAudit } from '../lib/audit';
import { campaignPlanInputsSchema, computeCampaignPlan, type CampaignPlanInputs } from '../services';
import { Campaign } from '../models/campaign';
import { DEMO_PROJECTS } from './demo';
import { DEMO_CAMPAIGNS } from './demo-campaigns';

const R = 8.314462618; // J/(mol·K), CODATA 2018
const KB_OVER_H = 1.380649e-23 / 6.62607015e-34;

const [HYDROGENATION, ALDOL] = DEMO_PROJECTS;
export const DEMO_ALDOL_CAMPAIGN_ID = '6d1f0c4e-2a51-4c0e-9d7b-00000c5120a1';
/** The screen whose plan has a feasible window (the Skylark ligand in 2-MeTHF). */
export const DEMO_FEASIBLE_PLAN_CAMPAIGN_ID = DEMO_CAMPAIGNS[2]!.id;

export const DEMO_SPECIFICATIONS = [
  { projectId: HYDROGENATION!.id, measure: 'ee' as const, minimum: 99.0, probability: 0.95 },
  { projectId: ALDOL!.id, measure: 'dr' as const, minimum: 20, probability: 0.95 },
];

/** Invented truth of the aldol screen: ΔΔH‡ = 9 kJ/mol, ΔΔS‡ = 15 J/(mol·K); fixed invented scatter. */
const ALDOL_TEMPS_C = [-30, -30, -20, -20, -10, -10, 0, 0, 10, 10, 20, 20];
const ALDOL_SCATTER = [0.05, -0.04, 0.02, -0.06, 0.03, 0.01, -0.03, 0.05, -0.02, 0.04, -0.05, 0.02];
function aldolRuns() {
  return ALDOL_TEMPS_C.map((c, i) => {
    const t = c + 273.15;
    const lnR = 9_000 / (R * t) - 15 / R + ALDOL_SCATTER[i]!;
    // Invented main reaction: ΔH‡ = 52 kJ/mol, ΔS‡ = −120 J/(mol·K), first order.
    const k = KB_OVER_H * t * Math.exp(-120 / R) * Math.exp(-52_000 / (R * t));
    const hours = c <= -20 ? 24 : c <= -10 ? 8 : c <= 0 ? 4 : c <= 10 ? 1 : 0.5;
    return {
      temperatureK: t,
      measure: 'dr' as const,
      value: Math.round(Math.exp(lnR) * 10) / 10,
      valueB: 1,
      uncertainty: 0.05,
      replicateLabel: i % 2 === 0 ? 'a' : 'b',
      sampleId: `KL5120-P-${String(i + 1).padStart(3, '0')}`,
      conversionPercent: Math.round(1000 * (1 - Math.exp(-k * hours * 3600))) / 10,
      reactionTimeS: hours * 3600,
    };
  });
}

const PLANS: { campaignId: string; projectId: string; inputs: unknown }[] = [
  {
    campaignId: DEMO_FEASIBLE_PLAN_CAMPAIGN_ID,
    projectId: HYDROGENATION!.id,
    inputs: {
      temperatures: { from: { value: -70, unit: 'C' }, to: { value: 25, unit: 'C' } },
      rate: { targetConversionPercent: 95, maxTime: { value: 24, unit: 'h' } },
      nextRuns: { count: 3 },
    },
  },
  {
    campaignId: DEMO_ALDOL_CAMPAIGN_ID,
    projectId: ALDOL!.id,
    inputs: {
      // A brine-cooled vessel: nothing colder than −30 °C.
      temperatures: { from: { value: -30, unit: 'C' }, to: { value: 20, unit: 'C' } },
      rate: { targetConversionPercent: 95, maxTime: { value: 24, unit: 'h' } },
    },
  },
];

export async function seedDemoPlans(trx: Knex.Transaction): Promise<void> {
  const ownerOf = async (projectId: string) => {
    const login = DEMO_PROJECTS.find((p) => p.id === projectId)!.members.find((m) => m.role === 'owner')!.login;
    return (await trx('users').where({ provider: 'local-demo', login }).first('id'))?.id as string | undefined;
  };
  for (const spec of DEMO_SPECIFICATIONS) {
    if (!(await trx('projects').where({ id: spec.projectId }).first('id'))) continue;
    if (await trx('plan_specifications').where({ projectId: spec.projectId }).whereNull('campaignId').first('id')) continue;
    await trx('plan_specifications').insert({ ...spec, campaignId: null, runs: 1 });
  }
  if (
    (await trx('projects').where({ id: ALDOL!.id }).first('id')) &&
    !(await trx('campaigns').where({ id: DEMO_ALDOL_CAMPAIGN_ID }).first('id'))
  ) {
    const owner = await ownerOf(ALDOL!.id);
    await trx('campaigns').insert({
      id: DEMO_ALDOL_CAMPAIGN_ID,
      projectId: ALDOL!.id,
      title: 'Harrier-oxazaborolidine in CH₂Cl₂: temperature screen',
      reactionDescription:
        'Invented: aldol of the ketone KL-5120-K with the invented Harrier oxazaborolidine promoter (1.2 equiv) in CH₂Cl₂.',
      productNameA: 'syn-aldol KL-5120-S',
      productNameB: 'anti-aldol KL-5120-N',
      measure: 'dr',
      assayMethod: 'chiral-hplc',
      defaultUncertainty: 0.05,
      status: 'active',
      notes: 'Invented demo data — not real measurements. The plant vessel is brine-cooled (coldest −30 °C).',
      createdByUserId: owner ?? null,
    });
    await trx('measurements').insert(
      aldolRuns().map((m) => ({ ...m, campaignId: DEMO_ALDOL_CAMPAIGN_ID, createdByUserId: owner ?? null })),
    );
  }
  for (const plan of PLANS) {
    const campaign = await Campaign.query(trx).findById(plan.campaignId);
    if (!campaign || (await trx('campaign_plans').where({ campaignId: plan.campaignId }).first('campaignId'))) continue;
    const inputs: CampaignPlanInputs = campaignPlanInputsSchema.parse(plan.inputs);
    const result = await computeCampaignPlan(trx, plan.projectId, campaign, inputs);
    const owner = await ownerOf(plan.projectId);
    await trx('campaign_plans').insert({
      campaignId: plan.campaignId,
      inputs: JSON.stringify(inputs),
      result: JSON.stringify(result),
      updatedByUserId: owner ?? null,
    });
    if (owner) {
      await recordAudit(trx, {
        projectId: plan.projectId,
        actorUserId: owner,
        action: 'create',
        entityType: 'campaign-plan',
        entityId: plan.campaignId,
        before: null,
        after: { inputs, recommended: result.recommended, version: 1 },
      });
    }
  }
}
