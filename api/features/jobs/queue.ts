/**
 * Long work as jobs in PostgreSQL. The `jobs` table is what users see (state, progress, result,
 * the project it belongs to); pg-boss, on the same database and on knex's pool, decides which
 * instance runs a job and hands it to another one when an instance dies or stops.
 *
 * Every app can enqueue (a pg-boss sender that is never started: no timers, no polling). Only an
 * app that calls `startWorkers` fetches and runs jobs (the server does; tests start it when they
 * need it).
 */
import type { Knex } from 'knex';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';

export type JobKind = 'import' | 'report' | 'report-email';
export type JobState = 'queued' | 'running' | 'succeeded' | 'failed';

export const JOB_SCHEMA = 'pgboss';
export const QUEUE_OF: Record<JobKind, string> = { import: 'eyrie-import', report: 'eyrie-report', 'report-email': 'eyrie-report-email' };

export interface JobOptions {
  /**
   * A running job not finished after this long is handed to another instance (pg-boss's expiry);
   * the run-once lock makes that safe for a slow job that is still alive. Default 300 s.
   */
  expireInSeconds: number;
  /** How often an instance looks for expired jobs. Default 30 s. */
  maintenanceIntervalSeconds: number;
  /** How often an idle worker asks for a job. Default 1 s. */
  pollingIntervalSeconds: number;
  /** Attempts after the first, for a job whose instance died or that found its lock taken. */
  retryLimit: number;
  retryDelaySeconds: number;
}

export const JOB_DEFAULTS: JobOptions = {
  expireInSeconds: 300,
  maintenanceIntervalSeconds: 30,
  pollingIntervalSeconds: 1,
  retryLimit: 20,
  retryDelaySeconds: 2,
};

export function jobOptionsFromEnv(env: NodeJS.ProcessEnv = process.env): JobOptions {
  const num = (name: string, fallback: number, min: number) => {
    const raw = env[name];
    if (raw === undefined || raw === '') return fallback;
    const n = Number(raw);
    if (!Number.isFinite(n) || n < min) throw new Error(`${name} must be a number ≥ ${min}, got "${raw}"`);
    return n;
  };
  return {
    expireInSeconds: Math.round(num('EYRIE_JOB_EXPIRE_SECONDS', JOB_DEFAULTS.expireInSeconds, 1)),
    maintenanceIntervalSeconds: Math.round(num('EYRIE_JOB_MAINTENANCE_SECONDS', JOB_DEFAULTS.maintenanceIntervalSeconds, 1)),
    pollingIntervalSeconds: num('EYRIE_JOB_POLL_SECONDS', JOB_DEFAULTS.pollingIntervalSeconds, 0.5),
    retryLimit: JOB_DEFAULTS.retryLimit,
    retryDelaySeconds: JOB_DEFAULTS.retryDelaySeconds,
  };
}

/** pg-boss's database interface over knex's pool, so the app keeps one pool per process. */
function knexDb(knex: Knex) {
  return {
    async executeSql(text: string, values?: unknown[]) {
      const conn = await knex.client.acquireConnection();
      try {
        return await conn.query(text, values);
      } finally {
        await knex.client.releaseConnection(conn);
      }
    },
  };
}

export interface NewJob {
  kind: JobKind;
  projectId: string;
  campaignId?: string | null;
  userId: string;
  input?: Record<string, unknown>;
  file?: Buffer | null;
}

export interface JobRow {
  id: string;
  kind: JobKind;
  projectId: string;
  campaignId: string | null;
  createdByUserId: string | null;
  state: JobState;
  progress: { stage: string; percent: number };
  input: Record<string, unknown>;
  result: Record<string, unknown> | null;
  resultFileName: string | null;
  error: Record<string, unknown> | null;
  attempts: number;
  createdAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
}

export type JobHandler = (job: { id: string; retryCount: number; retryLimit: number }) => Promise<void>;

export class JobQueue {
  readonly options: JobOptions;
  private readonly sender: PgBoss;
  private worker: PgBoss | null = null;
  private abandon: (() => void) | null = null;

  constructor(
    private readonly knex: Knex,
    options: Partial<JobOptions> = {},
    private readonly logger?: Logger,
  ) {
    this.options = { ...JOB_DEFAULTS, ...options };
    this.sender = new PgBoss({ db: knexDb(knex), schema: JOB_SCHEMA, supervise: false, schedule: false, migrate: false });
  }

  /** Record the job and queue it; answers the new row. */
  async enqueue(job: NewJob): Promise<JobRow> {
    const [row] = await this.knex('jobs')
      .insert({
        kind: job.kind,
        projectId: job.projectId,
        campaignId: job.campaignId ?? null,
        createdByUserId: job.userId,
        input: JSON.stringify(job.input ?? {}),
        file: job.file ?? null,
      })
      .returning(JOB_COLUMNS);
    try {
      await this.sender.send(
        QUEUE_OF[job.kind],
        { jobId: row.id },
        {
          expireInSeconds: this.options.expireInSeconds,
          retryLimit: this.options.retryLimit,
          retryDelay: this.options.retryDelaySeconds,
        },
      );
    } catch (err) {
      await this.knex('jobs')
        .where({ id: row.id })
        .update({
          state: 'failed',
          file: null,
          finishedAt: new Date(),
          error: JSON.stringify({ status: 503, title: 'Service unavailable', detail: 'The job could not be queued; try again.' }),
        });
      throw err;
    }
    return row as JobRow;
  }

  /** Start fetching and running jobs in this process. */
  async startWorkers(handlers: Record<JobKind, JobHandler>, abandon?: () => void): Promise<void> {
    if (this.worker) return;
    this.abandon = abandon ?? null;
    const boss = new PgBoss({
      db: knexDb(this.knex),
      schema: JOB_SCHEMA,
      migrate: false,
      schedule: false,
      supervise: true,
      maintenanceIntervalSeconds: this.options.maintenanceIntervalSeconds,
    });
    boss.on('error', (err) => this.logger?.error({ err }, 'job queue error'));
    await boss.start();
    this.worker = boss;
    for (const kind of Object.keys(QUEUE_OF) as JobKind[]) {
      await boss.work<{ jobId: string }>(
        QUEUE_OF[kind],
        { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: this.options.pollingIntervalSeconds },
        async (jobs) => {
          for (const job of jobs) await handlers[kind]({ id: job.data.jobId, retryCount: job.retryCount, retryLimit: job.retryLimit });
        },
      );
    }
  }

  /**
   * Stop taking jobs; wait up to `timeoutMs` for running ones, then hand the rest back to the
   * queue (pg-boss fails them, and they are retried by another instance).
   */
  async stop(timeoutMs = 10_000): Promise<void> {
    const boss = this.worker;
    this.worker = null;
    if (!boss) return;
    await boss.stop({ graceful: true, wait: true, timeout: timeoutMs, close: false });
    // Still running after the grace period: roll it back here; pg-boss has put it back in the queue.
    this.abandon?.();
  }

  get running(): boolean {
    return this.worker !== null;
  }
}

export const JOB_COLUMNS = [
  'id',
  'kind',
  'projectId',
  'campaignId',
  'createdByUserId',
  'state',
  'progress',
  'input',
  'result',
  'resultFileName',
  'error',
  'attempts',
  'createdAt',
  'startedAt',
  'finishedAt',
];
