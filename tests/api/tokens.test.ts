import { afterAll, afterEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { closeTestKnex, testKnex } from '../support/db';
import { signIn, startAuthApp, type AuthTestApp } from '../support/auth';
import { createUser, newIdentity } from '../factories/users';
import { createProject } from '../factories/projects';
import { createApiToken } from '../factories/tokens';
import { hashSecret } from '../../api/lib/secrets';

afterAll(closeTestKnex);
let env: AuthTestApp | null = null;
afterEach(async () => {
  await env?.close();
  env = null;
});

describe('personal API tokens', () => {
  it('when a token is created, then its secret is shown once, only its hash is stored, and the list never shows it again', async () => {
    env = await startAuthApp();
    const { agent, csrfToken } = await signIn(env.app, newIdentity());
    const made = await agent
      .post('/api/v1/tokens')
      .set('X-CSRF-Token', csrfToken)
      .send({ name: 'nightly export', expiresInDays: 30 })
      .expect(201);
    expect(made.body.secret).toMatch(/^eyr_[A-Za-z0-9_-]{43}$/);
    expect(made.body.token).toMatchObject({ name: 'nightly export', status: 'active', prefix: made.body.secret.slice(0, 10) });
    const days = (Date.parse(made.body.token.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(29.9);
    expect(days).toBeLessThanOrEqual(30);

    const row = await testKnex()('api_tokens').where({ id: made.body.token.id }).first();
    expect(row.tokenHash).toBe(hashSecret(made.body.secret));
    expect(JSON.stringify(row)).not.toContain(made.body.secret);
    const list = await agent.get('/api/v1/tokens').expect(200);
    expect(list.body.tokens.map((t: { id: string }) => t.id)).toEqual([made.body.token.id]);
    expect(JSON.stringify(list.body)).not.toContain(made.body.secret);
  });

  it('when the name or expiry is wrong, then a 400 problem names each field', async () => {
    env = await startAuthApp();
    const { agent, csrfToken } = await signIn(env.app, newIdentity());
    const res = await agent.post('/api/v1/tokens').set('X-CSRF-Token', csrfToken).send({ name: '  ', expiresInDays: 0 }).expect(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['expiresInDays', 'name']);
    const tooLong = await agent
      .post('/api/v1/tokens')
      .set('X-CSRF-Token', csrfToken)
      .send({ name: 'ok', expiresInDays: 'soon' })
      .expect(400);
    expect(tooLong.body.errors).toEqual([{ path: 'expiresInDays', message: 'Enter a number of days.' }]);
  });

  it("when a token is used as a bearer, then it acts with exactly its owner's roles and needs no CSRF token", async () => {
    env = await startAuthApp();
    const viewer = await createUser();
    const other = await createUser();
    const mine = await createProject(
      [
        { user: viewer, role: 'viewer' },
        { user: other, role: 'owner' },
      ],
      { name: 'Viewed' },
    );
    const notMine = await createProject([{ user: other, role: 'owner' }]);
    const { secret } = await createApiToken(viewer);
    const auth = { Authorization: `Bearer ${secret}` };

    const list = await request(env.app).get('/api/v1/projects').set(auth).expect(200);
    expect(list.body.projects.map((p: { id: string; role: string }) => [p.id, p.role])).toEqual([[mine.id, 'viewer']]);
    await request(env.app).get(`/api/v1/projects/${notMine.id}`).set(auth).expect(404);
    await request(env.app).patch(`/api/v1/projects/${mine.id}`).set(auth).send({ name: 'Changed' }).expect(403);
    const created = await request(env.app).post('/api/v1/projects').set(auth).send({ name: 'By script' }).expect(201);
    expect(created.headers['set-cookie']).toBeUndefined();
    const used = await testKnex()('api_tokens')
      .where({ tokenHash: hashSecret(secret) })
      .first();
    expect(used.lastUsedAt).not.toBeNull();
  });

  it('when a token is revoked, expired or mistyped, then bearer requests get 401', async () => {
    env = await startAuthApp();
    const owner = createUser();
    const u = await owner;
    const { agent, csrfToken } = await signIn(env.app, { login: u.login, name: u.displayName!, email: u.email! });
    const live = await createApiToken(u);
    await request(env.app).get('/api/v1/projects').set('Authorization', `Bearer ${live.secret}`).expect(200);
    await agent.delete(`/api/v1/tokens/${live.token.id}`).set('X-CSRF-Token', csrfToken).expect(204);
    const res = await request(env.app).get('/api/v1/projects').set('Authorization', `Bearer ${live.secret}`).expect(401);
    expect(res.body.detail).toMatch(/expired or revoked/);
    expect((await agent.get('/api/v1/tokens')).body.tokens[0].status).toBe('revoked');

    const old = await createApiToken(u);
    await testKnex()('api_tokens')
      .where({ id: old.token.id })
      .update({ expiresAt: new Date(Date.now() - 1000) });
    await request(env.app).get('/api/v1/projects').set('Authorization', `Bearer ${old.secret}`).expect(401);
    await request(env.app)
      .get('/api/v1/projects')
      .set('Authorization', `Bearer ${live.secret.slice(0, -1)}x`)
      .expect(401);
    await request(env.app).get('/api/v1/projects').set('Authorization', 'Bearer').expect(401);
  });

  it("when someone revokes another person's token id, then it is 404 and the token keeps working", async () => {
    env = await startAuthApp();
    const victim = await createUser();
    const theirs = await createApiToken(victim);
    const { agent, csrfToken } = await signIn(env.app, newIdentity());
    await agent.delete(`/api/v1/tokens/${theirs.token.id}`).set('X-CSRF-Token', csrfToken).expect(404);
    await agent.delete('/api/v1/tokens/not-a-uuid').set('X-CSRF-Token', csrfToken).expect(404);
    await request(env.app).get('/api/v1/projects').set('Authorization', `Bearer ${theirs.secret}`).expect(200);
  });

  it('when a bearer token tries to manage tokens, then it is refused so a token cannot outlive its expiry', async () => {
    env = await startAuthApp();
    const u = await createUser();
    const { secret } = await createApiToken(u);
    const res = await request(env.app)
      .post('/api/v1/tokens')
      .set('Authorization', `Bearer ${secret}`)
      .send({ name: 'child', expiresInDays: 365 })
      .expect(403);
    expect(res.body.detail).toMatch(/cannot manage API tokens/);
  });
});
