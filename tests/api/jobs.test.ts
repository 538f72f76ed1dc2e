import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Express } from 'express';
import { createApp } from '../../api/app';
import { loadConfig } from '../../api/config';
import { JobQueue } from '../../api/features/jobs/queue';
import { JobBusyError, jobHandlers } from '../../api/features/jobs/runner';
import { Mailbox } from '../../api/features/mail/mailbox';
import { createInProcessMailer } from '../../api/features/mail/mailer';
import type { User } from '../../api/models/user';
import { closeReadPool } from '../../api/features/imports/parse-pool';
import { testKnex } from '../support/db';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import { createApiToken } from '../factories/tokens';
import { createCampaign, createMeasurements } from '../factories/campaigns';
import { sample } from '../unit/imports/helpers';

let app: Express;
let jobs: JobQueue;
const mailbox = new Mailbox();
let owner: User;
let outsider: User;
let projectId: string;
let bearer: string;
let outsiderBearer: string;

beforeAll(async () => {
  const knex = testKnex();
  // Every import counts as large here, so each one goes through the queue.
  const config = loadConfig({ nodeEnv: 'test', databaseUrl: process.env.DATABASE_URL ?? '', importJobBytes: 64 });
  jobs = new JobQueue(knex, { pollingIntervalSeconds: 0.5, maintenanceIntervalSeconds: 1 });
  app = createApp({ knex, config, webDist: null, jobs, mailbox, mailer: createInProcessMailer(mailbox, config.mailFrom) });
  await app.locals.startJobWorkers();
  owner = await createUser();
  outsider = await createUser();
  projectId = (await createProject([{ user: owner, role: 'owner' }])).id;
  bearer = `Bearer ${(await createApiToken(owner)).secret}`;
  outsiderBearer = `Bearer ${(await createApiToken(outsider)).secret}`;
});

afterAll(async () => {
  await jobs.stop(2000);
  await closeReadPool();
});

async function poll(id: string, auth = bearer) {
  for (let i = 0; i < 100; i++) {
    const res = await request(app).get(`/api/v1/jobs/${id}`).set('Authorization', auth).expect(200);
    if (res.body.state === 'succeeded' || res.body.state === 'failed') return res.body;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`job ${id} did not finish`);
}

const counts = async (campaignId: string) => ({
  rows: Number((await testKnex()('measurements').where({ campaignId }).count({ n: '*' }).first())!.n),
  audits: Number(
    (await testKnex()('audit_events').where({ entityType: 'measurement_import', entityId: campaignId }).count({ n: '*' }).first())!.n,
  ),
});

async function importRequest(campaignId: string) {
  const file = sample('kestrelmoor-skylark-screen.csv');
  const preview = await request(app)
    .post(`/api/v1/campaigns/${campaignId}/imports/preview`)
    .set('Authorization', bearer)
    .attach('file', file.buffer, file.name)
    .expect(200);
  return { file, request: { mapping: preview.body.mapping, acknowledgeWarnings: true } };
}

describe('imports above the size limit run as jobs', () => {
  it('when a large file is imported, then 202 names a job that the client polls to its result, and the rows are stored once', async () => {
    const campaign = await createCampaign(projectId);
    const { file, request: body } = await importRequest(campaign.id);
    const res = await request(app)
      .post(`/api/v1/campaigns/${campaign.id}/imports`)
      .set('Authorization', bearer)
      .attach('file', file.buffer, file.name)
      .field('request', JSON.stringify(body))
      .expect(202);
    expect(res.headers.location).toBe(`/api/v1/jobs/${res.body.job.id}`);
    expect(res.body.job).toMatchObject({
      kind: 'import',
      state: 'queued',
      campaignId: campaign.id,
      progress: { stage: 'queued', percent: 0 },
    });
    const done = await poll(res.body.job.id);
    expect(done).toMatchObject({
      state: 'succeeded',
      progress: { stage: 'done', percent: 100 },
      result: { campaignId: campaign.id, inserted: 12 },
      error: null,
      attempts: 1,
    });
    expect(await counts(campaign.id)).toEqual({ rows: 12, audits: 1 });
    // The stored upload is dropped once the job has ended.
    expect((await testKnex()('jobs').where({ id: done.id }).first('file')).file).toBeNull();
  });

  it('when the same job is delivered twice at once, then it runs once', async () => {
    const campaign = await createCampaign(projectId);
    const { file, request: body } = await importRequest(campaign.id);
    const row = await jobs.enqueue({
      kind: 'import',
      projectId,
      campaignId: campaign.id,
      userId: owner.id,
      input: { fileName: file.name, request: body },
      file: file.buffer,
    });
    const handlers = jobHandlers({
      knex: testKnex(),
      mailer: createInProcessMailer(mailbox, 'x@localhost'),
      version: 'test',
      publicUrl: 'http://127.0.0.1',
    });
    const delivery = { id: row.id, retryCount: 0, retryLimit: 5 };
    // The app's own worker may take the job too, so up to four deliveries race here.
    const outcomes = await Promise.allSettled([handlers.import(delivery), handlers.import(delivery), handlers.import(delivery)]);
    // A delivery that finds the lock taken fails as busy (pg-boss would retry it) and nothing else.
    for (const o of outcomes) if (o.status === 'rejected') expect(o.reason).toBeInstanceOf(JobBusyError);
    await poll(row.id);
    // A later delivery finds the job finished and does nothing.
    await handlers.import(delivery);
    expect(await counts(campaign.id)).toEqual({ rows: 12, audits: 1 });
  });

  it('when the file has rows with errors, then the job fails with the problem details the direct route gives and stores nothing', async () => {
    const campaign = await createCampaign(projectId);
    const file = sample('kestrelmoor-screen-with-errors.csv');
    const preview = await request(app)
      .post(`/api/v1/campaigns/${campaign.id}/imports/preview`)
      .set('Authorization', bearer)
      .attach('file', file.buffer, file.name)
      .expect(200);
    const res = await request(app)
      .post(`/api/v1/campaigns/${campaign.id}/imports`)
      .set('Authorization', bearer)
      .attach('file', file.buffer, file.name)
      .field('request', JSON.stringify({ mapping: preview.body.mapping }))
      .expect(202);
    const done = await poll(res.body.job.id);
    expect(done.state).toBe('failed');
    expect(done.error).toMatchObject({ status: 422, title: 'Import rejected' });
    expect(done.error.issues.length).toBeGreaterThan(0);
    expect(await counts(campaign.id)).toEqual({ rows: 0, audits: 0 });
  });

  it('when someone outside the project polls the job, then it is 404', async () => {
    const campaign = await createCampaign(projectId);
    const row = await jobs.enqueue({ kind: 'report', projectId, campaignId: campaign.id, userId: owner.id });
    await request(app).get(`/api/v1/jobs/${row.id}`).set('Authorization', outsiderBearer).expect(404);
    await request(app).get(`/api/v1/jobs/not-a-uuid`).set('Authorization', bearer).expect(404);
    await poll(row.id);
  });
});

describe('reports built and e-mailed in the background', () => {
  it('when a report job is queued, then it finishes with a downloadable workbook', async () => {
    const campaign = await createCampaign(projectId);
    await createMeasurements(campaign.id, [233.15, 253.15, 273.15, 293.15]);
    const res = await request(app).post(`/api/v1/campaigns/${campaign.id}/report-jobs`).set('Authorization', bearer).expect(202);
    const done = await poll(res.body.job.id);
    expect(done).toMatchObject({ state: 'succeeded', kind: 'report', result: { href: `/api/v1/jobs/${done.id}/file` } });
    const file = await request(app)
      .get(done.result.href)
      .set('Authorization', bearer)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(file.status).toBe(200);
    expect((file.body as Buffer).subarray(0, 2).toString()).toBe('PK');
    expect((file.body as Buffer).length).toBe(done.result.bytes);
  });

  it('when a report e-mail job is queued, then the caller gets one message with the workbook and the PDF attached', async () => {
    const campaign = await createCampaign(projectId, { title: 'Mailed screen' });
    await createMeasurements(campaign.id, [233.15, 253.15, 273.15]);
    const res = await request(app).post(`/api/v1/campaigns/${campaign.id}/report-emails`).set('Authorization', bearer).expect(202);
    const done = await poll(res.body.job.id);
    expect(done).toMatchObject({ state: 'succeeded', kind: 'report-email', result: { sentTo: owner.email } });
    // Other test files queue report e-mails too (the authorization matrix), so count only this campaign's.
    const sent = mailbox.list().filter((m) => m.subject.includes('Mailed screen'));
    expect(sent).toHaveLength(1);
    expect(sent[0]!.to).toContain(owner.email);
    expect(sent[0]!.attachments.map((a) => a.contentType).sort()).toEqual([
      'application/pdf',
      'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    ]);
  });
});

describe('per-user upload limit', () => {
  it('when a user previews more files than the limit allows, then the next one is 429 and another user is not affected', async () => {
    const knex = testKnex();
    const config = loadConfig({
      nodeEnv: 'test',
      databaseUrl: process.env.DATABASE_URL ?? '',
      rateLimit: { ...loadConfig().rateLimit, uploads: 2 },
    });
    const limited = createApp({ knex, config, webDist: null });
    const campaign = await createCampaign(projectId);
    const file = sample('kestrelmoor-skylark-screen.csv');
    const preview = (auth: string) =>
      request(limited)
        .post(`/api/v1/campaigns/${campaign.id}/imports/preview`)
        .set('Authorization', auth)
        .attach('file', file.buffer, file.name);
    await preview(bearer).expect(200);
    await preview(bearer).expect(200);
    const refused = await preview(bearer).expect(429);
    expect(refused.body).toMatchObject({ status: 429, title: 'Too many requests' });
    expect(refused.headers['retry-after']).toBeDefined();
    // Another member has a budget of their own.
    const colleague = await createUser();
    await testKnex()('project_members').insert({ projectId, userId: colleague.id, role: 'editor' });
    await preview(`Bearer ${(await createApiToken(colleague)).secret}`).expect(200);
  });
});
