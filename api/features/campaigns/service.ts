/**
 * Campaign, measurement and saved-forecast use cases. Every write runs in one transaction with
 * its audit event; every update or delete names the version the client last read, and a stale
 * version is a ConflictError carrying `currentVersion`. Routes call these after authorizeProject
 * and pass `req.project.id` and `req.user.id` as the actor.
 */
import type { Knex } from 'knex';
import objection from 'objection';
import type { ModelObject } from 'objection';
import { recordAudit, type AuditEventInput } from '../../lib/audit';
import { BadRequestError, ConflictError, NotFoundError } from '../../lib/errors';
import { quantitationLimitProblem } from '../calculators/schemas';
import { Campaign } from '../../models/campaign';
import { Measurement } from '../../models/measurement';
import { entityTag, runsStamp, serialisedCache, type SerialisedBody } from './serialised';
import { SavedForecast } from '../../models/saved-forecast';
import type { SelectivityInput } from '../../science/selectivity';
import {
  parseRatioPair,
  toKelvin,
  toSeconds,
  type CampaignCreate,
  type CampaignUpdate,
  type MeasurementCreate,
  type MeasurementExclusion,
  type MeasurementBatchUpdate,
  type MeasurementUpdate,
} from './schemas';

/** Who acts, in which project (from authorizeProject and the signed-in user). */
export interface ProjectActor {
  projectId: string;
  actorUserId: string;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/** Ids come from URLs; anything that is not a uuid cannot exist (and must not reach PostgreSQL as one). */
export const isUuid = (id: unknown): id is string => typeof id === 'string' && UUID.test(id);

const campaignNotFound = () => new NotFoundError('No campaign was found at this address in this project.');
const measurementNotFound = () => new NotFoundError('No measurement was found at this address in this project.');
const forecastNotFound = () => new NotFoundError('No saved forecast was found at this address in this project.');

function staleVersion(what: string, sent: number, current: number): ConflictError {
  return new ConflictError(
    `The ${what} was changed by someone else (you sent version ${sent}; it is now at version ${current}). Reload it and apply your change again.`,
    {
      currentVersion: current,
    },
  );
}

/** A plain JSON snapshot of a row for the audit trail. */
const snapshot = (model: objection.Model) => model.toJSON();

// ── Resolvers for authorizeProject ──────────────────────────────────────────────────────────

/** The project a campaign belongs to, or null (unknown id, or not a uuid). */
export async function resolveCampaignProjectId(db: Knex, campaignId: unknown): Promise<string | null> {
  if (!isUuid(campaignId)) return null;
  const row = await db('campaigns').where({ id: campaignId }).first('projectId');
  return row?.projectId ?? null;
}

export async function resolveMeasurementProjectId(db: Knex, measurementId: unknown): Promise<string | null> {
  if (!isUuid(measurementId)) return null;
  const row = await db('measurements as m')
    .join('campaigns as c', 'c.id', 'm.campaignId')
    .where('m.id', measurementId)
    .first('c.projectId');
  return row?.projectId ?? null;
}

export async function resolveSavedForecastProjectId(db: Knex, forecastId: unknown): Promise<string | null> {
  if (!isUuid(forecastId)) return null;
  const row = await db('savedForecasts as f').join('campaigns as c', 'c.id', 'f.campaignId').where('f.id', forecastId).first('c.projectId');
  return row?.projectId ?? null;
}

// ── Campaigns ──────────────────────────────────────────────────────────────────────────────

export interface CampaignSummary {
  campaign: Campaign;
  measurementCount: number;
  includedCount: number;
  distinctTemperatures: number;
  temperatureRangeK: { min: number; max: number } | null;
}

/** The project's campaigns, newest first, with what a list needs to show about their data. */
export async function listCampaigns(db: Knex, projectId: string): Promise<CampaignSummary[]> {
  const campaigns = await Campaign.query(db).where({ projectId }).orderBy('createdAt', 'desc').orderBy('id');
  if (campaigns.length === 0) return [];
  const stats: { campaignId: string; n: number; included: number; distinctT: number; minK: number | null; maxK: number | null }[] =
    await db('measurements')
      .whereIn(
        'campaignId',
        campaigns.map((c) => c.id),
      )
      .groupBy('campaignId')
      .select(
        'campaignId',
        db.raw('count(*)::int as n'),
        db.raw('count(*) filter (where not excluded)::int as included'),
        db.raw('count(distinct round(temperature_k::numeric, 2))::int as "distinctT"'),
        db.raw('min(temperature_k) as "minK"'),
        db.raw('max(temperature_k) as "maxK"'),
      );
  const byId = new Map(stats.map((s) => [s.campaignId, s]));
  return campaigns.map((campaign) => {
    const s = byId.get(campaign.id);
    return {
      campaign,
      measurementCount: s?.n ?? 0,
      includedCount: s?.included ?? 0,
      distinctTemperatures: s?.distinctT ?? 0,
      temperatureRangeK: s && s.minK !== null && s.maxK !== null ? { min: s.minK, max: s.maxK } : null,
    };
  });
}

/** One campaign of the project, or NotFoundError. */
export async function getCampaign(db: Knex | Knex.Transaction, projectId: string, campaignId: string): Promise<Campaign> {
  if (!isUuid(campaignId)) throw campaignNotFound();
  const campaign = await Campaign.query(db).findOne({ id: campaignId, projectId });
  if (!campaign) throw campaignNotFound();
  return campaign;
}

function translateUniqueTitle(err: unknown, title: string | undefined): never {
  if (err instanceof objection.UniqueViolationError && err.constraint === 'campaigns_project_title_unique') {
    throw new ConflictError(`A campaign titled "${title}" already exists in this project; choose another title.`);
  }
  throw err;
}

export async function createCampaign(db: Knex, actor: ProjectActor, input: CampaignCreate): Promise<Campaign> {
  try {
    return await db.transaction(async (trx) => {
      const campaign = await Campaign.query(trx)
        .insert({
          ...input,
          reactionDescription: input.reactionDescription ?? null,
          defaultUncertainty: input.defaultUncertainty ?? null,
          newRunUncertainty: input.newRunUncertainty ?? null,
          quantitationLimit: input.quantitationLimit ?? null,
          notes: input.notes ?? null,
          projectId: actor.projectId,
          createdByUserId: actor.actorUserId,
        })
        .returning('*');
      await audit(trx, actor, 'create', 'campaign', { entityId: campaign.id, campaignId: campaign.id, after: snapshot(campaign) });
      return campaign;
    });
  } catch (err) {
    translateUniqueTitle(err, input.title);
  }
}

/** Record, in the change's own transaction, what the actor did to one row (before/after default to null). */
function audit(
  trx: Knex.Transaction,
  actor: ProjectActor,
  action: AuditEventInput['action'],
  entityType: string,
  event: Pick<AuditEventInput, 'entityId' | 'campaignId' | 'reason'> & Partial<Pick<AuditEventInput, 'before' | 'after'>>,
): Promise<void> {
  return recordAudit(trx, {
    projectId: actor.projectId,
    actorUserId: actor.actorUserId,
    action,
    entityType,
    before: null,
    after: null,
    ...event,
  });
}

export async function updateCampaign(db: Knex, actor: ProjectActor, campaignId: string, input: CampaignUpdate): Promise<Campaign> {
  const { version, ...changes } = input;
  try {
    return await db.transaction(async (trx) => {
      const before = await getCampaignForUpdate(trx, actor.projectId, campaignId);
      if (before.version !== version) throw staleVersion('campaign', version, before.version);
      // The limit is read in the campaign's measure, so check it against the measure it will have.
      const limit = changes.quantitationLimit === undefined ? before.quantitationLimit : changes.quantitationLimit;
      const problem = limit === null ? null : quantitationLimitProblem(changes.measure ?? before.measure, limit);
      if (problem) {
        throw new BadRequestError(`quantitationLimit ${problem} for a campaign reported as ${changes.measure ?? before.measure}.`, [
          { path: 'quantitationLimit', message: `quantitationLimit ${problem}` },
        ]);
      }
      const [after] = await Campaign.query(trx)
        .patch({ ...changes, version: version + 1, updatedAt: new Date() })
        .where({ id: campaignId, version })
        .returning('*');
      await audit(trx, actor, 'update', 'campaign', { entityId: campaignId, campaignId, before: snapshot(before), after: snapshot(after) });
      return after;
    });
  } catch (err) {
    translateUniqueTitle(err, input.title);
  }
}

/** Delete a campaign with its measurements and saved forecasts (one audit event lists what went). */
export async function deleteCampaign(db: Knex, actor: ProjectActor, campaignId: string, version: number): Promise<void> {
  await db.transaction(async (trx) => {
    const before = await getCampaignForUpdate(trx, actor.projectId, campaignId);
    if (before.version !== version) throw staleVersion('campaign', version, before.version);
    const [{ n }] = await trx('measurements').where({ campaignId }).count({ n: '*' });
    const [{ f }] = await trx('savedForecasts').where({ campaignId }).count({ f: '*' });
    await Campaign.query(trx).deleteById(campaignId);
    await audit(trx, actor, 'delete', 'campaign', {
      entityId: campaignId,
      campaignId,
      before: { ...snapshot(before), measurementCount: Number(n), savedForecastCount: Number(f) },
    });
  });
}

/** Lock the campaign row for the rest of the transaction, so version checks cannot race. */
async function getCampaignForUpdate(trx: Knex.Transaction, projectId: string, campaignId: string): Promise<Campaign> {
  if (!isUuid(campaignId)) throw campaignNotFound();
  const campaign = await Campaign.query(trx).findOne({ id: campaignId, projectId }).forUpdate();
  if (!campaign) throw campaignNotFound();
  return campaign;
}

// ── Sign-off ───────────────────────────────────────────────────────────────────────────────

/** Audit entity types that change what a campaign holds; the last person behind one is its last editor. */
const EDITING_ENTITY_TYPES = ['campaign', 'measurement', 'measurement_batch', 'measurement_import'];

export interface SignOffView {
  at: string;
  by: string;
  byUserId: string | null;
  note: string | null;
}

const personName = (u: { login: string; displayName: string | null } | undefined) => (u ? (u.displayName ?? u.login) : 'a removed account');

/** Who signed the campaign off, when and with which note; null while it is open. */
export async function signOffOf(
  db: Knex | Knex.Transaction,
  campaign: Pick<Campaign, 'signedOffAt' | 'signedOffByUserId' | 'signOffNote'>,
): Promise<SignOffView | null> {
  if (!campaign.signedOffAt) return null;
  const user = campaign.signedOffByUserId
    ? await db('users').where({ id: campaign.signedOffByUserId }).first('login', 'displayName')
    : undefined;
  return {
    at: new Date(campaign.signedOffAt).toISOString(),
    by: personName(user),
    byUserId: campaign.signedOffByUserId,
    note: campaign.signOffNote,
  };
}

/** A signed-off campaign refuses any change to its measurements until it is reopened. */
export async function assertMeasurementsOpen(trx: Knex | Knex.Transaction, campaign: Campaign): Promise<void> {
  const signOff = await signOffOf(trx, campaign);
  if (!signOff) return;
  const day = new Date(signOff.at).toISOString().slice(0, 10);
  throw new ConflictError(
    `“${campaign.title}” was signed off by ${signOff.by} on ${day}; its measurements are locked. An owner or editor can reopen it, giving a reason, to change them.`,
    { signedOff: signOff },
  );
}

/** The user behind the latest change to the campaign or its measurements (null when nobody is on record). */
export async function lastEditorOf(
  db: Knex | Knex.Transaction,
  campaign: Pick<Campaign, 'id' | 'createdByUserId'>,
): Promise<string | null> {
  const row = await db('auditEvents')
    .where({ campaignId: campaign.id })
    .whereIn('entityType', EDITING_ENTITY_TYPES)
    .orderBy('id', 'desc')
    .first('actorUserId');
  return row ? row.actorUserId : campaign.createdByUserId;
}

/**
 * Sign a campaign off: its measurements are locked until someone reopens it with a reason. The
 * person signing must not be the campaign's last editor (a second pair of eyes).
 */
export async function signOffCampaign(
  db: Knex,
  actor: ProjectActor,
  campaignId: string,
  input: { note?: string | null },
): Promise<Campaign> {
  return db.transaction(async (trx) => {
    const before = await getCampaignForUpdate(trx, actor.projectId, campaignId);
    const current = await signOffOf(trx, before);
    if (current)
      throw new ConflictError(`“${before.title}” is already signed off (by ${current.by}, ${current.at.slice(0, 10)}).`, {
        signedOff: current,
      });
    const lastEditor = await lastEditorOf(trx, before);
    if (lastEditor === actor.actorUserId) {
      throw new ConflictError(`You made the last change to “${before.title}”; another owner or editor of the project must sign it off.`, {
        lastEditorUserId: lastEditor,
      });
    }
    const [after] = await Campaign.query(trx)
      .patch({
        signedOffAt: new Date(),
        signedOffByUserId: actor.actorUserId,
        signOffNote: input.note ?? null,
        version: before.version + 1,
        updatedAt: new Date(),
      })
      .where({ id: campaignId })
      .returning('*');
    const [{ n }] = await trx('measurements').where({ campaignId }).count({ n: '*' });
    await audit(trx, actor, 'update', 'campaign_sign_off', {
      entityId: campaignId,
      campaignId,
      reason: input.note ?? null,
      before: { title: before.title, signedOff: false },
      after: { title: after.title, signedOff: true, measurementCount: Number(n) },
    });
    return after;
  });
}

/** Reopen a signed-off campaign; the reason is kept in its history. */
export async function reopenCampaign(db: Knex, actor: ProjectActor, campaignId: string, input: { reason: string }): Promise<Campaign> {
  return db.transaction(async (trx) => {
    const before = await getCampaignForUpdate(trx, actor.projectId, campaignId);
    if (!before.signedOffAt) throw new ConflictError(`“${before.title}” is not signed off; there is nothing to reopen.`);
    const signOff = await signOffOf(trx, before);
    const [after] = await Campaign.query(trx)
      .patch({ signedOffAt: null, signedOffByUserId: null, signOffNote: null, version: before.version + 1, updatedAt: new Date() })
      .where({ id: campaignId })
      .returning('*');
    await audit(trx, actor, 'update', 'campaign_sign_off', {
      entityId: campaignId,
      campaignId,
      reason: input.reason,
      before: { title: before.title, signedOff: true, signedOffBy: signOff?.by ?? null, signedOffAt: signOff?.at ?? null },
      after: { title: after.title, signedOff: false },
    });
    return after;
  });
}

// ── Measurements ───────────────────────────────────────────────────────────────────────────

/**
 * A campaign's runs, coldest first, then in the order they were added (file order for imports), as
 * plain rows (the same fields a model instance serialises): building a thousand model instances only
 * to turn them back into JSON was most of the list's time.
 */
const measurementRows = (db: Knex, campaignId: string): Promise<ModelObject<Measurement>[]> =>
  db<ModelObject<Measurement>>(Measurement.tableName)
    .where({ campaignId })
    .orderBy('temperatureK')
    .orderBy('createdAt')
    .orderBy('sourceRow')
    .orderBy('id');

/** Serialised lists of runs by campaign id and the stamp of its runs (see serialised.ts). */
const measurementListCache = serialisedCache(16 * 1024 * 1024);

/**
 * The body of GET …/measurements (`{ measurements: [...] }`) as a JSON string with a weak ETag that
 * changes whenever a run is added, removed or changed. The runs say nothing about the caller, so one
 * entry serves every member who may read the campaign; authorization runs before this.
 */
export async function serialisedMeasurementList(db: Knex, projectId: string, campaignId: string): Promise<SerialisedBody> {
  const [campaign, stamp] = await Promise.all([getCampaign(db, projectId, campaignId), runsStamp(db, campaignId)]);
  const key = JSON.stringify([campaign.id, stamp.n, stamp.digest]);
  const cached = measurementListCache.get(key);
  if (cached) return cached;
  // The rows are read after the stamp, so they are never older than the key they are kept under.
  const entry = { etag: entityTag('m', key), body: JSON.stringify({ measurements: await measurementRows(db, campaignId) }) };
  measurementListCache.set(key, entry);
  return entry;
}

type MeasurementColumns = Partial<
  Pick<
    Measurement,
    | 'temperatureK'
    | 'measure'
    | 'value'
    | 'valueB'
    | 'isLowerBound'
    | 'uncertainty'
    | 'replicateLabel'
    | 'sampleId'
    | 'conversionPercent'
    | 'reactionTimeS'
    | 'notes'
  >
>;

/** Validated input (temperature with its unit, selectivity as number or "a:b") → stored columns (K, s). */
export function measurementColumns(input: Partial<MeasurementCreate>): MeasurementColumns {
  const out: MeasurementColumns = {};
  if (input.temperature) out.temperatureK = toKelvin(input.temperature.value, input.temperature.unit);
  if (input.selectivity) {
    const { measure, value, atLeast } = input.selectivity;
    out.measure = measure;
    out.isLowerBound = atLeast ?? false;
    if (typeof value === 'string') {
      const pair = parseRatioPair(value);
      // The schema already refused anything else; this keeps a bad direct call from storing NaN.
      if (!pair) throw new Error(`unvalidated selectivity value "${value}"`);
      out.value = pair.a;
      out.valueB = pair.b;
    } else {
      out.value = value;
      out.valueB = null;
    }
  }
  if ('uncertainty' in input) out.uncertainty = input.uncertainty ?? null;
  if ('replicateLabel' in input) out.replicateLabel = input.replicateLabel ?? null;
  if ('sampleId' in input) out.sampleId = input.sampleId ?? null;
  if ('conversionPercent' in input) out.conversionPercent = input.conversionPercent ?? null;
  if ('reactionTime' in input) out.reactionTimeS = input.reactionTime ? toSeconds(input.reactionTime.value, input.reactionTime.unit) : null;
  if ('notes' in input) out.notes = input.notes ?? null;
  return out;
}

/** The stored selectivity as the engine reads it (`parseSelectivity`, `sigmaLnRatio`). */
export function toSelectivityInput(m: Pick<Measurement, 'measure' | 'value' | 'valueB'>): SelectivityInput {
  return { measure: m.measure, value: m.valueB === null ? m.value : `${m.value}:${m.valueB}` };
}

export async function createMeasurement(db: Knex, actor: ProjectActor, campaignId: string, input: MeasurementCreate): Promise<Measurement> {
  return db.transaction(async (trx) => {
    await assertMeasurementsOpen(trx, await getCampaign(trx, actor.projectId, campaignId));
    const measurement = await Measurement.query(trx)
      .insert({ ...measurementColumns(input), campaignId, createdByUserId: actor.actorUserId })
      .returning('*');
    await audit(trx, actor, 'create', 'measurement', { entityId: measurement.id, campaignId, after: snapshot(measurement) });
    return measurement;
  });
}

/** Lock a measurement of the actor's project, or NotFoundError. */
async function getMeasurementForUpdate(trx: Knex.Transaction, projectId: string, measurementId: string): Promise<Measurement> {
  if (!isUuid(measurementId)) throw measurementNotFound();
  const measurement = await Measurement.query(trx)
    .select('measurements.*')
    .join('campaigns', 'campaigns.id', 'measurements.campaignId')
    .where('measurements.id', measurementId)
    .where('campaigns.projectId', projectId)
    .forUpdate()
    .first();
  if (!measurement) throw measurementNotFound();
  await assertMeasurementsOpen(trx, await Campaign.query(trx).findById(measurement.campaignId).forShare().throwIfNotFound());
  return measurement;
}

async function patchMeasurement(
  db: Knex,
  actor: ProjectActor,
  measurementId: string,
  version: number,
  columns: Partial<Pick<Measurement, 'excluded' | 'excludedReason'>> & MeasurementColumns,
  reason: string | null,
): Promise<Measurement> {
  return db.transaction(async (trx) => {
    const before = await getMeasurementForUpdate(trx, actor.projectId, measurementId);
    if (before.version !== version) throw staleVersion('measurement', version, before.version);
    const [after] = await Measurement.query(trx)
      .patch({ ...columns, version: version + 1, updatedAt: new Date() })
      .where({ id: measurementId, version })
      .returning('*');
    await audit(trx, actor, 'update', 'measurement', {
      entityId: measurementId,
      campaignId: before.campaignId,
      reason,
      before: snapshot(before),
      after: snapshot(after),
    });
    return after;
  });
}

export async function updateMeasurement(
  db: Knex,
  actor: ProjectActor,
  measurementId: string,
  input: MeasurementUpdate,
): Promise<Measurement> {
  const { version, reason, ...changes } = input;
  return patchMeasurement(db, actor, measurementId, version, measurementColumns(changes), reason);
}

/**
 * Change several runs of one campaign in one transaction: every row's version is checked (a stale
 * row is a 409 naming each stale row, and nothing is saved), the sign-off lock applies, and each
 * changed run gets its own audit event with its own reason, as a single change would.
 */
export async function updateMeasurementsBatch(
  db: Knex,
  actor: ProjectActor,
  campaignId: string,
  rows: MeasurementBatchUpdate['measurements'],
): Promise<Measurement[]> {
  return db.transaction(async (trx) => {
    await getCampaign(trx, actor.projectId, campaignId);
    // Runs first, then the campaign (shared), in the same order as a single change, so the two never deadlock.
    const ids = rows.map((r) => r.id);
    const locked = await Measurement.query(trx).whereIn('id', ids).where({ campaignId }).orderBy('id').forUpdate();
    const byId = new Map(locked.map((m) => [m.id, m]));
    const missing = rows.flatMap((r, i) =>
      byId.has(r.id) ? [] : [{ path: `measurements.${i}.id`, message: `no measurement ${r.id} in this campaign` }],
    );
    if (missing.length)
      throw new BadRequestError(`${missing.length} of the runs sent are not in this campaign; nothing was saved.`, missing);
    await assertMeasurementsOpen(trx, await Campaign.query(trx).findById(campaignId).forShare().throwIfNotFound());
    const stale = rows.flatMap((r, i) => {
      const current = byId.get(r.id)!.version;
      return current === r.version ? [] : [{ path: `measurements.${i}`, id: r.id, sentVersion: r.version, currentVersion: current }];
    });
    if (stale.length) {
      const named = stale.map((s) => `row ${Number(s.path.split('.')[1]) + 1} (version ${s.sentVersion}, now ${s.currentVersion})`);
      throw new ConflictError(
        `${stale.length === 1 ? 'A run was' : `${stale.length} runs were`} changed by someone else: ${named.join(', ')}. Reload them and apply your changes again; nothing was saved.`,
        { currentVersion: stale[0]!.currentVersion, staleRows: stale },
      );
    }
    const stamp = new Date();
    const saved: Measurement[] = [];
    for (const { id, version, reason, ...changes } of rows) {
      const before = byId.get(id)!;
      const [after] = await Measurement.query(trx)
        .patch({ ...measurementColumns(changes), version: version + 1, updatedAt: stamp })
        .where({ id, version })
        .returning('*');
      await audit(trx, actor, 'update', 'measurement', {
        entityId: id,
        campaignId,
        reason,
        before: snapshot(before),
        after: snapshot(after!),
      });
      saved.push(after!);
    }
    return saved;
  });
}

/** Exclude a point from fits with a reason, or include it again; it is never deleted by this. */
export async function setMeasurementExclusion(
  db: Knex,
  actor: ProjectActor,
  measurementId: string,
  input: MeasurementExclusion,
): Promise<Measurement> {
  return patchMeasurement(
    db,
    actor,
    measurementId,
    input.version,
    input.excluded ? { excluded: true, excludedReason: input.reason } : { excluded: false, excludedReason: null },
    input.excluded ? input.reason : null,
  );
}

export async function deleteMeasurement(
  db: Knex,
  actor: ProjectActor,
  measurementId: string,
  version: number,
  reason: string,
): Promise<void> {
  await db.transaction(async (trx) => {
    const before = await getMeasurementForUpdate(trx, actor.projectId, measurementId);
    if (before.version !== version) throw staleVersion('measurement', version, before.version);
    await Measurement.query(trx).deleteById(measurementId);
    await audit(trx, actor, 'delete', 'measurement', {
      entityId: measurementId,
      campaignId: before.campaignId,
      reason,
      before: snapshot(before),
    });
  });
}

// ── Saved forecasts ────────────────────────────────────────────────────────────────────────

export interface SaveForecastInput {
  temperatureK: number;
  label?: string | null;
  notes?: string | null;
  /** The analysis result at that temperature, computed by the caller with the engine; stored as is. */
  result: Record<string, unknown>;
}

export async function saveForecast(db: Knex, actor: ProjectActor, campaignId: string, input: SaveForecastInput): Promise<SavedForecast> {
  return db.transaction(async (trx) => {
    await getCampaign(trx, actor.projectId, campaignId);
    const forecast = await SavedForecast.query(trx)
      .insert({
        campaignId,
        temperatureK: input.temperatureK,
        label: input.label ?? null,
        notes: input.notes ?? null,
        result: input.result,
        createdByUserId: actor.actorUserId,
      })
      .returning('*');
    await audit(trx, actor, 'create', 'saved_forecast', { entityId: forecast.id, campaignId, after: snapshot(forecast) });
    return forecast;
  });
}

/** A campaign's saved forecasts, newest first. */
export async function listSavedForecasts(db: Knex, projectId: string, campaignId: string): Promise<SavedForecast[]> {
  await getCampaign(db, projectId, campaignId);
  return SavedForecast.query(db).where({ campaignId }).orderBy('createdAt', 'desc').orderBy('id');
}

export async function deleteSavedForecast(db: Knex, actor: ProjectActor, forecastId: string): Promise<void> {
  if (!isUuid(forecastId)) throw forecastNotFound();
  await db.transaction(async (trx) => {
    const forecast = await SavedForecast.query(trx)
      .select('savedForecasts.*')
      .join('campaigns', 'campaigns.id', 'savedForecasts.campaignId')
      .where('savedForecasts.id', forecastId)
      .where('campaigns.projectId', actor.projectId)
      .first();
    if (!forecast) throw forecastNotFound();
    await SavedForecast.query(trx).deleteById(forecastId);
    await audit(trx, actor, 'delete', 'saved_forecast', {
      entityId: forecastId,
      campaignId: forecast.campaignId,
      before: snapshot(forecast),
    });
  });
}

/** Most measurements one batch request may carry (the same cap as the stateless fit). */
export const MAX_BATCH_MEASUREMENTS = 5000;

/**
 * Add many measurements to a campaign in one transaction with one audit event: all are stored,
 * or none (a database refusal of any row rolls back every row).
 */
export async function createMeasurementsBatch(
  db: Knex,
  actor: ProjectActor,
  campaignId: string,
  inputs: MeasurementCreate[],
): Promise<number> {
  return db.transaction(async (trx) => {
    const campaign = await getCampaignForUpdate(trx, actor.projectId, campaignId);
    await assertMeasurementsOpen(trx, campaign);
    const stamp = new Date();
    const rows = inputs.map((input) => ({
      ...measurementColumns(input),
      campaignId,
      createdByUserId: actor.actorUserId,
      createdAt: stamp,
      updatedAt: stamp,
    }));
    // Chunked so a 5000-row batch stays well under PostgreSQL's bind-parameter limit.
    for (let i = 0; i < rows.length; i += 1000) await trx('measurements').insert(rows.slice(i, i + 1000));
    await trx('campaigns').where({ id: campaignId }).update({ updatedAt: stamp });
    await audit(trx, actor, 'create', 'measurement_batch', {
      entityId: campaignId,
      campaignId,
      after: { campaignTitle: campaign.title, rows: rows.length },
    });
    return rows.length;
  });
}
