import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import type { Knex } from 'knex';
import { createKnex } from '../../api/db/knex';
import { startOwnCluster, type OwnCluster } from '../support/own-cluster';

let cluster: OwnCluster;
let knex: Knex;
let dumpFile: string;

function node(args: string[], databaseUrl: string) {
  const r = spawnSync(process.execPath, args, {
    cwd: process.cwd(),
    env: { ...process.env, DATABASE_URL: databaseUrl, NODE_ENV: 'production' },
    encoding: 'utf8',
  });
  if (r.status !== 0) throw new Error(`${args.join(' ')} failed (${r.status}):\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

/** What a restore must bring back: the demo projects with their campaigns, runs, members and history. */
async function snapshot(db: Knex) {
  const projects = await db('projects').orderBy('id').select('id', 'name', 'description', 'version');
  const campaigns = await db('campaigns').orderBy('id').select('id', 'projectId', 'title', 'version');
  const measurements = await db('measurements').orderBy('id').select('id', 'campaignId', 'temperatureK', 'value');
  const members = await db('projectMembers').orderBy(['projectId', 'userId']).select('projectId', 'userId', 'role');
  const history = await db('auditEvents').orderBy('id').select('id', 'action', 'entityType');
  const migrations = await db('knex_migrations').orderBy('id').pluck('name');
  return { projects, campaigns, measurements, members, history, migrations };
}

beforeAll(async () => {
  cluster = await startOwnCluster('eyrie_backup_test');
  node(['--import', 'tsx', 'api/cli.ts', 'prepare'], cluster.url);
  knex = createKnex(cluster.url, { min: 0, max: 2 });
  dumpFile = path.join(path.dirname(new URL(import.meta.url).pathname), '../../.tmp', `backup-test-${process.pid}.dump`);
}, 120_000);

afterAll(async () => {
  await knex?.destroy();
  cluster?.close();
  spawnSync('rm', ['-f', dumpFile]);
});

describe('npm run db:backup and db:restore', () => {
  it('when the demo data is backed up, changed and restored, then every project, campaign, run and history row is back', async () => {
    const before = await snapshot(knex);
    expect(before.projects.length).toBeGreaterThan(0);
    expect(before.measurements.length).toBeGreaterThan(0);

    const out = node(['scripts/db-backup.mjs', 'backup', dumpFile], cluster.url);
    expect(out).toContain('backup written');
    expect(existsSync(dumpFile)).toBe(true);

    // Damage: a project renamed, another deleted with its campaigns and runs.
    const [first, second] = before.projects;
    await knex('projects')
      .where({ id: first.id })
      .update({ name: 'Renamed after the backup', version: first.version + 1 });
    if (second) await knex('projects').where({ id: second.id }).delete();
    expect(await snapshot(knex)).not.toEqual(before);

    node(['scripts/db-backup.mjs', 'restore', dumpFile], cluster.url);
    await knex.destroy();
    knex = createKnex(cluster.url, { min: 0, max: 2 });
    expect(await snapshot(knex)).toEqual(before);
  }, 120_000);

  it('when the backup is restored into an empty database, then it holds the same data', async () => {
    const before = await snapshot(knex);
    await knex.raw('create database eyrie_restored_test');
    const url = new URL(cluster.url);
    url.pathname = '/eyrie_restored_test';
    node(['scripts/db-backup.mjs', 'restore', dumpFile], url.toString());
    const restored = createKnex(url.toString(), { min: 0, max: 1 });
    try {
      expect(await snapshot(restored)).toEqual(before);
    } finally {
      await restored.destroy();
    }
  }, 120_000);

  it('when restore is not given a file, then it says how to call it and changes nothing', () => {
    const r = spawnSync(process.execPath, ['scripts/db-backup.mjs', 'restore'], {
      cwd: process.cwd(),
      env: { ...process.env, DATABASE_URL: cluster.url },
      encoding: 'utf8',
    });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('npm run db:restore --');
  });
});
