import { randomUUID } from 'node:crypto';

/** Runtime configuration, read once from the environment. */
export interface AppConfig {
  nodeEnv: 'development' | 'production' | 'test';
  port: number;
  host: string;
  /** Public base URL of the app, used for OAuth callbacks and links in e-mail. */
  publicUrl: string;
  databaseUrl: string;
  sessionSecret: string;
  github: { clientId: string; clientSecret: string } | null;
  smtpUrl: string | null;
  /** Sender address of invitation e-mail. */
  mailFrom: string;
  /**
   * Development-only tools: the local fake OAuth provider and the mailbox page.
   * EYRIE_DEV_TOOLS=1 (set by npm start) or the test environment; never keyed off NODE_ENV alone.
   */
  devTools: boolean;
  /**
   * Requests allowed per client per window on the sign-in and API-token endpoints, the calculators
   * and file uploads (per user). Counters live in PostgreSQL under `keyPrefix`.
   */
  rateLimit: { windowMs: number; signIn: number; tokens: number; compute: number; uploads: number; keyPrefix: string };
  version: string;
  /** Imports of files larger than this run as background jobs (202 and a job to poll). */
  importJobBytes: number;
}

/** Addresses reachable only from this machine. */
export function isLoopbackHost(host: string): boolean {
  const h = host
    .trim()
    .toLowerCase()
    .replace(/^\[|\]$/g, '');
  return h === 'localhost' || h === '::1' || /^127(\.\d{1,3}){3}$/.test(h);
}

function readPositiveInt(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1) throw new Error(`${name} must be a positive whole number, got "${raw}"`);
  return n;
}

function readPort(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 65535) {
    throw new Error(`${name} must be a port number between 0 and 65535, got "${raw}"`);
  }
  return n;
}

export function loadConfig(overrides: Partial<AppConfig> = {}): AppConfig {
  const env = process.env;
  const nodeEnv = (env.NODE_ENV === 'production' || env.NODE_ENV === 'test' ? env.NODE_ENV : 'development') as AppConfig['nodeEnv'];
  const port = readPort('PORT', 3000);
  const host = env.HOST ?? '127.0.0.1';
  const github =
    env.GITHUB_CLIENT_ID && env.GITHUB_CLIENT_SECRET ? { clientId: env.GITHUB_CLIENT_ID, clientSecret: env.GITHUB_CLIENT_SECRET } : null;
  return {
    nodeEnv,
    port,
    host,
    publicUrl: (env.PUBLIC_URL ?? `http://${host}:${port}`).replace(/\/$/, ''),
    databaseUrl: env.DATABASE_URL ?? '',
    sessionSecret: env.SESSION_SECRET ?? 'eyrie-local-development-secret-change-me',
    github,
    smtpUrl: env.SMTP_URL || null,
    mailFrom: env.MAIL_FROM ?? 'Eyrie <eyrie@localhost>',
    devTools: env.EYRIE_DEV_TOOLS === '1' || env.EYRIE_DEV_TOOLS === 'true' || (nodeEnv === 'test' && env.EYRIE_DEV_TOOLS !== '0'),
    rateLimit: {
      windowMs: 15 * 60_000,
      signIn: readPositiveInt('EYRIE_SIGN_IN_LIMIT', 30),
      tokens: readPositiveInt('EYRIE_TOKEN_LIMIT', 30),
      // Stateless calculators: generous for people, a brake for runaway scripts.
      compute: readPositiveInt('EYRIE_COMPUTE_LIMIT', 6000),
      // Import previews and imports per user: each reads a whole file in a worker.
      uploads: readPositiveInt('EYRIE_UPLOAD_LIMIT', 120),
      // Instances of one deployment share counters; each test app gets its own so parallel test files do not.
      keyPrefix: env.EYRIE_RATE_LIMIT_PREFIX || (nodeEnv === 'test' ? `test-${randomUUID().slice(0, 8)}` : 'eyrie'),
    },
    version: env.npm_package_version ?? '0.1.0',
    importJobBytes: readPositiveInt('EYRIE_IMPORT_JOB_BYTES', 1024 * 1024),
    ...overrides,
  };
}
