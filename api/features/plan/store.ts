/**
 * Specifications, campaign plans and comparisons as stored data. Every write runs in one
 * transaction with its audit event and names the version it last read (a stale version is a
 * ConflictError with `currentVersion`). A plan is computed on the server from the runs stored at
 * that moment; a client cannot send a result.
 */
import type { Knex } from 'knex';
import { recordAudit } from '../../lib/audit';
import { BadRequestError, ConflictError, NotFoundError } from '../../lib/errors';
import { Campaign } from '../../models/campaign';
import { Measurement } from '../../models/measurement';
import { CampaignPlan, Comparison, PlanSpecification } from '../../models/plan';
import { roleInProject } from '../projects/policy';
import { toEngineMeasurements } from '../campaigns/analysis';
import { getCampaign, isUuid, type ProjectActor } from '../campaigns/service';
import { specificationLnRatio, temperatureToK } from '../../science';
import { planFromScreen } from './service';
import { compareCampaignFits, type ComparedCampaign } from './compare';
import type { CampaignPlanInputs, ComparisonCreate, PlanResponse, SpecificationPut } from './schemas';

const specView = (s: PlanSpecification | undefined | null) =>
  s
    ? {
        measure: s.measure,
        minimum: s.minimum,
        probability: s.probability,
        runs: s.runs,
        version: s.version,
        updatedAt: new Date(s.updatedAt).toISOString(),
      }
    : null;
export type SpecificationView = NonNullable<ReturnType<typeof specView>>;

function stale(what: string, sent: number | undefined, current: number): ConflictError {
  return new ConflictError(
    sent === undefined
      ? `The ${what} already exists (version ${current}); send the version you last read to change it.`
      : `The ${what} was changed by someone else (you sent version ${sent}; it is now at version ${current}). Reload it and apply your change again.`,
    { currentVersion: current },
  );
}

// ── Specifications ────────────────────────────────────────────────────────────────────────────

export async function getProjectSpecification(db: Knex, projectId: string): Promise<SpecificationView | null> {
  return specView(await PlanSpecification.query(db).findOne({ projectId, campaignId: null }));
}

export async function getCampaignSpecification(db: Knex, projectId: string, campaignId: string) {
  await getCampaign(db, projectId, campaignId);
  const rows = await PlanSpecification.query(db)
    .where({ projectId })
    .andWhere((q) => q.whereNull('campaignId').orWhere({ campaignId }));
  const campaign = specView(rows.find((r) => r.campaignId === campaignId));
  const project = specView(rows.find((r) => r.campaignId === null));
  return {
    campaign,
    project,
    effective: campaign ?? project,
    source: campaign ? ('campaign' as const) : project ? ('project' as const) : null,
  };
}

/** Create or replace the project default (campaignId null) or a campaign's override. */
export async function putSpecification(
  db: Knex,
  actor: ProjectActor,
  campaignId: string | null,
  input: SpecificationPut,
): Promise<SpecificationView> {
  const { version, ...fields } = input;
  const values = { ...fields, runs: fields.runs ?? 1 };
  return db.transaction(async (trx) => {
    if (campaignId) await getCampaign(trx, actor.projectId, campaignId);
    const before = await PlanSpecification.query(trx).findOne({ projectId: actor.projectId, campaignId }).forUpdate();
    let after: PlanSpecification;
    if (!before) {
      after = await PlanSpecification.query(trx)
        .insert({ projectId: actor.projectId, campaignId, ...values, updatedByUserId: actor.actorUserId })
        .returning('*');
    } else {
      if (version !== before.version) throw stale('specification', version, before.version);
      after = await PlanSpecification.query(trx).patchAndFetchById(before.id, {
        ...values,
        version: before.version + 1,
        updatedByUserId: actor.actorUserId,
        updatedAt: new Date(),
      });
    }
    await recordAudit(trx, {
      projectId: actor.projectId,
      actorUserId: actor.actorUserId,
      action: before ? 'update' : 'create',
      entityType: campaignId ? 'campaign-specification' : 'project-specification',
      entityId: campaignId ?? actor.projectId,
      before: specView(before),
      after: specView(after),
    });
    return specView(after)!;
  });
}

// ── Campaign plans ────────────────────────────────────────────────────────────────────────────

const planView = (p: CampaignPlan) => ({
  campaignId: p.campaignId,
  inputs: p.inputs as unknown as CampaignPlanInputs,
  result: p.result as unknown as PlanResponse,
  version: p.version,
  updatedAt: new Date(p.updatedAt).toISOString(),
});
export type CampaignPlanView = ReturnType<typeof planView>;

export async function getCampaignPlan(db: Knex, projectId: string, campaignId: string): Promise<CampaignPlanView | null> {
  await getCampaign(db, projectId, campaignId);
  const plan = await CampaignPlan.query(db).findById(campaignId);
  return plan ? planView(plan) : null;
}

/** The runs of a campaign that carry conversion (strictly between 0 and 100 %) and a reaction time. */
function rateRunsOf(measurements: readonly Measurement[]) {
  return measurements
    .filter(
      (m) =>
        !m.excluded &&
        m.conversionPercent !== null &&
        m.reactionTimeS !== null &&
        m.conversionPercent > 0 &&
        m.conversionPercent < 100 &&
        m.reactionTimeS > 0,
    )
    .map((m) => ({
      temperature: { value: m.temperatureK, unit: 'K' as const },
      conversionPercent: m.conversionPercent!,
      time: { value: m.reactionTimeS!, unit: 's' as const },
    }));
}

/** Plan a stored campaign from its runs (pure apart from the reads): the same planner as POST /plan. */
export async function computeCampaignPlan(
  db: Knex | Knex.Transaction,
  projectId: string,
  campaign: Campaign,
  inputs: CampaignPlanInputs,
): Promise<PlanResponse> {
  const measurements = await Measurement.query(db).where({ campaignId: campaign.id }).orderBy('temperatureK').orderBy('id');
  let specification = inputs.specification;
  if (!specification) {
    const rows = await PlanSpecification.query(db)
      .where({ projectId })
      .andWhere((q) => q.whereNull('campaignId').orWhere({ campaignId: campaign.id }));
    const stored = rows.find((r) => r.campaignId === campaign.id) ?? rows.find((r) => r.campaignId === null);
    if (!stored) {
      throw new BadRequestError('No specification is set for this campaign or its project; send one with the plan or set one first.', [
        { path: 'inputs.specification', message: 'required: no campaign or project specification is stored' },
      ]);
    }
    specification = { measure: stored.measure, minimum: stored.minimum, probability: stored.probability, runs: stored.runs };
  }
  let rate;
  if (inputs.rate) {
    const runs = inputs.rate.runs ?? rateRunsOf(measurements);
    if (runs.length < 2) {
      throw new BadRequestError('The rate needs two or more runs with conversion and reaction time; this campaign has fewer.', [
        { path: 'inputs.rate.runs', message: `only ${runs.length} stored run(s) carry a conversion between 0 and 100 % and a time` },
      ]);
    }
    rate = { ...inputs.rate, runs };
  }
  const { rate: _omit, ...rest } = inputs;
  return planFromScreen(
    { measurements: toEngineMeasurements(campaign, measurements), weighting: inputs.weighting, uncertaintyScale: inputs.uncertaintyScale },
    { ...rest, specification, ...(rate ? { rate } : {}) },
  );
}

export async function putCampaignPlan(
  db: Knex,
  actor: ProjectActor,
  campaignId: string,
  input: { inputs: CampaignPlanInputs; version?: number | undefined },
): Promise<CampaignPlanView> {
  return db.transaction(async (trx) => {
    const campaign = await getCampaign(trx, actor.projectId, campaignId);
    const before = await CampaignPlan.query(trx).findById(campaignId).forUpdate();
    if (before && input.version !== before.version) throw stale('plan', input.version, before.version);
    if (!before && input.version !== undefined && input.version !== 1) throw stale('plan', input.version, 0);
    const result = await computeCampaignPlan(trx, actor.projectId, campaign, input.inputs);
    const row = {
      inputs: input.inputs as unknown as Record<string, unknown>,
      result: result as unknown as Record<string, unknown>,
      updatedByUserId: actor.actorUserId,
    };
    const after = before
      ? await CampaignPlan.query(trx).patchAndFetchById(campaignId, { ...row, version: before.version + 1, updatedAt: new Date() })
      : await CampaignPlan.query(trx)
          .insert({ campaignId, ...row })
          .returning('*');
    await recordAudit(trx, {
      projectId: actor.projectId,
      actorUserId: actor.actorUserId,
      action: before ? 'update' : 'create',
      entityType: 'campaign-plan',
      entityId: campaignId,
      before: before
        ? { inputs: before.inputs, recommended: (before.result as { recommended?: unknown }).recommended ?? null, version: before.version }
        : null,
      after: { inputs: after.inputs, recommended: result.recommended, version: after.version },
    });
    return planView(after);
  });
}

// ── Comparisons ───────────────────────────────────────────────────────────────────────────────

export async function resolveComparisonProjectId(db: Knex, comparisonId: unknown): Promise<string | null> {
  if (!isUuid(comparisonId)) return null;
  const row = await db('comparisons').where({ id: comparisonId }).first('projectId');
  return row?.projectId ?? null;
}

/** The campaigns the user may read, in the order asked; the others are marked unavailable. */
async function readableCampaigns(db: Knex, userId: string, ids: readonly string[]): Promise<(Campaign | null)[]> {
  const rows = await Campaign.query(db).whereIn('id', [...ids]);
  const out: (Campaign | null)[] = [];
  for (const id of ids) {
    const c = rows.find((r) => r.id === id);
    out.push(c && (await roleInProject(db, c.projectId, userId)) ? c : null);
  }
  return out;
}

async function compareStored(db: Knex, campaigns: (Campaign | null)[], ids: readonly string[], temperatureK: number) {
  const compared: ComparedCampaign[] = [];
  for (const [i, c] of campaigns.entries()) {
    if (!c) {
      compared.push({ id: ids[i]!, campaign: null, measurements: [] });
      continue;
    }
    compared.push({
      id: c.id,
      campaign: c,
      measurements: await Measurement.query(db).where({ campaignId: c.id }).orderBy('temperatureK').orderBy('id'),
    });
  }
  const result = compareCampaignFits(compared, temperatureK);
  // Each campaign against its own stored specification (its override, else its project's default).
  const projectIds = [...new Set(campaigns.flatMap((c) => (c ? [c.projectId] : [])))];
  const specs = projectIds.length ? await PlanSpecification.query(db).whereIn('projectId', projectIds) : [];
  return {
    ...result,
    campaigns: result.campaigns.map((entry, i) => {
      const c = campaigns[i];
      const stored = c
        ? (specs.find((s) => s.campaignId === c.id) ?? specs.find((s) => s.projectId === c.projectId && s.campaignId === null))
        : undefined;
      if (!stored) return { ...entry, specification: null, meetsAtTemperature: null };
      const lnRatio = specificationLnRatio({ measure: stored.measure, minimum: stored.minimum, probability: stored.probability });
      const specification = {
        measure: stored.measure,
        minimum: stored.minimum,
        probability: stored.probability,
        runs: stored.runs,
        lnRatio,
      };
      const meetsAtTemperature = entry.fit ? (entry.fit.at.lnRatio >= lnRatio ? ('meets' as const) : ('falls short' as const)) : null;
      return { ...entry, specification, meetsAtTemperature };
    }),
  };
}

/** A saved comparison as listed: what it compares and at which temperature, without its result. */
const comparisonHeading = (c: Pick<Comparison, 'id' | 'projectId' | 'name' | 'campaignIds' | 'temperatureK' | 'createdAt'>) => ({
  id: c.id,
  projectId: c.projectId,
  name: c.name,
  campaignIds: c.campaignIds,
  temperature: { kelvin: c.temperatureK, celsius: c.temperatureK - 273.15 },
  createdAt: new Date(c.createdAt).toISOString(),
});

const comparisonView = (c: Comparison, result: Awaited<ReturnType<typeof compareStored>>) => ({ ...comparisonHeading(c), result });
export type ComparisonView = ReturnType<typeof comparisonView>;

const scaleOf = (measure: string) => (measure === 'dr' ? 'diastereomer' : measure === 'ee' || measure === 'er' ? 'enantiomer' : 'any');

export async function createComparison(db: Knex, actor: ProjectActor, input: ComparisonCreate): Promise<ComparisonView> {
  const temperatureK = temperatureToK(input.temperature.value, input.temperature.unit, 'temperature.value');
  const campaigns = await readableCampaigns(db, actor.actorUserId, input.campaignIds);
  const errors = campaigns.flatMap((c, i) => (c ? [] : [{ path: `campaignIds.${i}`, message: 'no campaign you can read has this id' }]));
  if (errors.length > 0) throw new BadRequestError('Some campaigns cannot be compared: they do not exist or you cannot read them.', errors);
  // ee/er (enantiomers) and dr (diastereomers) describe different isomer pairs: no common scale.
  const scales = campaigns.map((c) => scaleOf(c!.measure));
  const first = scales.find((s) => s !== 'any');
  const mismatch = scales.findIndex((s) => s !== 'any' && s !== first);
  if (mismatch >= 0) {
    throw new BadRequestError('These campaigns report different isomer pairs (ee or er against dr) and have no common scale.', [
      {
        path: `campaignIds.${mismatch}`,
        message: `reported as ${campaigns[mismatch]!.measure}, which has no common scale with ${campaigns[scales.indexOf(first!)]!.measure}`,
      },
    ]);
  }
  const result = await compareStored(db, campaigns, input.campaignIds, temperatureK);
  return db.transaction(async (trx) => {
    const row = await Comparison.query(trx)
      .insert({
        projectId: actor.projectId,
        name: input.name,
        campaignIds: input.campaignIds,
        temperatureK,
        createdByUserId: actor.actorUserId,
      })
      .returning('*');
    await recordAudit(trx, {
      projectId: actor.projectId,
      actorUserId: actor.actorUserId,
      action: 'create',
      entityType: 'comparison',
      entityId: row.id,
      before: null,
      after: { name: row.name, campaignIds: row.campaignIds, temperatureK },
    });
    return comparisonView(row, result);
  });
}

export async function getComparison(db: Knex, projectId: string, userId: string, comparisonId: string): Promise<ComparisonView> {
  const row = await Comparison.query(db).findOne({ id: comparisonId, projectId });
  if (!row) throw new NotFoundError('No comparison was found at this address.');
  const campaigns = await readableCampaigns(db, userId, row.campaignIds);
  return comparisonView(row, await compareStored(db, campaigns, row.campaignIds, row.temperatureK));
}

/** Saved comparisons in every project the user belongs to, newest first. */
export async function listComparisons(db: Knex, userId: string) {
  const rows = await Comparison.query(db)
    .join('project_members as pm', 'pm.projectId', 'comparisons.projectId')
    .where('pm.userId', userId)
    .select('comparisons.*')
    .orderBy('comparisons.createdAt', 'desc')
    .limit(500);
  return rows.map(comparisonHeading);
}
