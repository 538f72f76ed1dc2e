import { afterAll, afterEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { closeTestKnex, testKnex } from '../support/db';
import { signIn, startAuthApp, type AuthTestApp } from '../support/auth';
import { createUser, newIdentity } from '../factories/users';
import { createProject } from '../factories/projects';
import { createApiToken } from '../factories/tokens';
import { safeReturnTo } from '../../api/features/auth/schemas';
import { OAUTH_STATE_COOKIE } from '../../api/features/auth/oauth-state';

afterAll(closeTestKnex);
let env: AuthTestApp | null = null;
afterEach(async () => {
  await env?.close();
  env = null;
});

const sessionCount = async () => Number((await testKnex()('sessions').count({ n: '*' }).first())!.n);

describe('responses to signed-in callers', () => {
  it('when a signed-in caller reads any API route, then the answer says Cache-Control: no-store', async () => {
    env = await startAuthApp();
    const owner = await createUser();
    const project = await createProject([{ user: owner, role: 'owner' }]);
    const s = await signIn(env.app, { login: owner.login, name: owner.displayName!, email: owner.email! });
    for (const url of [`/api/v1/projects/${project.id}/members`, `/api/v1/projects/${project.id}`, '/api/v1/projects']) {
      expect((await s.agent.get(url).expect(200)).headers['cache-control']).toBe('no-store');
    }
    const { secret } = await createApiToken(owner);
    const viaToken = await request(env.app)
      .get(`/api/v1/projects/${project.id}/members`)
      .set('Authorization', `Bearer ${secret}`)
      .expect(200);
    expect(viaToken.headers['cache-control']).toBe('no-store');
  });
});

describe('cross-site writes (second layer beside the CSRF token)', () => {
  it('when a session write carries a foreign Origin or Sec-Fetch-Site: cross-site, then it is refused with 403 even with a valid token', async () => {
    env = await startAuthApp();
    const s = await signIn(env.app, newIdentity());
    const create = () => s.agent.post('/api/v1/projects').set('X-CSRF-Token', s.csrfToken);
    const foreign = await create().set('Origin', 'https://evil.example').send({ name: 'Forged' }).expect(403);
    expect(foreign.body.detail).toContain('https://evil.example');
    await create().set('Sec-Fetch-Site', 'cross-site').send({ name: 'Forged' }).expect(403);
    await create().set('Sec-Fetch-Site', 'same-site').send({ name: 'Forged' }).expect(403);
    await create().set('Origin', 'null').send({ name: 'Forged' }).expect(403);
    expect(await testKnex()('projects').where({ name: 'Forged' })).toEqual([]);
    // The configured public address and the address the request was made to are our own.
    await create().set('Origin', env.config.publicUrl).set('Sec-Fetch-Site', 'same-origin').send({ name: 'Own page' }).expect(201);
    await create().send({ name: 'No browser headers' }).expect(201);
  });
});

describe('sign-in start', () => {
  it('when an anonymous visitor opens the sign-in start, then no session row is written; the state lives in a short cookie', async () => {
    env = await startAuthApp();
    const before = await sessionCount();
    const res = await request(env.app).get('/auth/github?returnTo=%2Fprojects%2Fabc').set('Host', '127.0.0.1:3000').expect(302);
    expect(await sessionCount()).toBe(before);
    expect(([] as string[]).concat(res.headers['set-cookie'] ?? []).map((c) => c.split('=')[0])).toEqual([OAUTH_STATE_COOKIE]);
    // The round trip still works and returns to the page asked for.
    const done = await signIn(env.app, newIdentity(), '/projects/abc');
    expect(done.landedOn).toBe('/projects/abc');
  });

  it('when the callback comes without the state cookie (another browser), then sign-in fails cleanly', async () => {
    env = await startAuthApp();
    const who = newIdentity();
    const start = await request(env.app).get('/auth/github').set('Host', '127.0.0.1:3000').expect(302);
    const authorize = new URL(start.headers.location);
    const form = new URLSearchParams({
      client_id: authorize.searchParams.get('client_id')!,
      redirect_uri: authorize.searchParams.get('redirect_uri')!,
      state: authorize.searchParams.get('state')!,
      ...who,
    });
    const picked = await fetch(`${authorize.origin}${authorize.pathname}`, { method: 'POST', body: form, redirect: 'manual' });
    const callback = new URL(picked.headers.get('location')!);
    const res = await request(env.app)
      .get(callback.pathname + callback.search)
      .set('Host', '127.0.0.1:3000')
      .expect(303);
    expect(res.headers.location).toBe('/sign-in?error=failed');
  });

  it('when a return path could lead off the site, then it is dropped (the web app applies the same rule)', () => {
    expect(safeReturnTo('/projects/1?tab=x')).toBe('/projects/1?tab=x');
    for (const bad of ['//evil.example', '/\\evil.example', 'https://evil.example', '/a\nb', '/a\u0000b', 42])
      expect(safeReturnTo(bad)).toBeUndefined();
  });

  it('when the local sign-in page is served, then it carries the same security headers as the app', async () => {
    env = await startAuthApp();
    const start = await request(env.app).get('/auth/github').expect(302);
    const page = await fetch(start.headers.location);
    expect(page.status).toBe(200);
    expect(page.headers.get('content-security-policy')).toMatch(/script-src 'none'/);
    expect(page.headers.get('content-security-policy')).toMatch(/frame-ancestors 'self'/);
    expect(page.headers.get('x-content-type-options')).toBe('nosniff');
    expect(page.headers.get('x-frame-options')).toBe('SAMEORIGIN');
  });
});

describe('transport', () => {
  it('when the request came over plain http, then there is no HSTS header; over HTTPS through the loopback proxy, there is', async () => {
    env = await startAuthApp();
    const plain = await request(env.app).get('/api/health');
    expect(plain.headers['strict-transport-security']).toBeUndefined();
    const tls = await request(env.app).get('/api/health').set('X-Forwarded-Proto', 'https');
    expect(tls.headers['strict-transport-security']).toMatch(/max-age=\d+/);
  });
});

describe('API-token management limit', () => {
  it('when a bearer token calls the token routes, then it is refused without using up its owner’s budget', async () => {
    env = await startAuthApp({
      config: {
        rateLimit: {
          windowMs: 60_000,
          signIn: 100,
          tokens: 3,
          compute: 100,
          uploads: 100,
          keyPrefix: `hardening-${Date.now()}-${Math.random()}`,
        },
      },
    });
    const owner = await createUser();
    const { secret } = await createApiToken(owner);
    for (let i = 0; i < 6; i++) await request(env.app).get('/api/v1/tokens').set('Authorization', `Bearer ${secret}`).expect(403);
    const s = await signIn(env.app, { login: owner.login, name: owner.displayName!, email: owner.email! });
    for (let i = 0; i < 3; i++) await s.agent.get('/api/v1/tokens').expect(200);
    await s.agent.get('/api/v1/tokens').expect(429);
  });
});
