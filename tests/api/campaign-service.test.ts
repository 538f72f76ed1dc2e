import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { closeTestKnex, testKnex } from '../support/db';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import { createCampaign, createMeasurements } from '../factories/campaigns';
import { sample } from '../unit/imports/helpers';
import { AppError, ConflictError, NotFoundError } from '../../api/lib/errors';
import { toProblem } from '../../api/lib/problem';
import { importMeasurements } from '../../api/features/imports/service';
import { readsInWorker } from '../../api/features/imports/parse';
import { ImportNeedsConfirmationError, ImportRejectedError } from '../../api/features/imports/errors';
import {
  importMappingSchema,
  measurementCreateSchema,
  campaignCreateSchema,
  measurementUpdateSchema,
} from '../../api/features/campaigns/schemas';
import * as service from '../../api/features/campaigns/service';
import { Measurement } from '../../api/models/measurement';
import type { User } from '../../api/models/user';
import type { Project } from '../../api/models/project';

let db: Knex;
let user: User;
let project: Project;
let otherProject: Project;

beforeAll(async () => {
  db = testKnex();
  user = await createUser();
  project = await createProject([{ user, role: 'owner' }]);
  otherProject = await createProject([{ user, role: 'owner' }]);
});
afterAll(closeTestKnex);

const actor = () => ({ projectId: project.id, actorUserId: user.id });
const count = async (table: string, where: Record<string, unknown>) => Number((await db(table).where(where).count({ n: '*' }).first())!.n);
const auditCount = (entityId: string) => count('audit_events', { entityId });

async function thrown(promise: Promise<unknown>): Promise<AppError> {
  try {
    await promise;
  } catch (err) {
    if (err instanceof AppError) return err;
    throw err;
  }
  throw new Error('expected a rejection');
}

/** A mapping of these columns for ee in %, temperatures in °C. */
const eeInCelsius = (columns: Record<string, number>) => importMappingSchema.parse({ columns, temperatureUnit: 'C', measure: 'ee' });

const skylarkMapping = importMappingSchema.parse({
  columns: { sampleId: 0, replicateLabel: 1, temperature: 2, value: 3, uncertainty: 4, conversionPercent: 5, reactionTime: 6, notes: 7 },
  temperatureUnit: 'K',
  measure: 'ee',
  timeUnit: 'h',
});

describe('importMeasurements', () => {
  it('when the clean sample is imported, then all 12 rows are stored in kelvin and ONE audit event summarises the import', async () => {
    const campaign = await createCampaign(project.id);
    const result = await importMeasurements(db, actor(), campaign.id, sample('kestrelmoor-skylark-screen.csv'), {
      mapping: skylarkMapping,
    });
    expect(result).toEqual({
      campaignId: campaign.id,
      inserted: 12,
      temperatureRangeK: { min: 253.15, max: 313.15 },
      distinctTemperatures: 6,
      warningCount: 0,
      file: expect.objectContaining({ name: 'kestrelmoor-skylark-screen.csv', sizeBytes: 550 }),
    });
    // Read as GET …/measurements sends them.
    const rows = (
      JSON.parse((await service.serialisedMeasurementList(db, project.id, campaign.id)).body) as { measurements: Measurement[] }
    ).measurements;
    expect(rows).toHaveLength(12);
    // Plain rows, serialised exactly as model instances of the same runs would be.
    const instances = await Measurement.query(db).whereIn(
      'id',
      rows.map((r) => r.id),
    );
    const byId = new Map(instances.map((m) => [m.id, JSON.stringify(m)]));
    expect(rows.map((r) => JSON.stringify(r))).toEqual(rows.map((r) => byId.get(r.id)));
    expect(rows[0]).toMatchObject({
      temperatureK: 253.15,
      measure: 'ee',
      sourceRow: 12,
      reactionTimeS: 48 * 3600,
      createdByUserId: user.id,
      version: 1,
    });
    const events = await db('audit_events').where({ entityId: campaign.id });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ action: 'create', entityType: 'measurement_import', actorUserId: user.id, projectId: project.id });
    expect(events[0].after).toMatchObject({ fileName: 'kestrelmoor-skylark-screen.csv', rows: 12, distinctTemperatures: 6 });
  });

  it('when one row of a file is bad, then nothing is written and the error names every bad row and column', async () => {
    const campaign = await createCampaign(project.id);
    const mapping = eeInCelsius({ sampleId: 0, replicateLabel: 1, temperature: 2, value: 3 });
    const file = {
      name: 'one-bad-row.csv',
      buffer: Buffer.from('sample,rep,T (°C),ee (%)\nA-1,a,25,96.5\nA-2,a,0,97.9\nA-3,a,-20,n.d.\nA-4,a,-30,99.0\n'),
    };
    const err = await thrown(importMeasurements(db, actor(), campaign.id, file, { mapping, acknowledgeWarnings: true }));
    expect(err).toBeInstanceOf(ImportRejectedError);
    expect(err.status).toBe(422);
    // errors[] points into the request (the file field); the place in the file travels in `issues`.
    expect(err.errors).toEqual([{ path: 'file', message: 'row 4, column D "ee (%)": ee "n.d." is not a number.' }]);
    expect(err.extra.issues).toEqual([{ severity: 'error', row: 4, column: 'D "ee (%)"', message: 'ee "n.d." is not a number.' }]);
    expect(err.message).toBe('one-bad-row.csv: 1 problem found; nothing was imported. Fix the file or the mapping and upload it again.');
    expect(await count('measurements', { campaignId: campaign.id })).toBe(0);
    expect(await auditCount(campaign.id)).toBe(0);
  });

  it('when the database fails after the rows were inserted, then the whole import rolls back', async () => {
    const campaign = await createCampaign(project.id);
    const lines = Array.from({ length: 2500 }, (_, i) => `${(200 + i * 0.04).toFixed(2)},${(90 + (i % 90) / 10).toFixed(1)},S-${i}`);
    const file = { name: 'big.csv', buffer: Buffer.from(`T (K),ee (%),sample\n${lines.join('\n')}\n`) };
    const mapping = importMappingSchema.parse({ columns: { temperature: 0, value: 1, sampleId: 2 }, temperatureUnit: 'K', measure: 'ee' });
    // An actor who is not a user: the measurements go in, then the audit insert breaks its foreign key.
    const ghost = { projectId: project.id, actorUserId: randomUUID() };
    await expect(importMeasurements(db, ghost, campaign.id, file, { mapping })).rejects.toThrow();
    expect(await count('measurements', { campaignId: campaign.id })).toBe(0);
    // The same file by a real user goes in completely.
    const ok = await importMeasurements(db, actor(), campaign.id, file, { mapping });
    expect(ok.inserted).toBe(2500);
    expect(await count('measurements', { campaignId: campaign.id })).toBe(2500);
  });

  it('when a file has warnings, then nothing is written until they are acknowledged', async () => {
    const campaign = await createCampaign(project.id);
    const mapping = importMappingSchema.parse({ columns: { temperature: 0, value: 1 }, temperatureUnit: 'C', measure: 'ee' });
    const file = { name: 'warn.csv', buffer: Buffer.from('T (°C),ee (%)\n25,96.5\n298,96.4\n') };
    const err = await thrown(importMeasurements(db, actor(), campaign.id, file, { mapping }));
    expect(err).toBeInstanceOf(ImportNeedsConfirmationError);
    expect(err.extra.issues).toEqual([
      {
        severity: 'warning',
        row: 3,
        column: 'A "T (°C)"',
        message: '298 labelled °C would be 571.15 K; it looks like a kelvin value. Check the unit.',
      },
    ]);
    expect(await count('measurements', { campaignId: campaign.id })).toBe(0);
    const ok = await importMeasurements(db, actor(), campaign.id, file, { mapping, acknowledgeWarnings: true });
    expect(ok).toMatchObject({ inserted: 2, warningCount: 1 });
  });

  it('when the same file is imported twice, then the repeats are warnings naming each row', async () => {
    const campaign = await createCampaign(project.id);
    await importMeasurements(db, actor(), campaign.id, sample('kestrelmoor-skylark-screen.csv'), { mapping: skylarkMapping });
    const err = await thrown(
      importMeasurements(db, actor(), campaign.id, sample('kestrelmoor-skylark-screen.csv'), { mapping: skylarkMapping }),
    );
    expect(err).toBeInstanceOf(ImportNeedsConfirmationError);
    const issues = err.extra.issues as { row: number; message: string }[];
    expect(issues.map((i) => i.row)).toEqual([2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13]);
    expect(issues[0].message).toContain('same sample id and replicate');
    expect(await count('measurements', { campaignId: campaign.id })).toBe(12);
  });

  it('when the campaign belongs to another project or the id is not a uuid, then it is not found and nothing is written', async () => {
    const foreign = await createCampaign(otherProject.id);
    expect(
      await thrown(importMeasurements(db, actor(), foreign.id, sample('kestrelmoor-skylark-screen.csv'), { mapping: skylarkMapping })),
    ).toBeInstanceOf(NotFoundError);
    expect(
      await thrown(importMeasurements(db, actor(), 'not-a-uuid', sample('kestrelmoor-skylark-screen.csv'), { mapping: skylarkMapping })),
    ).toBeInstanceOf(NotFoundError);
    expect(await count('measurements', { campaignId: foreign.id })).toBe(0);
  });
});

describe('importMeasurements: text as written', () => {
  it('when notes and sample ids hold backslashes, tabs, line breaks and quotes, then they are stored exactly as in the file', async () => {
    const campaign = await createCampaign(project.id);
    const mapping = eeInCelsius({ temperature: 0, value: 1, sampleId: 2, notes: 3 });
    const notes = ['C:\\runs\\12 \\N, not null', 'first line\nsecond\tafter a tab', 'quoted "word"\r\nand a CR', '\\.', 'Ω ± −20 °C'];
    const csvCell = (v: string) => `"${v.replace(/"/g, '""')}"`;
    const body = notes.map((n, i) => `${-10 * i},${90 + i},${csvCell(`S\\${i}\t`)},${csvCell(n)}`).join('\n');
    const file = { name: 'text.csv', buffer: Buffer.from(`T (°C),ee (%),sample,notes\n${body}\n`) };
    await importMeasurements(db, actor(), campaign.id, file, { mapping, acknowledgeWarnings: true });
    const stored = await db('measurements').where({ campaignId: campaign.id }).orderBy('sourceRow').select('sampleId', 'notes', 'valueB');
    expect(stored.map((r) => r.notes)).toEqual(notes.map((n) => n.trim()));
    expect(stored.map((r) => r.sampleId)).toEqual(notes.map((_n, i) => `S\\${i}`));
    expect(stored.every((r) => r.valueB === null)).toBe(true);
  });
});

describe('importMeasurements of a file read in the worker (rows inserted in batches while it is read)', () => {
  const mapping = eeInCelsius({ temperature: 0, value: 1, sampleId: 2 });
  /** An invented screen of `n` rows, more than the in-thread limit, so the worker reads it; `edit` changes one line. */
  const large = (name: string, n: number, edit?: (line: string, i: number) => string) => {
    const lines = Array.from({ length: n }, (_, i) => {
      const line = `${(-60 + (i % 80)).toFixed(1)},${(90 + (i % 90) / 10).toFixed(1)},LARGE-${name}-${i}`;
      return edit ? edit(line, i) : line;
    });
    const file = { name: `${name}.csv`, buffer: Buffer.from(`T (°C),ee (%),sample\n${lines.join('\n')}\n`) };
    expect(readsInWorker(file)).toBe(true);
    return file;
  };
  const files = (campaignId: string) => count('import_files', { campaignId });

  it('when every row is sound, then all go in, the kept file counts them, and one audit event sums them up', async () => {
    const campaign = await createCampaign(project.id);
    const n = 23_456;
    const result = await importMeasurements(db, actor(), campaign.id, large('sound', n), { mapping });
    expect(result).toMatchObject({
      inserted: n,
      temperatureRangeK: { min: 213.15, max: 292.15 },
      distinctTemperatures: 80,
      warningCount: 0,
    });
    expect(await count('measurements', { campaignId: campaign.id })).toBe(n);
    expect(await db('import_files').where({ campaignId: campaign.id }).first()).toMatchObject({ rowCount: n, format: 'csv' });
    const last = await db('measurements')
      .where({ campaignId: campaign.id, sourceRow: n + 1 })
      .first();
    expect(last).toMatchObject({ sampleId: `LARGE-sound-${n - 1}`, value: 90 + ((n - 1) % 90) / 10 });
    expect(await auditCount(campaign.id)).toBe(1);
  });

  it('when a row near the end is bad, after earlier batches were inserted, then nothing is kept and the row is named', async () => {
    const campaign = await createCampaign(project.id);
    const file = large('late-error', 25_000, (line, i) => (i === 24_321 ? line.replace(/,[^,]*,/, ',n.d.,') : line));
    const err = await thrown(importMeasurements(db, actor(), campaign.id, file, { mapping, acknowledgeWarnings: true }));
    expect(err).toBeInstanceOf(ImportRejectedError);
    expect(err.extra.issues).toEqual([{ severity: 'error', row: 24_323, column: 'B "ee (%)"', message: 'ee "n.d." is not a number.' }]);
    expect(await count('measurements', { campaignId: campaign.id })).toBe(0);
    expect(await files(campaign.id)).toBe(0);
    expect(await auditCount(campaign.id)).toBe(0);
  });

  it("when a late row or the campaign's own runs raise a warning, then nothing is kept until the warnings are acknowledged", async () => {
    const campaign = await createCampaign(project.id);
    const file = large('late-warning', 22_000, (line, i) => (i === 21_000 ? line.replace(/^[^,]*/, '298') : line));
    const err = await thrown(importMeasurements(db, actor(), campaign.id, file, { mapping }));
    expect(err).toBeInstanceOf(ImportNeedsConfirmationError);
    expect(err.extra.issues).toEqual([expect.objectContaining({ severity: 'warning', row: 21_002, column: 'A "T (°C)"' })]);
    expect(await count('measurements', { campaignId: campaign.id })).toBe(0);
    expect(await files(campaign.id)).toBe(0);
    expect(await importMeasurements(db, actor(), campaign.id, file, { mapping, acknowledgeWarnings: true })).toMatchObject({
      inserted: 22_000,
      warningCount: 1,
    });
    // The same file again: every row repeats a stored run; 50 are listed, the rest counted.
    const again = await thrown(importMeasurements(db, actor(), campaign.id, file, { mapping, acknowledgeWarnings: false }));
    expect(again).toBeInstanceOf(ImportNeedsConfirmationError);
    const repeats = (again.extra.issues as { row: number | null; message: string }[]).filter(
      (i) => i.row !== null && /already in the campaign/.test(i.message),
    );
    expect(repeats).toHaveLength(50);
    expect(again.extra.issues).toContainEqual({
      severity: 'warning',
      row: null,
      column: null,
      message: '21950 more rows repeat measurements already in the campaign.',
    });
    expect(await count('measurements', { campaignId: campaign.id })).toBe(22_000);
    expect(await files(campaign.id)).toBe(1);
  });
});

describe('campaign and measurement services', () => {
  it('when a campaign is created, updated with the current version, then with a stale one, then the stale update is a conflict carrying the current version', async () => {
    const created = await service.createCampaign(
      db,
      actor(),
      campaignCreateSchema.parse({ title: 'Versioned screen', measure: 'ee', assayMethod: 'chiral-sfc' }),
    );
    expect(created).toMatchObject({ version: 1, productNameA: 'A', productNameB: 'B', status: 'active', createdByUserId: user.id });
    const updated = await service.updateCampaign(db, actor(), created.id, { version: 1, notes: 'internal temperature logged' });
    expect(updated).toMatchObject({ version: 2, notes: 'internal temperature logged', title: 'Versioned screen' });
    const err = await thrown(service.updateCampaign(db, actor(), created.id, { version: 1, title: 'Lost update' }));
    expect(err).toBeInstanceOf(ConflictError);
    expect(err.extra).toEqual({ currentVersion: 2 });
    expect(toProblem(err)).toMatchObject({ status: 409, currentVersion: 2 });
    expect((await service.getCampaign(db, project.id, created.id)).title).toBe('Versioned screen');
    expect(await db('audit_events').where({ entityId: created.id }).orderBy('id').pluck('action')).toEqual(['create', 'update']);
  });

  it('when a second campaign takes an existing title (any case), then it is a conflict naming the title', async () => {
    await service.createCampaign(db, actor(), campaignCreateSchema.parse({ title: 'Unique title', measure: 'ee', assayMethod: 'nmr' }));
    const err = await thrown(
      service.createCampaign(db, actor(), campaignCreateSchema.parse({ title: 'UNIQUE TITLE ', measure: 'ee', assayMethod: 'nmr' })),
    );
    expect(err).toBeInstanceOf(ConflictError);
    expect(err.message).toBe('A campaign titled "UNIQUE TITLE" already exists in this project; choose another title.');
  });

  it('when a measurement is added in °C with an er pair, then it is stored in kelvin with both parts, and the engine input is rebuilt', async () => {
    const campaign = await createCampaign(project.id);
    const input = measurementCreateSchema.parse({
      temperature: { value: -20, unit: 'C' },
      selectivity: { measure: 'er', value: '97.5:2.5' },
      reactionTime: { value: 90, unit: 'min' },
    });
    const m = await service.createMeasurement(db, actor(), campaign.id, input);
    expect(m).toMatchObject({
      temperatureK: 253.15,
      measure: 'er',
      value: 97.5,
      valueB: 2.5,
      reactionTimeS: 5400,
      isLowerBound: false,
      version: 1,
    });
    expect(service.toSelectivityInput(m)).toEqual({ measure: 'er', value: '97.5:2.5' });
  });

  it('when a measurement is excluded with a reason, edited, and then edited with a stale version, then the last is a conflict', async () => {
    const campaign = await createCampaign(project.id);
    const [m] = await createMeasurements(campaign.id, [273.15]);
    const excluded = await service.setMeasurementExclusion(db, actor(), m.id, {
      version: 1,
      excluded: true,
      reason: 'sample warmed during work-up',
    });
    expect(excluded).toMatchObject({ excluded: true, excludedReason: 'sample warmed during work-up', version: 2 });
    const edited = await service.updateMeasurement(
      db,
      actor(),
      m.id,
      measurementUpdateSchema.parse({ version: 2, reason: 'assay repeated', uncertainty: 0.5 }),
    );
    expect(edited).toMatchObject({ uncertainty: 0.5, version: 3, excluded: true });
    const err = await thrown(service.setMeasurementExclusion(db, actor(), m.id, { version: 2, excluded: false }));
    expect(err).toBeInstanceOf(ConflictError);
    expect(err.extra).toEqual({ currentVersion: 3 });
    const back = await service.setMeasurementExclusion(db, actor(), m.id, { version: 3, excluded: false });
    expect(back).toMatchObject({ excluded: false, excludedReason: null, version: 4 });
    await expect(service.deleteMeasurement(db, actor(), m.id, 3, 'duplicate entry')).rejects.toBeInstanceOf(ConflictError);
    await service.deleteMeasurement(db, actor(), m.id, 4, 'duplicate entry');
    expect(await count('measurements', { id: m.id })).toBe(0);
    expect(await db('audit_events').where({ entityId: m.id }).orderBy('id').pluck('action')).toEqual([
      'update',
      'update',
      'update',
      'delete',
    ]);
  });

  it('when ids belong to another project or are not uuids, then services answer not found and resolvers null (never a database error)', async () => {
    const foreign = await createCampaign(otherProject.id);
    const [fm] = await createMeasurements(foreign.id, [298.15]);
    await expect(service.getCampaign(db, project.id, foreign.id)).rejects.toBeInstanceOf(NotFoundError);
    await expect(service.updateMeasurement(db, actor(), fm.id, { version: 1, reason: 'typo', notes: 'x' })).rejects.toBeInstanceOf(
      NotFoundError,
    );
    await expect(service.getCampaign(db, project.id, "1' or '1'='1")).rejects.toBeInstanceOf(NotFoundError);
    expect(await service.resolveCampaignProjectId(db, foreign.id)).toBe(otherProject.id);
    expect(await service.resolveMeasurementProjectId(db, fm.id)).toBe(otherProject.id);
    expect(await service.resolveCampaignProjectId(db, 'nope')).toBeNull();
    expect(await service.resolveCampaignProjectId(db, randomUUID())).toBeNull();
    expect(await service.resolveSavedForecastProjectId(db, ['array'])).toBeNull();
  });

  it('when campaigns are listed, then each carries its measurement count, included count and temperature range', async () => {
    const p = await createProject([{ user, role: 'owner' }]);
    const c = await createCampaign(p.id);
    await createMeasurements(c.id, [253.15, 273.15, 273.15]);
    await createMeasurements(c.id, [298.15], { excluded: true, excludedReason: 'stirring failed' });
    await createCampaign(p.id);
    const list = await service.listCampaigns(db, p.id);
    const summary = list.find((s) => s.campaign.id === c.id)!;
    expect(summary).toMatchObject({
      measurementCount: 4,
      includedCount: 3,
      distinctTemperatures: 3,
      temperatureRangeK: { min: 253.15, max: 298.15 },
    });
    expect(list.find((s) => s.campaign.id !== c.id)).toMatchObject({ measurementCount: 0, temperatureRangeK: null });
  });

  it('when a forecast is saved, then its snapshot round-trips; deleting the campaign takes its data with it in one audit event', async () => {
    const campaign = await service.createCampaign(
      db,
      actor(),
      campaignCreateSchema.parse({ title: 'Forecast screen', measure: 'ee', assayMethod: 'chiral-hplc' }),
    );
    await createMeasurements(campaign.id, [253.15, 273.15, 298.15]);
    const snapshot = { eePercent: 98.9, interval: { low: 98.1, high: 99.4 }, model: 'single-line' };
    const f = await service.saveForecast(db, actor(), campaign.id, { temperatureK: 243.15, label: 'plant brine limit', result: snapshot });
    expect((await service.listSavedForecasts(db, project.id, campaign.id)).map((x) => [x.id, x.result])).toEqual([[f.id, snapshot]]);
    await expect(service.deleteCampaign(db, actor(), campaign.id, 7)).rejects.toBeInstanceOf(ConflictError);
    await service.deleteCampaign(db, actor(), campaign.id, 1);
    expect(await count('measurements', { campaignId: campaign.id })).toBe(0);
    expect(await count('saved_forecasts', { campaignId: campaign.id })).toBe(0);
    const last = await db('audit_events').where({ entityId: campaign.id }).orderBy('id', 'desc').first();
    expect(last).toMatchObject({ action: 'delete', entityType: 'campaign' });
    expect(last.before).toMatchObject({ measurementCount: 3, savedForecastCount: 1 });
  });
});

describe('database constraints repeat the zod rules', () => {
  // Each case: an input the schema refuses, and the stored row it would have become, inserted directly.
  const cases: { name: string; input: unknown; row: Record<string, unknown>; constraint: string }[] = [
    {
      name: 'a temperature at 0 K',
      input: { temperature: { value: 0, unit: 'K' }, selectivity: { measure: 'ee', value: 90 } },
      row: { temperatureK: 0 },
      constraint: 'measurements_temperature_range',
    },
    {
      name: 'a temperature below absolute zero',
      input: { temperature: { value: -300, unit: 'C' }, selectivity: { measure: 'ee', value: 90 } },
      row: { temperatureK: -26.85 },
      constraint: 'measurements_temperature_range',
    },
    {
      name: 'ee over 100',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'ee', value: 104.2 } },
      row: { value: 104.2 },
      constraint: 'measurements_ee_range',
    },
    {
      name: 'ee of exactly 100',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'ee', value: 100 } },
      row: { value: 100 },
      constraint: 'measurements_ee_range',
    },
    {
      name: 'percent A of 100',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'percentA', value: 100 } },
      row: { measure: 'percentA', value: 100 },
      constraint: 'measurements_percent_a_range',
    },
    {
      name: 'a ratio of zero',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'ratio', value: 0 } },
      row: { measure: 'dr', value: 0 },
      constraint: 'measurements_ratio_positive',
    },
    {
      name: 'a pair with a zero part',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'er', value: '100:0' } },
      row: { measure: 'er', value: 100, valueB: 0 },
      constraint: 'measurements_pair_positive',
    },
    {
      name: 'a pair given for ee',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'ee', value: '95:5' } },
      row: { value: 95, valueB: 5 },
      constraint: 'measurements_ee_range',
    },
    {
      name: 'conversion over 100 %',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'ee', value: 90 }, conversionPercent: 130 },
      row: { conversionPercent: 130 },
      constraint: 'measurements_conversion_range',
    },
    {
      name: 'a negative uncertainty',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'ee', value: 90 }, uncertainty: -0.3 },
      row: { uncertainty: -0.3 },
      constraint: 'measurements_uncertainty_range',
    },
    {
      name: 'an unknown measure',
      input: { temperature: { value: 25, unit: 'C' }, selectivity: { measure: 'de', value: 90 } },
      row: { measure: 'de' },
      constraint: 'measurements_measure_known',
    },
  ];

  it.each(cases)('when $name is sent, then zod refuses it and a direct insert breaks $constraint', async ({ input, row, constraint }) => {
    expect(measurementCreateSchema.safeParse(input).success).toBe(false);
    const campaign = await createCampaign(project.id);
    const err = await db('measurements')
      .insert({ campaignId: campaign.id, temperatureK: 298.15, measure: 'ee', value: 90, ...row })
      .then(
        () => null,
        (e: { code?: string; constraint?: string }) => e,
      );
    expect(err).toMatchObject({ code: '23514', constraint });
  });

  it('when NaN or Infinity reach the database directly, then they are refused too', async () => {
    const campaign = await createCampaign(project.id);
    for (const [row, constraint] of [
      [{ temperatureK: Number.NaN }, 'measurements_temperature_range'],
      [{ temperatureK: Number.POSITIVE_INFINITY }, 'measurements_temperature_range'],
      [{ measure: 'ratio', value: Number.POSITIVE_INFINITY }, 'measurements_value_finite'],
    ] as [Record<string, unknown>, string][]) {
      const err = await db('measurements')
        .insert({ campaignId: campaign.id, temperatureK: 298.15, measure: 'ee', value: 90, ...row })
        .then(
          () => null,
          (e: { constraint?: string }) => e,
        );
      expect(err).toMatchObject({ constraint });
    }
  });

  it('when an exclusion has no reason, or a reason without exclusion, then the database refuses it', async () => {
    const campaign = await createCampaign(project.id);
    for (const row of [{ excluded: true }, { excluded: true, excludedReason: '  ' }, { excluded: false, excludedReason: 'why?' }]) {
      const err = await db('measurements')
        .insert({ campaignId: campaign.id, temperatureK: 298.15, measure: 'ee', value: 90, ...row })
        .then(
          () => null,
          (e: { constraint?: string }) => e,
        );
      expect(err).toMatchObject({ constraint: 'measurements_exclusion_reason' });
    }
  });

  it('when a campaign row breaks its rules directly, then the database refuses it', async () => {
    for (const [row, constraint] of [
      [{ title: '   ' }, 'campaigns_title_present'],
      [{ assayMethod: 'polarimetry' }, 'campaigns_assay_method_known'],
      [{ status: 'lost' }, 'campaigns_status_known'],
      [{ version: 0 }, 'campaigns_version_positive'],
    ] as [Record<string, unknown>, string][]) {
      const err = await db('campaigns')
        .insert({
          projectId: project.id,
          title: `Direct ${randomUUID()}`,
          productNameA: 'A',
          productNameB: 'B',
          measure: 'ee',
          assayMethod: 'nmr',
          ...row,
        })
        .then(
          () => null,
          (e: { constraint?: string }) => e,
        );
      expect(err).toMatchObject({ constraint });
    }
    expect(campaignCreateSchema.safeParse({ title: '   ', measure: 'ee', assayMethod: 'nmr' }).success).toBe(false);
    expect(campaignCreateSchema.safeParse({ title: 'x', measure: 'ee', assayMethod: 'polarimetry' }).success).toBe(false);
  });

  it('when a saved forecast row is not an object or is at 0 K, then the database refuses it', async () => {
    const campaign = await createCampaign(project.id);
    const bad = [
      [{ temperatureK: 0, result: JSON.stringify({}) }, 'saved_forecasts_temperature_range'],
      [{ temperatureK: 250, result: JSON.stringify([1, 2]) }, 'saved_forecasts_result_object'],
    ] as const;
    for (const [row, constraint] of bad) {
      const err = await db('saved_forecasts')
        .insert({ campaignId: campaign.id, ...row })
        .then(
          () => null,
          (e: { constraint?: string }) => e,
        );
      expect(err).toMatchObject({ constraint });
    }
  });
});
