/**
 * A fast-check fuzz of every write and compute route of the API, shared by the bounded test in
 * `npm test` (tests/api/fuzz.test.ts) and the long run of `npm run fuzz` (scripts/fuzz.ts).
 *
 * Each case picks a route (read from Express's router, so a new route is fuzzed without being
 * listed), fills its path parameters with real ids of the fuzzer's own rows, unknown ids or junk,
 * and sends a body that is either arbitrary JSON or a valid example with one part mutated (NUL
 * characters, huge or non-finite-looking numbers, wrong types, missing or extra keys). Import
 * routes get random files as well. Properties:
 * - no answer is a 5xx;
 * - a refused write (4xx) changes no row the fuzzer can see: rows of its own projects, campaigns,
 *   measurements, saved forecasts, invitations, members, tokens, jobs and audit events are counted
 *   before and after (scoped to its own user, so parallel tests do not disturb the counts).
 */
import fc from 'fast-check';
import request from 'supertest';
import type { Express } from 'express';
import type { Knex } from 'knex';
import { randomUUID } from 'node:crypto';
import { createApp } from '../../api/app';
import { loadConfig } from '../../api/config';
import type { User } from '../../api/models/user';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import { createApiToken } from '../factories/tokens';
import { createCampaign, createMeasurements } from '../factories/campaigns';
import { listRoutes } from './routes';

const C = (value: number) => ({ value, unit: 'C' });
const oneRun = {
  temperature: C(-20),
  selectivity: { measure: 'ee', value: 91.5 },
  uncertainty: 0.3,
  sampleId: 'S-1',
  replicateLabel: 'a',
  conversionPercent: 80,
  reactionTime: { value: 2, unit: 'h' },
  notes: 'fuzzed run',
};
const screen = [-40, -20, 0, 20].map((t, i) => ({ temperature: C(t), selectivity: { measure: 'ee', value: 96 - i * 2 } }));

/** A valid (or nearly valid) body per route, the starting point of mutations. */
const EXAMPLES: Record<string, unknown> = {
  'POST /api/v1/projects': { name: 'Fuzzed project', description: 'made by the fuzzer' },
  'PATCH /api/v1/projects/:projectId': { name: 'Renamed', version: 1 },
  'PATCH /api/v1/projects/:projectId/members/:userId': { role: 'editor' },
  'POST /api/v1/projects/:projectId/invitations': { email: 'someone@example.test', role: 'viewer' },
  'POST /api/v1/tokens': { name: 'fuzz', expiresInDays: 1 },
  'POST /api/v1/projects/:projectId/campaigns': { title: 'Fuzz screen', measure: 'ee', assayMethod: 'chiral-hplc' },
  'PATCH /api/v1/campaigns/:campaignId': { version: 1, notes: 'changed' },
  'POST /api/v1/campaigns/:campaignId/measurements': oneRun,
  'POST /api/v1/campaigns/:campaignId/measurements/batch': { measurements: [oneRun, oneRun] },
  'PATCH /api/v1/measurements/:measurementId': { version: 1, notes: 'changed' },
  'PUT /api/v1/measurements/:measurementId/exclusion': { version: 1, excluded: true, reason: 'fuzzed reason' },
  'POST /api/v1/campaigns/:campaignId/forecasts': { temperature: C(-10), note: 'fuzz' },
  'POST /api/v1/forecast': {
    basis: { kind: 'observed', selectivity: { measure: 'ee', value: 92.5 }, temperature: C(-20) },
    temperatures: { from: C(-60), to: C(20), count: 5 },
  },
  'POST /api/v1/fit': { measurements: screen, predict: [C(-30)] },
  'POST /api/v1/rate': {
    setup: { order: 'first' },
    basis: {
      kind: 'one-run',
      run: { conversionPercent: 95, time: { value: 4, unit: 'h' }, temperature: C(0) },
      assumedDH: { value: 60, unit: 'kJ/mol' },
    },
    targetConversionPercent: 95,
    temperatures: { values: [C(0), C(20)] },
  },
  'POST /api/v1/erosion': {
    barrier: { kind: 'gibbs', dG: { value: 25, unit: 'kcal/mol' }, temperature: C(25) },
    initialEePercent: 99,
    hold: { value: 2, unit: 'h' },
    eeFloorPercent: 98,
    temperatures: { values: [C(25), C(60)] },
  },
  'POST /api/v1/distribution': {
    pathways: [
      { label: 'major', barrier: { kind: 'gibbs', dG: { value: 60, unit: 'kJ/mol' } } },
      { label: 'minor', barrier: { kind: 'gibbs', dG: { value: 65, unit: 'kJ/mol' } } },
    ],
    temperatures: { from: C(-78), to: C(25), count: 3 },
  },
};

/** Routes left out, with the reason: they end the fuzzer's own access, which other tests cover. */
const SKIPPED = new Set(['DELETE /api/v1/session', 'DELETE /api/v1/projects/:projectId/membership']);

export interface FuzzWorld {
  app: Express;
  knex: Knex;
  me: User;
  other: User;
  bearer: string;
  projectId: string;
  campaignId: string;
  measurementId: string;
  forecastId: string;
  routes: string[];
}

/** The fuzzer's user, project, campaign with runs, a second member, and an app with generous limits. */
export async function makeWorld(knex: Knex): Promise<FuzzWorld> {
  const base = loadConfig({ nodeEnv: 'test', databaseUrl: process.env.DATABASE_URL ?? '' });
  const config = { ...base, rateLimit: { ...base.rateLimit, compute: 1e9, uploads: 1e9, tokens: 1e9, signIn: 1e9 }, importJobBytes: 1e9 };
  const app = createApp({ knex, config, webDist: null });
  const me = await createUser();
  const other = await createUser();
  const project = await createProject([
    { user: me, role: 'owner' },
    { user: other, role: 'viewer' },
  ]);
  const campaign = await createCampaign(project.id);
  const [m] = await createMeasurements(campaign.id, [233.15, 253.15, 273.15, 293.15]);
  const res = await request(app)
    .post(`/api/v1/campaigns/${campaign.id}/forecasts`)
    .set('Authorization', `Bearer ${(await createApiToken(me)).secret}`)
    .send({ temperature: C(-10) });
  const bearer = `Bearer ${(await createApiToken(me)).secret}`;
  const routes = listRoutes(app).filter((r) => !r.startsWith('GET ') && !SKIPPED.has(r));
  return {
    app,
    knex,
    me,
    other,
    bearer,
    projectId: project.id,
    campaignId: campaign.id,
    measurementId: m!.id,
    forecastId: res.body.id,
    routes,
  };
}

/** Counts of every row the fuzzer's user can reach, keyed by table. */
export async function countRows(w: FuzzWorld): Promise<Record<string, number>> {
  const projects = w.knex('project_members').where({ userId: w.me.id }).select('projectId');
  const campaigns = w.knex('campaigns').whereIn('projectId', projects.clone()).select('id');
  const n = async (q: Knex.QueryBuilder) => Number((await q.count({ n: '*' }).first())?.n ?? 0);
  const [p, mem, inv, tok, aud, cam, mea, fc_, job] = await Promise.all([
    n(w.knex('projects').whereIn('id', projects.clone())),
    n(w.knex('project_members').whereIn('projectId', projects.clone())),
    n(w.knex('invitations').whereIn('projectId', projects.clone())),
    n(w.knex('api_tokens').where({ userId: w.me.id })),
    n(w.knex('audit_events').where((q) => q.whereIn('projectId', projects.clone()).orWhere({ actorUserId: w.me.id }))),
    n(w.knex('campaigns').whereIn('projectId', projects.clone())),
    n(w.knex('measurements').whereIn('campaignId', campaigns.clone())),
    n(w.knex('saved_forecasts').whereIn('campaignId', campaigns.clone())),
    n(w.knex('jobs').whereIn('projectId', projects.clone())),
  ]);
  return {
    projects: p,
    members: mem,
    invitations: inv,
    tokens: tok,
    auditEvents: aud,
    campaigns: cam,
    measurements: mea,
    savedForecasts: fc_,
    jobs: job,
  };
}

// ── Arbitraries ──────────────────────────────────────────────────────────────────────────────

const nasty = fc.oneof(
  fc.constantFrom(
    '',
    ' ',
    '\u0000',
    'a\u0000b',
    'NaN',
    'Infinity',
    '-0',
    '1e400',
    '\uFEFF',
    '\uD800',
    '≥99.8',
    '95:5',
    '0x10',
    '<script>',
    "'; drop table users; --",
    'é'.repeat(5000),
  ),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.constantFrom(0, -0, -1, 1e308, -1e308, 5e-324, 2 ** 53 + 1, 1e21, 273.15, -273.15, -500),
  fc.double(),
  fc.integer(),
  fc.boolean(),
  fc.constant(null),
  fc.constantFrom({}, [], [null], { value: 'x', unit: 'C' }, { measure: 'ee', value: 100 }),
);

const jsonish: fc.Arbitrary<unknown> = fc.oneof({ weight: 3, arbitrary: fc.jsonValue({ maxDepth: 3 }) }, { weight: 2, arbitrary: nasty });

/** Every path into a JSON value (object keys and array indexes), root first. */
function paths(value: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  const out = [prefix];
  if (Array.isArray(value)) value.forEach((v, i) => out.push(...paths(v, [...prefix, i])));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) out.push(...paths(v, [...prefix, k]));
  return out;
}

/** Keys of free text (names, notes, labels), where any character may be typed. */
const TEXT_KEYS = new Set([
  'name',
  'description',
  'title',
  'notes',
  'note',
  'reason',
  'sampleId',
  'replicateLabel',
  'label',
  'reactionDescription',
  'productNameA',
  'productNameB',
]);

/** Every free-text string of `value` with `suffix` appended (a NUL in every text field at once). */
function everyString(value: unknown, suffix: string): unknown {
  if (Array.isArray(value)) return value.map((v) => everyString(v, suffix));
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.entries(value).map(([k, v]) => [k, typeof v === 'string' && TEXT_KEYS.has(k) ? v + suffix : everyString(v, suffix)]),
    );
  }
  return value;
}

/** `example` with one place replaced, removed, or given an extra key; or every string given a control character. */
function mutated(example: unknown): fc.Arbitrary<unknown> {
  const all = paths(example);
  const tainted = fc.constantFrom('\u0000', ' \u0000x', '\u0007', '\uFFFF').map((suffix) => everyString(example, suffix));
  return fc.oneof({ weight: 1, arbitrary: tainted }, { weight: 5, arbitrary: onePlace(example, all) });
}

function onePlace(example: unknown, all: (string | number)[][]): fc.Arbitrary<unknown> {
  return fc
    .tuple(fc.nat({ max: all.length - 1 }), fc.constantFrom('replace', 'delete', 'extra'), jsonish, fc.string({ maxLength: 12 }))
    .map(([i, how, value, key]) => {
      const copy = structuredClone(example) as Record<string | number, unknown>;
      const path = all[i]!;
      if (path.length === 0) return how === 'extra' ? { ...(copy as object), [key]: value } : value;
      let parent = copy as Record<string | number, unknown>;
      for (const p of path.slice(0, -1)) parent = parent[p] as Record<string | number, unknown>;
      const last = path[path.length - 1]!;
      if (how === 'delete') {
        if (Array.isArray(parent)) parent.splice(Number(last), 1);
        else delete parent[last];
      } else if (how === 'extra' && parent[last] && typeof parent[last] === 'object' && !Array.isArray(parent[last])) {
        (parent[last] as Record<string, unknown>)[key] = value;
      } else {
        parent[last] = value;
      }
      return copy;
    });
}

/** A random "file": CSV-like text with junk, a broken ZIP, or random bytes. */
const fileBytes = fc.oneof(
  fc
    .array(fc.tuple(fc.oneof(fc.double(), fc.string({ maxLength: 8 })), fc.oneof(fc.double(), fc.string({ maxLength: 8 }))), {
      maxLength: 30,
    })
    .map((rows) => Buffer.from(['T (°C),ee (%)', ...rows.map(([a, b]) => `${a},${b}`)].join('\n'))),
  fc.uint8Array({ maxLength: 600 }).map((b) => Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.from(b)])),
  fc.uint8Array({ maxLength: 600 }).map((b) => Buffer.from(b)),
  fc.constant(Buffer.from('T (°C),ee (%)\n25,96\n0,97\u0000\n')),
);

export interface FuzzCase {
  route: string;
  params: Record<string, string>;
  body: unknown;
  file: { bytes: Buffer; name: string } | null;
  auth: 'owner' | 'viewer' | 'anonymous';
}

export function fuzzCase(w: FuzzWorld): fc.Arbitrary<FuzzCase> {
  const id = (real: string) =>
    fc.oneof(
      { weight: 6, arbitrary: fc.constant(real) },
      { weight: 1, arbitrary: fc.constant(randomUUID()) },
      { weight: 1, arbitrary: fc.constantFrom('x', '0', '%00', 'null') },
    );
  return fc.constantFrom(...w.routes).chain((route) => {
    const example = EXAMPLES[route] ?? {};
    const isUpload = route.includes('/imports');
    return fc.record({
      route: fc.constant(route),
      params: fc.record({
        projectId:
          route.startsWith('DELETE /api/v1/projects/:projectId') && !route.includes('/invitations') && !route.includes('/members')
            ? fc.constant(randomUUID())
            : id(w.projectId),
        campaignId: route.startsWith('DELETE /api/v1/campaigns/:campaignId') ? fc.constant(randomUUID()) : id(w.campaignId),
        measurementId: id(w.measurementId),
        forecastId: id(w.forecastId),
        userId: id(w.other.id),
        tokenId: fc.constant(randomUUID()),
        invitationId: fc.constant(randomUUID()),
        token: fc.constantFrom('no-such-invitation', 'x'),
        jobId: fc.constant(randomUUID()),
      }),
      body: fc.oneof({ weight: 3, arbitrary: mutated(example) }, { weight: 1, arbitrary: jsonish }),
      file: isUpload
        ? fc.option(fc.record({ bytes: fileBytes, name: fc.constantFrom('screen.csv', 'screen.xlsx', 'screen.txt', 'x.pdf') }), {
            nil: null,
          })
        : fc.constant(null),
      auth: fc.constantFrom('owner', 'owner', 'owner', 'viewer', 'anonymous'),
    });
  });
}

export interface CaseOutcome {
  status: number;
  changed: boolean;
  before: Record<string, number>;
  after: Record<string, number>;
}

const viewerTokens = new WeakMap<FuzzWorld, string>();

/** Send one case; the row counts are taken only around refused writes' checks. */
export async function runCase(w: FuzzWorld, c: FuzzCase): Promise<CaseOutcome> {
  const [method, template] = c.route.split(' ') as [string, string];
  const url = template.replace(/:([A-Za-z]+)/g, (_, name: string) => encodeURIComponent(c.params[name as keyof FuzzCase['params']] ?? 'x'));
  let viewer = viewerTokens.get(w);
  if (!viewer) {
    viewer = `Bearer ${(await createApiToken(w.other)).secret}`;
    viewerTokens.set(w, viewer);
  }
  const before = await countRows(w);
  let req = (request(w.app) as unknown as Record<string, (u: string) => request.Test>)[method.toLowerCase()]!(url);
  if (c.auth === 'owner') req = req.set('Authorization', w.bearer);
  if (c.auth === 'viewer') req = req.set('Authorization', viewer);
  if (c.file) req = req.attach('file', c.file.bytes, c.file.name).field('request', JSON.stringify(c.body ?? {}));
  else if (method !== 'GET' && method !== 'DELETE')
    req = req.set('Content-Type', 'application/json').send(JSON.stringify(c.body) ?? 'null');
  const res = await req;
  const after = await countRows(w);
  const changed = Object.keys(before).some((k) => before[k] !== after[k]);
  return { status: res.status, changed, before, after };
}

/** One case per route, run before the random ones: its example body with a NUL in every text field, sent by the owner to real ids. */
export function nulExamples(w: FuzzWorld): [FuzzCase][] {
  const params = {
    projectId: w.projectId,
    campaignId: w.campaignId,
    measurementId: w.measurementId,
    forecastId: w.forecastId,
    userId: w.other.id,
    tokenId: randomUUID(),
    invitationId: randomUUID(),
    token: 'x',
    jobId: randomUUID(),
  };
  return w.routes
    .filter((route) => !route.startsWith('DELETE '))
    .map((route) => [{ route, params, body: everyString(EXAMPLES[route] ?? {}, ' \u0000x'), file: null, auth: 'owner' as const }]);
}

/** The property: never a 5xx, and nothing changed by a refused write. */
export function fuzzProperty(w: FuzzWorld, tally?: Map<number, number>) {
  return fc.asyncProperty(fuzzCase(w), async (c) => {
    const out = await runCase(w, c);
    tally?.set(out.status, (tally.get(out.status) ?? 0) + 1);
    if (out.status >= 500) throw new Error(`${c.route} answered ${out.status}`);
    if (out.status >= 400 && out.changed)
      throw new Error(`${c.route} answered ${out.status} but rows changed: ${JSON.stringify(out.before)} → ${JSON.stringify(out.after)}`);
  });
}
