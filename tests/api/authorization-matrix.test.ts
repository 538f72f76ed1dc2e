import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import type { ProjectRole } from '../../api/features/projects/schemas';
import type { User } from '../../api/models/user';
import { Invitation } from '../../api/models/invitation';
import { hashSecret } from '../../api/lib/secrets';
import { closeTestKnex, testKnex } from '../support/db';
import { signIn, startAuthApp, type AuthTestApp } from '../support/auth';
import { listRoutes } from '../support/routes';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import { createApiToken } from '../factories/tokens';
import { createCampaign, createMeasurements } from '../factories/campaigns';
import { SavedForecast } from '../../api/models/saved-forecast';
import { Comparison } from '../../api/models/plan';

/**
 * Every /api route × every kind of caller, with the status each must get.
 * Routes are read from the app's router: a route with no rule below fails
 * the first test, so a new route cannot slip past authorization review.
 */
const WHO = ['anonymous', 'viewer', 'editor', 'owner', 'outsider', 'bearer', 'revoked'] as const;
type Who = (typeof WHO)[number];

/** public: no sign-in; user: any signed-in caller; session: browser session only; or a minimum project role. */
type Access = 'public' | 'user' | 'session' | ProjectRole;

interface Cell {
  projectId: string;
  /** The caller's own user, when there is one. */
  me: User | null;
  viewer: User;
}

interface Rule {
  access: Access;
  /** Status for callers who pass authorization; per-caller overrides where the outcome differs. */
  ok?: number | Partial<Record<Who, number>>;
  params?: (cell: Cell) => Promise<Record<string, string>> | Record<string, string>;
  /** The body; it may use the filled-in path parameters (e.g. a project id the route reads from the body). */
  body?: (params: Record<string, string>) => unknown;
  /** Query string parameters (e.g. the version of a delete). */
  query?: Record<string, string>;
  /** The call signs the caller out; sign them in again before the next cell. */
  endsSession?: boolean;
}

const uniqueEmail = () => `invitee-${randomBytes(4).toString('hex')}@example.test`;

const oneRun = { temperature: { value: -20, unit: 'C' }, selectivity: { measure: 'ee', value: 91.5 } };
async function aCampaign(c: Cell) {
  return { campaignId: (await createCampaign(c.projectId)).id };
}
/** A campaign with a fittable screen (five temperatures). */
async function aScreen(c: Cell) {
  const campaign = await createCampaign(c.projectId);
  await createMeasurements(campaign.id, [233.15, 253.15, 273.15, 293.15, 313.15]);
  return { campaignId: campaign.id };
}
async function anImportFile(c: Cell) {
  const campaign = await createCampaign(c.projectId);
  const content = Buffer.from('Temperature (°C),ee (%)\r\n-20,91.5\r\n');
  const [row] = await testKnex()('importFiles')
    .insert({
      campaignId: campaign.id,
      fileName: 'matrix.csv',
      mediaType: 'text/csv',
      format: 'csv',
      sizeBytes: content.length,
      sha256: createHash('sha256').update(content).digest('hex'),
      content,
      rowCount: 1,
    })
    .returning('id');
  return { fileId: String(row.id) };
}
async function aSignedOffCampaign(c: Cell) {
  const campaign = await createCampaign(c.projectId);
  await testKnex()('campaigns').where({ id: campaign.id }).update({ signedOffAt: new Date(), signOffNote: 'matrix' });
  return { campaignId: campaign.id };
}
/** A finished report job of the cell's project (inserted directly: the matrix checks access, not the queue). */
async function aJob(c: Cell) {
  const campaign = await createCampaign(c.projectId);
  const [job] = await testKnex()('jobs')
    .insert({
      kind: 'report',
      projectId: c.projectId,
      campaignId: campaign.id,
      createdByUserId: c.viewer.id,
      state: 'succeeded',
      resultFile: Buffer.from('PK'),
      resultFileName: 'matrix.xlsx',
    })
    .returning('id');
  return { jobId: job.id as string };
}
async function aMeasurement(c: Cell) {
  const campaign = await createCampaign(c.projectId);
  const [m] = await createMeasurements(campaign.id, [253.15]);
  return { measurementId: m!.id };
}

const aSpecification = { measure: 'ee', minimum: 97, probability: 0.9 };
async function twoScreens(c: Cell) {
  const first = (await aScreen(c)).campaignId;
  const second = (await aScreen(c)).campaignId;
  return { first, second };
}

const RULES: Record<string, Rule> = {
  'GET /api/health': { access: 'public', ok: 200 },
  'GET /api/v1/session': { access: 'public', ok: 200 },
  'DELETE /api/v1/session': { access: 'public', ok: 204, endsSession: true },

  'GET /api/v1/projects': { access: 'user', ok: 200 },
  'POST /api/v1/projects': { access: 'user', ok: 201, body: () => ({ name: 'Matrix project' }) },
  'GET /api/v1/projects/:projectId': { access: 'viewer', ok: 200 },
  'PATCH /api/v1/projects/:projectId': { access: 'owner', ok: 200, body: () => ({ name: 'Renamed by the matrix', version: 1 }) },
  'DELETE /api/v1/projects/:projectId': { access: 'owner', ok: 204 },
  'GET /api/v1/projects/:projectId/members': { access: 'viewer', ok: 200 },
  'PATCH /api/v1/projects/:projectId/members/:userId': {
    access: 'owner',
    ok: 200,
    params: (c) => ({ userId: c.viewer.id }),
    body: () => ({ role: 'editor' }),
  },
  'DELETE /api/v1/projects/:projectId/members/:userId': { access: 'owner', ok: 204, params: (c) => ({ userId: c.viewer.id }) },
  // Any member may leave, except the last owner.
  'DELETE /api/v1/projects/:projectId/membership': { access: 'viewer', ok: { viewer: 204, editor: 204, bearer: 204, owner: 409 } },
  'GET /api/v1/projects/:projectId/invitations': { access: 'owner', ok: 200 },
  'POST /api/v1/projects/:projectId/invitations': { access: 'owner', ok: 201, body: () => ({ email: uniqueEmail(), role: 'viewer' }) },
  'DELETE /api/v1/projects/:projectId/invitations/:invitationId': {
    access: 'owner',
    ok: 204,
    params: async (c) => {
      const inv = await Invitation.query(testKnex()).insertAndFetch({
        projectId: c.projectId,
        email: uniqueEmail(),
        role: 'viewer',
        tokenHash: hashSecret(randomUUID()),
        expiresAt: new Date(Date.now() + 86_400_000),
      });
      return { invitationId: inv.id };
    },
  },
  'GET /api/v1/projects/:projectId/audit-events': { access: 'owner', ok: 200 },

  // Signed-in callers pass; an unknown invitation link is then a 404 for everyone.
  'GET /api/v1/invitations/:token': { access: 'user', ok: 404, params: () => ({ token: 'no-such-invitation' }) },
  'POST /api/v1/invitations/:token/accept': { access: 'user', ok: 404, params: () => ({ token: 'no-such-invitation' }) },

  'GET /api/v1/tokens': { access: 'session', ok: 200 },
  'POST /api/v1/tokens': { access: 'session', ok: 201, body: () => ({ name: 'matrix', expiresInDays: 1 }) },
  'DELETE /api/v1/tokens/:tokenId': {
    access: 'session',
    ok: 204,
    params: async (c) => ({ tokenId: c.me ? (await createApiToken(c.me)).token.id : randomUUID() }),
  },

  // Campaigns: viewers read (and download the report), editors write; reached through a campaign,
  // measurement or forecast id, the project is resolved first so outsiders get 404.
  'GET /api/v1/projects/:projectId/campaigns': { access: 'viewer', ok: 200 },
  'POST /api/v1/projects/:projectId/campaigns': {
    access: 'editor',
    ok: 201,
    body: () => ({ title: `Matrix screen ${randomBytes(3).toString('hex')}`, measure: 'ee', assayMethod: 'chiral-hplc' }),
  },
  'GET /api/v1/projects/:projectId/comparison': { access: 'viewer', ok: 200, params: aCampaign },
  'GET /api/v1/campaigns/:campaignId': { access: 'viewer', ok: 200, params: aCampaign },
  'PATCH /api/v1/campaigns/:campaignId': {
    access: 'editor',
    ok: 200,
    params: aCampaign,
    body: () => ({ version: 1, notes: 'changed by the matrix' }),
  },
  'DELETE /api/v1/campaigns/:campaignId': { access: 'editor', ok: 204, params: aCampaign, query: { version: '1' } },
  'GET /api/v1/campaigns/:campaignId/measurements': { access: 'viewer', ok: 200, params: aCampaign },
  'POST /api/v1/campaigns/:campaignId/measurements': { access: 'editor', ok: 201, params: aCampaign, body: () => oneRun },
  'POST /api/v1/campaigns/:campaignId/measurements/batch': {
    access: 'editor',
    ok: 201,
    params: aCampaign,
    body: () => ({ measurements: [oneRun, oneRun] }),
  },
  // Callers who pass authorization without sending a file meet the upload's own 400.
  'POST /api/v1/campaigns/:campaignId/imports/preview': { access: 'editor', ok: 400, params: aCampaign },
  'POST /api/v1/campaigns/:campaignId/imports': { access: 'editor', ok: 400, params: aCampaign },
  'GET /api/v1/campaigns/:campaignId/analysis': { access: 'viewer', ok: 200, params: aScreen },
  'GET /api/v1/campaigns/:campaignId/forecasts': { access: 'viewer', ok: 200, params: aScreen },
  'POST /api/v1/campaigns/:campaignId/forecasts': {
    access: 'editor',
    ok: 201,
    params: aScreen,
    body: () => ({ temperature: { value: -10, unit: 'C' } }),
  },
  'GET /api/v1/campaigns/:campaignId/imports/template.csv': { access: 'viewer', ok: 200, params: aCampaign },
  'GET /api/v1/campaigns/:campaignId/files': { access: 'viewer', ok: 200, params: aCampaign },
  'GET /api/v1/import-files/:fileId': { access: 'viewer', ok: 200, params: anImportFile },
  'GET /api/v1/campaigns/:campaignId/history': { access: 'viewer', ok: 200, params: aCampaign },
  'GET /api/v1/campaigns/:campaignId/history.csv': { access: 'viewer', ok: 200, params: aCampaign },
  'GET /api/v1/projects/:projectId/history': { access: 'owner', ok: 200 },
  'GET /api/v1/projects/:projectId/history.csv': { access: 'owner', ok: 200 },
  // The factory's campaign has no last editor on record, so any editor may sign it off.
  'POST /api/v1/campaigns/:campaignId/sign-off': { access: 'editor', ok: 200, params: aCampaign, body: () => ({ note: 'matrix check' }) },
  'POST /api/v1/campaigns/:campaignId/reopen': {
    access: 'editor',
    ok: 200,
    params: aSignedOffCampaign,
    body: () => ({ reason: 'matrix check' }),
  },
  'GET /api/v1/campaigns/:campaignId/report.xlsx': { access: 'viewer', ok: 200, params: aScreen },
  'POST /api/v1/campaigns/:campaignId/report-jobs': { access: 'viewer', ok: 202, params: aScreen },
  'POST /api/v1/campaigns/:campaignId/report-emails': { access: 'viewer', ok: 202, params: aScreen },
  'GET /api/v1/jobs/:jobId': { access: 'viewer', ok: 200, params: aJob },
  'GET /api/v1/jobs/:jobId/file': { access: 'viewer', ok: 200, params: aJob },
  'GET /api/v1/campaigns/:campaignId/report.pdf': { access: 'viewer', ok: 200, params: aScreen },
  'GET /api/v1/campaigns/:campaignId/measurements.csv': { access: 'viewer', ok: 200, params: aScreen },
  'GET /api/v1/campaigns/:campaignId/forecast.csv': { access: 'viewer', ok: 200, params: aScreen },
  // Viewers may send the report too; callers who pass authorization with no recipient meet the body's 400.
  'POST /api/v1/campaigns/:campaignId/report/email': { access: 'viewer', ok: 400, params: aScreen, body: () => ({ recipients: [] }) },
  'PATCH /api/v1/campaigns/:campaignId/measurements': {
    access: 'editor',
    ok: 200,
    params: async (c) => {
      const campaign = await createCampaign(c.projectId);
      const [m] = await createMeasurements(campaign.id, [253.15]);
      return { campaignId: campaign.id, measurementId: m!.id };
    },
    body: (p) => ({ measurements: [{ id: p.measurementId, version: 1, reason: 'matrix check', notes: 'checked' }] }),
  },
  'PATCH /api/v1/measurements/:measurementId': {
    access: 'editor',
    ok: 200,
    params: aMeasurement,
    body: () => ({ version: 1, reason: 'matrix check', notes: 'checked' }),
  },
  'PUT /api/v1/measurements/:measurementId/exclusion': {
    access: 'editor',
    ok: 200,
    params: aMeasurement,
    body: () => ({ version: 1, excluded: true, reason: 'matrix check' }),
  },
  'DELETE /api/v1/measurements/:measurementId': {
    access: 'editor',
    ok: 204,
    params: aMeasurement,
    query: { version: '1', reason: 'matrix check' },
  },
  'DELETE /api/v1/forecasts/:forecastId': {
    access: 'editor',
    ok: 204,
    params: async (c) => {
      const campaign = await createCampaign(c.projectId);
      const forecast = await SavedForecast.query(testKnex())
        .insert({ campaignId: campaign.id, temperatureK: 250, result: { note: 'made by the matrix' } })
        .returning('*');
      return { forecastId: forecast.id };
    },
  },

  // Planning: specifications, stored plans and comparisons; viewers read, editors write.
  'GET /api/v1/projects/:projectId/specification': { access: 'viewer', ok: 200 },
  'PUT /api/v1/projects/:projectId/specification': { access: 'editor', ok: 200, body: () => aSpecification },
  'GET /api/v1/campaigns/:campaignId/specification': { access: 'viewer', ok: 200, params: aCampaign },
  'PUT /api/v1/campaigns/:campaignId/specification': { access: 'editor', ok: 200, params: aCampaign, body: () => aSpecification },
  'GET /api/v1/campaigns/:campaignId/plan': { access: 'viewer', ok: 200, params: aCampaign },
  'PUT /api/v1/campaigns/:campaignId/plan': {
    access: 'editor',
    ok: 200,
    params: aScreen,
    body: () => ({
      inputs: {
        specification: aSpecification,
        temperatures: { from: { value: -60, unit: 'C' }, to: { value: 30, unit: 'C' } },
        curvePoints: 5,
      },
    }),
  },
  'GET /api/v1/comparisons': { access: 'user', ok: 200 },
  'POST /api/v1/comparisons': {
    access: 'editor',
    ok: 201,
    params: twoScreens,
    body: (p) => ({
      projectId: p.projectId,
      name: 'Matrix comparison',
      campaignIds: [p.first, p.second],
      temperature: { value: -20, unit: 'C' },
    }),
  },
  'GET /api/v1/comparisons/:comparisonId': {
    access: 'viewer',
    ok: 200,
    params: async (c) => {
      const { first, second } = await twoScreens(c);
      const row = await Comparison.query(testKnex())
        .insert({ projectId: c.projectId, name: 'Matrix comparison', campaignIds: [first, second], temperatureK: 253.15 })
        .returning('*');
      return { comparisonId: row.id };
    },
  },
};

/** Public calculators and documentation owned by other features: same answer for every valid caller. */
const PUBLIC_PREFIXES = [
  '/api/v1/openapi.json',
  '/api/v1/forecast',
  '/api/v1/fit',
  '/api/v1/distribution',
  '/api/v1/rate',
  '/api/v1/erosion',
  '/api/v1/plan',
];
const ruleFor = (route: string): Rule | undefined =>
  RULES[route] ?? (PUBLIC_PREFIXES.includes(route.split(' ')[1]) ? { access: 'public' } : undefined);

const ROLE_OF: Partial<Record<Who, ProjectRole>> = { viewer: 'viewer', editor: 'editor', owner: 'owner', bearer: 'editor' };
const RANK: Record<ProjectRole, number> = { viewer: 1, editor: 2, owner: 3 };

function expected(rule: Rule, who: Who, anonymousStatus: number): number {
  if (who === 'revoked') return 401;
  const okFor = (w: Who) => (typeof rule.ok === 'object' ? rule.ok[w] : rule.ok) ?? anonymousStatus;
  if (rule.access === 'public') return okFor(who);
  if (who === 'anonymous') return 401;
  if (rule.access === 'user') return okFor(who);
  if (rule.access === 'session') return who === 'bearer' ? 403 : okFor(who);
  const role = ROLE_OF[who];
  if (!role) return 404; // the outsider: the project must look as if it did not exist
  return RANK[role] < RANK[rule.access] ? 403 : okFor(who);
}

let env: AuthTestApp;
let users: Record<'owner' | 'editor' | 'viewer' | 'outsider', User>;
const agents: Partial<Record<Who, { agent: ReturnType<typeof request.agent>; csrf: string }>> = {};
let bearer = '';
let revoked = '';

async function signInAs(who: keyof typeof users) {
  const u = users[who];
  const s = await signIn(env.app, { login: u.login, name: u.displayName ?? u.login, email: u.email! });
  agents[who] = { agent: s.agent, csrf: s.csrfToken };
}

beforeAll(async () => {
  env = await startAuthApp();
  users = { owner: await createUser(), editor: await createUser(), viewer: await createUser(), outsider: await createUser() };
  await createProject([{ user: users.outsider, role: 'owner' }]);
  for (const who of ['owner', 'editor', 'viewer', 'outsider'] as const) await signInAs(who);
  bearer = (await createApiToken(users.editor)).secret;
  revoked = (await createApiToken(users.editor, { revoked: true })).secret;
});

afterAll(async () => {
  await env?.close();
  await closeTestKnex();
});

describe('authorization matrix', () => {
  it('when the app is built, then every /api route has an authorization rule in this matrix', () => {
    const routes = listRoutes(env.app);
    expect(routes.length).toBeGreaterThanOrEqual(Object.keys(RULES).length);
    expect(routes.filter((r) => !ruleFor(r))).toEqual([]);
    // And no rule describes a route that no longer exists.
    expect(Object.keys(RULES).filter((r) => !routes.includes(r))).toEqual([]);
  });

  it('when each caller calls each route, then each gets exactly the expected status', async () => {
    const mismatches: string[] = [];
    for (const route of listRoutes(env.app)) {
      const rule = ruleFor(route);
      if (!rule) continue;
      const [method, pattern] = route.split(' ');
      let anonymousStatus = 0;
      for (const who of WHO) {
        // A fresh project per cell, so one caller's change cannot decide the next one's answer.
        const project = await createProject([
          { user: users.owner, role: 'owner' },
          { user: users.editor, role: 'editor' },
          { user: users.viewer, role: 'viewer' },
        ]);
        const me = who in users ? users[who as keyof typeof users] : who === 'bearer' ? users.editor : null;
        const params = {
          projectId: project.id,
          ...(rule.params
            ? await rule.params({ projectId: project.id, me: who === 'bearer' || who === 'revoked' ? null : me, viewer: users.viewer })
            : {}),
        };
        const url = pattern.replace(/:(\w+)/g, (_m, name: string) => encodeURIComponent(params[name as keyof typeof params] ?? 'missing'));
        const session = agents[who];
        let req = (session ? session.agent : request(env.app))[method.toLowerCase() as 'get'](url);
        if (session && method !== 'GET') req = req.set('X-CSRF-Token', session.csrf);
        if (who === 'bearer') req = req.set('Authorization', `Bearer ${bearer}`);
        if (who === 'revoked') req = req.set('Authorization', `Bearer ${revoked}`);
        if (rule.query) req = req.query(rule.query);
        if (rule.body) req = req.send(rule.body(params) as object);
        const res = await req;
        if (who === 'anonymous') {
          anonymousStatus = res.status;
          if (rule.access === 'public' && (res.status === 401 || res.status === 403 || res.status >= 500))
            mismatches.push(`${route} anonymous: public route answered ${res.status}`);
        }
        const want = expected(rule, who, anonymousStatus);
        if (res.status !== want) mismatches.push(`${route} as ${who}: expected ${want}, got ${res.status} ${res.body?.detail ?? ''}`);
        if (rule.endsSession && session) await signInAs(who as keyof typeof users);
      }
    }
    expect(mismatches).toEqual([]);
  }, 120_000);
});
