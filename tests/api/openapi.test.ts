import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { closeTestKnex } from '../support/db';
import { signInEach, startAuthApp, type AuthTestApp, type SignedInRequests } from '../support/auth';
import { listRoutes } from '../support/routes';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import { createCampaign, createMeasurements } from '../factories/campaigns';
import type { User } from '../../api/models/user';
import type { Project } from '../../api/models/project';
import { PROBLEM_TYPES, problemTypeIds, problemTypeUri, type ProblemTypeId } from '../../api/lib/problem-types';
import { problemSchema } from '../../api/lib/openapi';
import { toProblem } from '../../api/lib/problem';
import * as errors from '../../api/lib/errors';
import { ImportNeedsConfirmationError, ImportRejectedError, UnreadableFileError } from '../../api/features/imports/errors';
import { DomainError } from '../../api/science/errors';
import { ApiError } from '../../web/lib/api-client';

type Who = 'owner' | 'viewer';
let env: AuthTestApp;
let users: Record<Who, User>;
let project: Project;
let as: (who: Who) => SignedInRequests;
let doc: {
  paths: Record<
    string,
    Record<
      string,
      { operationId?: string; security?: unknown[]; responses: Record<string, unknown>; parameters?: { in: string; name: string }[] }
    >
  >;
  components: { schemas: Record<string, { properties?: Record<string, unknown> }>; securitySchemes: Record<string, unknown> };
  'x-problem-types': { type: string; status: number; title: string; description: string }[];
};

beforeAll(async () => {
  // A mail server that refuses with words of its own: they must never reach a client.
  env = await startAuthApp({
    mailer: { send: () => Promise.reject(new Error('550 relay denied for smtp.internal.example:2525 as svc-mailer')) },
  });
  users = { owner: await createUser(), viewer: await createUser() };
  project = await createProject([
    { user: users.owner, role: 'owner' },
    { user: users.viewer, role: 'viewer' },
  ]);
  as = await signInEach(env.app, users);
  doc = (await request(env.app).get('/api/v1/openapi.json').expect(200)).body;
});

afterAll(async () => {
  await env?.close();
  await closeTestKnex();
});

const METHODS = ['get', 'put', 'post', 'delete', 'patch'];
const operations = () =>
  Object.entries(doc.paths).flatMap(([p, item]) =>
    METHODS.filter((m) => item[m]).map((m) => ({ key: `${m.toUpperCase()} ${p}`, path: p, method: m, op: item[m]! })),
  );
/** Express's `:param` written as OpenAPI's `{param}`. */
const asOpenApiPath = (route: string) => route.replace(/:(\w+)/g, '{$1}');

describe('every /api route in the OpenAPI document', () => {
  it("when the app's router is walked, then every route is documented with its method and nothing documented is missing from the app", () => {
    const routes = listRoutes(env.app).map(asOpenApiPath);
    expect(routes.length).toBeGreaterThan(60);
    const documented = operations().map((o) => o.key);
    expect(routes.filter((r) => !documented.includes(r))).toEqual([]);
    expect(documented.filter((d) => !routes.includes(d))).toEqual([]);
  });

  it('when each operation is read, then it has a unique operationId, security, a success and a problem response, and its path parameters', () => {
    const ids = new Set<string>();
    for (const { key, path: p, op } of operations()) {
      expect(op.operationId, key).toMatch(/^[a-z][A-Za-z0-9]+$/);
      expect(ids.has(op.operationId!), `${key}: duplicate operationId`).toBe(false);
      ids.add(op.operationId!);
      expect(op.security, key).toBeDefined();
      const statuses = Object.keys(op.responses).map(Number);
      expect(
        statuses.some((s) => s >= 200 && s < 300),
        key,
      ).toBe(true);
      expect(
        statuses.some((s) => s >= 400 && s < 500),
        key,
      ).toBe(true);
      const declared = (op.parameters ?? []).filter((x) => x.in === 'path').map((x) => x.name);
      expect(declared.sort(), key).toEqual([...p.matchAll(/\{(\w+)\}/g)].map((m) => m[1]).sort());
    }
  });

  it('when a session cookie writes, then the document asks for the CSRF header too; a bearer token needs none', () => {
    expect(Object.keys(doc.components.securitySchemes).sort()).toEqual(['bearer', 'csrf', 'session']);
    const patch = doc.paths['/api/v1/projects/{projectId}']!.patch!;
    expect(patch.security).toEqual([{ session: [], csrf: [] }, { bearer: [] }]);
    expect(doc.paths['/api/v1/projects/{projectId}']!.get!.security).toEqual([{ session: [] }, { bearer: [] }]);
    expect(doc.paths['/api/v1/tokens']!.post!.security).toEqual([{ session: [], csrf: [] }]);
  });

  it('when the document is served, then it lists every registered problem type and the Problem schema declares the extension members', () => {
    expect(doc['x-problem-types']).toEqual(problemTypeIds.map((id) => ({ type: problemTypeUri(id), ...PROBLEM_TYPES[id] })));
    const members = Object.keys(doc.components.schemas.Problem!.properties ?? {});
    for (const m of ['type', 'title', 'status', 'detail', 'errors', 'code', 'currentVersion', 'issues', 'requestId'])
      expect(members).toContain(m);
  });
});

/** Every .ts file of the server. */
function serverSources(dir = path.resolve(__dirname, '../../api')): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) return serverSources(full);
    return e.name.endsWith('.ts') ? [full] : [];
  });
}

describe('one registry of problem types', () => {
  const sources = serverSources()
    .filter((f) => !f.endsWith(path.join('lib', 'problem-types.ts')))
    .map((f) => ({ f, text: readFileSync(f, 'utf8') }));

  it('when the server source is searched, then every registered type is raised somewhere and no type is written by hand', () => {
    const unused = problemTypeIds.filter((id) => !sources.some(({ text }) => text.includes(`'${id}'`)));
    expect(unused).toEqual([]);
    const handWritten = sources.filter(({ text }) => /['"`]\/problems\//.test(text)).map(({ f }) => path.relative(process.cwd(), f));
    expect(handWritten).toEqual([]);
  });

  it("when each kind of error is turned into a problem, then its type is registered and its status and title are the registry's", () => {
    const zodError = z.object({ a: z.number() }).safeParse({ a: 'x' }).error!;
    const cases: [unknown, ProblemTypeId][] = [
      [new errors.BadRequestError('bad'), 'invalid-request'],
      [new errors.UnauthenticatedError(), 'not-signed-in'],
      [new errors.ForbiddenError(), 'not-allowed'],
      [new errors.NotFoundError(), 'not-found'],
      [new errors.ConflictError('stale', { currentVersion: 3 }), 'conflict'],
      [new errors.PreconditionFailedError('stale', { currentVersion: 3 }), 'precondition-failed'],
      [new errors.PayloadTooLargeError('big'), 'payload-too-large'],
      [new errors.UnprocessableError('no'), 'cannot-compute'],
      [new errors.TooManyRequestsError(), 'too-many-requests'],
      [new errors.ServiceUnavailableError(), 'service-unavailable'],
      [new errors.MailNotSentError('not sent', new Error('upstream words')), 'mail-not-sent'],
      [new UnreadableFileError('empty'), 'unreadable-file'],
      [new ImportRejectedError('rows', [{ severity: 'error', row: 4, column: 'B "ee (%)"', message: 'not a number' }]), 'import-rejected'],
      [
        new ImportNeedsConfirmationError('warn', [{ severity: 'warning', row: 2, column: null, message: 'repeat' }]),
        'warnings-need-confirmation',
      ],
      [zodError, 'invalid-request'],
      [new DomainError('ee-out-of-range', 'ee must be below 100 %', 'measurements[2].selectivity.value'), 'cannot-compute'],
      [Object.assign(new Error('too large'), { status: 413, type: 'entity.too.large' }), 'payload-too-large'],
      [Object.assign(new Error('bad json'), { status: 400, type: 'entity.parse.failed' }), 'invalid-request'],
      [
        Object.assign(new Error('unsupported charset "LATIN9"'), { status: 415, type: 'charset.unsupported', expose: true }),
        'unsupported-media-type',
      ],
      [new Error('a bug'), 'internal'],
    ];
    for (const [err, id] of cases) {
      const p = toProblem(err);
      expect(p.type, String(err)).toBe(problemTypeUri(id));
      expect({ status: p.status, title: p.title }).toEqual({ status: PROBLEM_TYPES[id].status, title: PROBLEM_TYPES[id].title });
      expect(problemSchema.safeParse(p).success, String(err)).toBe(true);
    }
    expect(JSON.stringify(toProblem(cases[10]![0]))).not.toContain('upstream');
    // A place in an uploaded file is not a path into the request: errors[] names the file field, issues[] the row and column.
    const rejected = toProblem(cases[12]![0]);
    expect(rejected.errors).toEqual([{ path: 'file', message: 'row 4, column B "ee (%)": not a number' }]);
    expect(rejected.issues).toEqual([{ severity: 'error', row: 4, column: 'B "ee (%)"', message: 'not a number' }]);
  });
});

/** The answer as the web client sees it: parsed by the server's own Problem schema, then wrapped as the client's ApiError. */
function roundTrip(res: request.Response, id: ProblemTypeId) {
  expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
  expect(res.status).toBe(PROBLEM_TYPES[id].status);
  const parsed = problemSchema.strict().safeParse(res.body);
  expect(parsed.error?.issues ?? []).toEqual([]);
  const err = new ApiError(res.body);
  expect(err.problem.type).toBe(problemTypeUri(id));
  return err;
}

describe('each class of error, over HTTP and into the client', () => {
  it('when a body fails validation, then invalid-request names each field by its path in the request', async () => {
    const err = roundTrip(await request(env.app).post('/api/v1/forecast').send({ temperatures: 'cold' }), 'invalid-request');
    expect(err.fieldErrors.length).toBeGreaterThan(0);
    const json = roundTrip(
      await request(env.app).post('/api/v1/forecast').set('content-type', 'application/json').send('{"a":'),
      'invalid-request',
    );
    expect(json.fieldErrors).toEqual([{ path: '(body)', message: 'not valid JSON' }]);
  });

  it('when values have no answer, then cannot-compute carries a code', async () => {
    const runs = [90, 91, 92].map((ee) => ({ temperature: { value: 0, unit: 'C' }, selectivity: { measure: 'ee', value: ee } }));
    const err = roundTrip(await request(env.app).post('/api/v1/fit').send({ measurements: runs }), 'cannot-compute');
    expect(typeof err.problem.code).toBe('string');
  });

  it('when a caller is not signed in, or the address does not exist, then not-signed-in and not-found', async () => {
    roundTrip(await request(env.app).get('/api/v1/projects'), 'not-signed-in');
    roundTrip(await request(env.app).get('/api/v1/no-such-thing'), 'not-found');
  });

  it('when a body is in a character set the server does not read, or too large, then unsupported-media-type and payload-too-large', async () => {
    roundTrip(
      await request(env.app).post('/api/v1/forecast').set('content-type', 'application/json; charset=latin9').send('{}'),
      'unsupported-media-type',
    );
    const big = JSON.stringify({ pad: 'x'.repeat(1_100_000) });
    roundTrip(await request(env.app).post('/api/v1/forecast').set('content-type', 'application/json').send(big), 'payload-too-large');
  });

  it('when a change is made from a stale version, then conflict carries currentVersion as a number', async () => {
    const err = roundTrip(await as('owner').patch(`/api/v1/projects/${project.id}`).send({ name: 'Renamed', version: 99 }), 'conflict');
    expect(err.problem.currentVersion).toBe(1);
  });

  it('when the mail server refuses the report, then mail-not-sent says what happened and none of its words', async () => {
    const campaign = await createCampaign(project.id);
    await createMeasurements(campaign.id, [233.15, 253.15, 273.15, 293.15]);
    const res = await as('viewer')
      .post(`/api/v1/campaigns/${campaign.id}/report/email`)
      .send({ recipients: [users.owner.id], attach: ['xlsx'] });
    const err = roundTrip(res, 'mail-not-sent');
    expect(err.problem.detail).toContain(users.owner.email!);
    // requestId and instance are random ids that may contain the digits 550 by chance; the rest must not echo the server's words.
    const { requestId: _requestId, instance: _instance, ...said } = err.problem;
    expect(JSON.stringify(said)).not.toMatch(/relay|smtp\.internal|svc-mailer|\b550\b/);
  });
});
