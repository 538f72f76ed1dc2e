import knexFactory, { type Knex } from 'knex';
import objection from 'objection';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const { Model, knexSnakeCaseMappers } = objection;

const migrationsDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../migrations');

interface MigrationModule {
  up(knex: Knex): Promise<void>;
  down(knex: Knex): Promise<void>;
}

/**
 * knex's own loader cannot import .ts files under every runner we use (tsx,
 * vitest), so migrations are listed and imported here, in project code.
 */
class TsMigrationSource implements Knex.MigrationSource<string> {
  async getMigrations(): Promise<string[]> {
    const files = await readdir(migrationsDir);
    return files.filter((f) => /^\d{14}_[a-z0-9_]+\.ts$/.test(f)).sort();
  }
  getMigrationName(migration: string): string {
    return migration;
  }
  async getMigration(migration: string): Promise<MigrationModule> {
    return (await import(/* @vite-ignore */ pathToFileURL(path.join(migrationsDir, migration)).href)) as MigrationModule;
  }
}

export function createKnex(databaseUrl: string, pool: Knex.PoolConfig = { min: 0, max: 10 }): Knex {
  if (!databaseUrl) throw new Error('DATABASE_URL is not set');
  return knexFactory({
    client: 'pg',
    connection: databaseUrl,
    pool,
    ...knexSnakeCaseMappers(),
    migrations: { migrationSource: new TsMigrationSource(), tableName: 'knex_migrations' },
  });
}

/** Bind Objection models to a knex instance (one per process). */
export function bindModels(knex: Knex): void {
  Model.knex(knex);
}

export async function migrateLatest(knex: Knex): Promise<string[]> {
  const [, applied] = (await knex.migrate.latest()) as [number, string[]];
  return applied;
}

export async function rollbackAll(knex: Knex): Promise<void> {
  await knex.migrate.rollback(undefined, true);
}
