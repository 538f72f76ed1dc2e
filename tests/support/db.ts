import '../../api/db/pg-types';
import type { Knex } from 'knex';
import pg from 'pg';
import { createKnex, migrateLatest } from '../../api/db/knex';

let shared: Knex | null = null;

/**
 * One knex per test worker; factories and tests pass it to every query (`Model.query(testKnex())`), as the app passes its
 * own handle to every service: no model is bound to a database globally. Schema is migrated by global setup.
 */
export function testKnex(): Knex {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run API tests through `npm test`, which starts PostgreSQL.');
  if (!shared) {
    shared = createKnex(url, { min: 0, max: 4 });
  }
  return shared;
}

export async function closeTestKnex(): Promise<void> {
  await shared?.destroy();
  shared = null;
}

/**
 * A database of the test file's own (its name plus the worker's pid), so rows written there never meet other files' rows.
 * `create` makes it afresh and migrated and hands back a knex the caller destroys; `drop` removes it (for afterAll).
 */
export function scratchDatabase(name: string): { create: () => Promise<Knex>; drop: () => Promise<void> } {
  const baseUrl = process.env.DATABASE_URL ?? '';
  const dbName = `${name}_${process.pid}`;
  async function admin(sql: string) {
    const client = new pg.Client({ connectionString: baseUrl });
    await client.connect();
    try {
      await client.query(sql);
    } finally {
      await client.end();
    }
  }
  const drop = () => admin(`drop database if exists "${dbName}"`);
  return {
    drop,
    async create() {
      await drop();
      await admin(`create database "${dbName}"`);
      const url = new URL(baseUrl);
      url.pathname = `/${dbName}`;
      const knex = createKnex(url.toString(), { min: 0, max: 2 });
      try {
        await migrateLatest(knex);
      } catch (err) {
        await knex.destroy();
        throw err;
      }
      return knex;
    },
  };
}
