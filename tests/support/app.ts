import { createApp } from '../../api/app';
import { loadConfig, type AppConfig } from '../../api/config';
import { testKnex } from './db';

/** The real application wired to the test database; nothing listens unless a test asks. */
export function testApp(overrides: Partial<AppConfig> = {}) {
  const knex = testKnex();
  const config = loadConfig({ nodeEnv: 'test', databaseUrl: process.env.DATABASE_URL ?? '', ...overrides });
  return { app: createApp({ knex, config, webDist: null }), knex, config };
}
