import knexFactory, { type Knex } from 'knex';
import objection from 'objection';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const { knexSnakeCaseMappers } = objection;

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

/**
 * How long the app waits on PostgreSQL before giving up, so a frozen or unreachable database turns into a
 * 503 within seconds instead of hanging every request. Milliseconds; 0 turns a limit off (the CLI's migrations).
 */
export interface DbTimeouts {
  /** Waiting for a free connection from the pool. */
  acquireMs: number;
  /** Opening a new connection (TCP and start-up handshake). */
  connectMs: number;
  /** One statement, enforced by the server; the client stops waiting 2 s later (a frozen server enforces nothing). */
  statementMs: number;
  /** A transaction left open without a statement; the server ends the session. */
  idleInTransactionMs: number;
}

function envMs(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0) throw new Error(`${name} must be a whole number of milliseconds, got "${raw}"`);
  return n;
}

export function dbTimeoutsFromEnv(): DbTimeouts {
  return {
    acquireMs: envMs('EYRIE_DB_ACQUIRE_TIMEOUT_MS', 10_000),
    connectMs: envMs('EYRIE_DB_CONNECT_TIMEOUT_MS', 5_000),
    statementMs: envMs('EYRIE_DB_STATEMENT_TIMEOUT_MS', 15_000),
    idleInTransactionMs: envMs('EYRIE_DB_IDLE_IN_TRANSACTION_TIMEOUT_MS', 30_000),
  };
}

/** Slack between the server's statement timeout and the client's own read timeout. */
const CLIENT_READ_SLACK_MS = 2_000;

export function createKnex(databaseUrl: string, pool: Knex.PoolConfig = { min: 0, max: 10 }, timeouts: Partial<DbTimeouts> = {}): Knex {
  if (!databaseUrl) throw new Error('DATABASE_URL is not set');
  const t = { ...dbTimeoutsFromEnv(), ...timeouts };
  return knexFactory({
    client: 'pg',
    connection: {
      connectionString: databaseUrl,
      keepAlive: true,
      ...(t.connectMs ? { connectionTimeoutMillis: t.connectMs } : {}),
      ...(t.statementMs ? { statement_timeout: t.statementMs, query_timeout: t.statementMs + CLIENT_READ_SLACK_MS } : {}),
      ...(t.idleInTransactionMs ? { idle_in_transaction_session_timeout: t.idleInTransactionMs } : {}),
    },
    ...(t.acquireMs ? { acquireConnectionTimeout: t.acquireMs } : {}),
    pool: {
      ...pool,
      // A connection whose last query timed out on the client is still waiting for the server's answer: never lend it again.
      validate: (connection: { readyForQuery?: boolean }) => connection.readyForQuery === true,
    },
    ...knexSnakeCaseMappers(),
    migrations: { migrationSource: new TsMigrationSource(), tableName: 'knex_migrations' },
  });
}

export async function migrateLatest(knex: Knex): Promise<string[]> {
  const [, applied] = (await knex.migrate.latest()) as [number, string[]];
  return applied;
}

export async function rollbackAll(knex: Knex): Promise<void> {
  await knex.migrate.rollback(undefined, true);
}
