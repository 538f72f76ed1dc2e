import { afterAll, afterEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { closeTestKnex, testKnex } from '../support/db';
import { sessionCookie, signIn, startAuthApp, type AuthTestApp } from '../support/auth';
import { newIdentity } from '../factories/users';
import { testApp } from '../support/app';
import { loadConfig } from '../../api/config';

afterAll(closeTestKnex);

let running: AuthTestApp | null = null;
afterEach(async () => {
  await running?.close();
  running = null;
});
async function start(...args: Parameters<typeof startAuthApp>) {
  running = await startAuthApp(...args);
  return running;
}
const sid = (cookie: string | undefined) => decodeURIComponent(cookie!.split(';')[0].split('=')[1]).slice(2).split('.')[0];

describe('signing in through the local fake OAuth provider', () => {
  it('when someone completes the round trip, then they are signed in as the identity they typed and land on the projects list', async () => {
    const { app } = await start();
    const who = newIdentity({ name: 'Rowan Test' });
    const anonymous = await request(app).get('/api/v1/session').expect(200);
    expect(anonymous.body).toEqual({ user: null, csrfToken: null, devTools: true });

    const { agent, user, landedOn, csrfToken } = await signIn(app, who);
    expect(landedOn).toBe('/projects');
    expect(user).toMatchObject({ login: who.login, displayName: 'Rowan Test', email: who.email });
    expect(csrfToken).toMatch(/^[0-9a-f]{64,}$/);
    const row = await testKnex()('users').where({ provider: 'local-demo', login: who.login }).first();
    expect(row.email).toBe(who.email);
    expect((await agent.get('/api/v1/projects').expect(200)).body).toEqual({ projects: [] });
  });

  it('when the provider page is opened, then it lists the invented demo people and a form to type an identity', async () => {
    const { app } = await start();
    const startRes = await request(app).get('/auth/github').expect(302);
    const page = await fetch(startRes.headers.location);
    const html = await page.text();
    expect(page.status).toBe(200);
    expect(html).toContain('Ada Pemberton');
    expect(html).toContain('invented');
    expect(html).toMatch(/<input id="f-email" name="email"/);
  });

  it('when the typed e-mail is not an address, then the provider page answers 400 and names the field', async () => {
    const { app } = await start();
    const startRes = await request(app).get('/auth/github').expect(302);
    const url = new URL(startRes.headers.location);
    const form = new URLSearchParams({
      client_id: url.searchParams.get('client_id')!,
      redirect_uri: url.searchParams.get('redirect_uri')!,
      state: 'x',
      login: 'ok-login',
      name: 'N',
      email: 'not-an-address',
    });
    const res = await fetch(`${url.origin}${url.pathname}`, { method: 'POST', body: form, redirect: 'manual' });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('id="e-email"');
  });

  it('when a code is exchanged twice, then the provider refuses the second exchange', async () => {
    const { app, provider } = await start();
    const startRes = await request(app).get('/auth/github').set('Host', '127.0.0.1:3000').expect(302);
    const url = new URL(startRes.headers.location);
    const redirectUri = url.searchParams.get('redirect_uri')!;
    const form = new URLSearchParams({ client_id: provider.clientId, redirect_uri: redirectUri, state: 's', ...newIdentity() });
    const picked = await fetch(provider.endpoints.authorizationURL, { method: 'POST', body: form, redirect: 'manual' });
    const code = new URL(picked.headers.get('location')!).searchParams.get('code')!;
    const exchange = () =>
      fetch(provider.endpoints.tokenURL, {
        method: 'POST',
        body: new URLSearchParams({ client_id: provider.clientId, client_secret: provider.clientSecret, code, redirect_uri: redirectUri }),
      });
    expect((await exchange()).status).toBe(200);
    const second = await exchange();
    expect(second.status).toBe(400);
    expect(await second.json()).toMatchObject({ error: 'bad_verification_code' });
  });

  it('when the callback carries a state that this browser did not start, then sign-in fails (no login CSRF)', async () => {
    const { app } = await start();
    const victim = request.agent(app);
    await victim.get('/auth/github').set('Host', '127.0.0.1:3000').expect(302);
    // An attacker's own finished authorization, replayed into the victim's browser.
    const attacker = newIdentity();
    const startRes = await request(app).get('/auth/github').set('Host', '127.0.0.1:3000').expect(302);
    const url = new URL(startRes.headers.location);
    const form = new URLSearchParams({
      client_id: url.searchParams.get('client_id')!,
      redirect_uri: url.searchParams.get('redirect_uri')!,
      state: url.searchParams.get('state')!,
      ...attacker,
    });
    const picked = await fetch(`${url.origin}${url.pathname}`, { method: 'POST', body: form, redirect: 'manual' });
    const callback = new URL(picked.headers.get('location')!);
    const res = await victim
      .get(callback.pathname + callback.search)
      .set('Host', '127.0.0.1:3000')
      .expect(303);
    expect(res.headers.location).toBe('/sign-in?error=failed');
    expect((await victim.get('/api/v1/session')).body.user).toBeNull();
  });

  it('when returnTo is a same-site path it is honoured; when it points off-site it is ignored', async () => {
    const { app } = await start();
    expect((await signIn(app, newIdentity(), '/projects/abc/settings')).landedOn).toBe('/projects/abc/settings');
    expect((await signIn(app, newIdentity(), '//evil.example/steal')).landedOn).toBe('/projects');
  });

  it('when neither GitHub credentials nor the fake provider are available, then sign-in explains it is unavailable', async () => {
    const { app } = testApp();
    const res = await request(app).get('/auth/github').expect(303);
    expect(res.headers.location).toBe('/sign-in?error=unavailable');
  });
});

describe('sessions', () => {
  it('when signed in over plain http, then the cookie is HttpOnly and SameSite=Lax and not Secure; behind a TLS proxy it is Secure', async () => {
    const { app } = await start();
    const { done } = await signIn(app, newIdentity());
    const cookie = sessionCookie(done.headers['set-cookie'])!;
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/);

    // The same round trip through a TLS-terminating loopback proxy: the state cookie and the session cookie are Secure.
    const host = '127.0.0.1:3000';
    const startRes = await request(app).get('/auth/github').set('Host', host).set('X-Forwarded-Proto', 'https').expect(302);
    const stateCookie = ([] as string[]).concat(startRes.headers['set-cookie'] ?? []).find((c) => c.startsWith('eyrie.oauth='))!;
    expect(stateCookie).toMatch(/; Secure/);
    expect(stateCookie).toMatch(/HttpOnly/);
    const url = new URL(startRes.headers.location);
    const form = new URLSearchParams({
      client_id: url.searchParams.get('client_id')!,
      redirect_uri: url.searchParams.get('redirect_uri')!,
      state: url.searchParams.get('state')!,
      ...newIdentity(),
    });
    const picked = await fetch(`${url.origin}${url.pathname}`, { method: 'POST', body: form, redirect: 'manual' });
    const callback = new URL(picked.headers.get('location')!);
    const tls = await request(app)
      .get(callback.pathname + callback.search)
      .set('Host', host)
      .set('X-Forwarded-Proto', 'https')
      .set('Cookie', stateCookie.split(';')[0])
      .expect(303);
    expect(tls.headers.location).toBe('/projects');
    expect(sessionCookie(tls.headers['set-cookie'])).toMatch(/; Secure/);
  });

  it('when someone signs in again in the same browser, then the session id changes (no fixation) and the earlier session is gone', async () => {
    const { app } = await start();
    const first = await signIn(app, newIdentity());
    const preId = sid(sessionCookie(first.done.headers['set-cookie']));
    const second = await signIn(app, newIdentity(), undefined, first.agent);
    const postId = sid(sessionCookie(second.done.headers['set-cookie']));
    expect(postId).not.toBe(preId);
    expect((await second.agent.get('/api/v1/session')).body.user.login).toBe(second.user.login);
    expect(await testKnex()('sessions').where({ sid: preId })).toEqual([]);
    // The old cookie no longer signs anyone in.
    const old = await request(app).get('/api/v1/session').set('Cookie', sessionCookie(first.done.headers['set-cookie'])!.split(';')[0]);
    expect(old.body.user).toBeNull();
  });

  it('when someone signs out with the CSRF token, then the session row is destroyed and the cookie cleared', async () => {
    const { app } = await start();
    const { agent, csrfToken } = await signIn(app, newIdentity());
    const count = async () => Number((await testKnex()('sessions').count({ n: '*' }).first())!.n);
    const rowsBefore = await count();
    const out = await agent.delete('/api/v1/session').set('X-CSRF-Token', csrfToken).expect(204);
    expect(sessionCookie(out.headers['set-cookie'])).toMatch(/Expires=Thu, 01 Jan 1970/);
    expect(await count()).toBeLessThan(rowsBefore);
    expect((await agent.get('/api/v1/session')).body.user).toBeNull();
  });
});

describe('CSRF protection', () => {
  it('when a cookie-authenticated write has no CSRF token or a wrong one, then it is refused with 403 and nothing changes', async () => {
    const { app } = await start();
    const { agent, csrfToken, user } = await signIn(app, newIdentity());
    const none = await agent.post('/api/v1/projects').send({ name: 'Forged' }).expect(403);
    expect(none.body.detail).toMatch(/CSRF/);
    await agent.post('/api/v1/projects').set('X-CSRF-Token', 'f'.repeat(256)).send({ name: 'Forged' }).expect(403);
    await agent.delete('/api/v1/session').expect(403);
    const owned = await testKnex()('project_members').where({ userId: user.id });
    expect(owned).toEqual([]);
    await agent.post('/api/v1/projects').set('X-CSRF-Token', csrfToken).send({ name: 'Real' }).expect(201);
  });

  it('when the CSRF token of another session is used, then it is refused', async () => {
    const { app } = await start();
    const a = await signIn(app, newIdentity());
    const b = await signIn(app, newIdentity());
    await a.agent.post('/api/v1/projects').set('X-CSRF-Token', b.csrfToken).send({ name: 'Cross' }).expect(403);
  });
});

describe('rate limits', () => {
  it('when sign-in is attempted more often than the limit, then the next attempt gets a 429 problem', async () => {
    const { app } = await start({ config: { rateLimit: { ...loadConfig().rateLimit, signIn: 3 } } });
    for (let i = 0; i < 3; i++) await request(app).get('/auth/github').expect(302);
    const res = await request(app).get('/auth/github').expect(429);
    expect(res.body).toMatchObject({ status: 429, title: 'Too many requests' });
    expect(res.headers['ratelimit-policy']).toBeDefined();
  });

  it('when the token endpoints are called more often than the limit, then the next call gets 429', async () => {
    const { app } = await start({ config: { rateLimit: { ...loadConfig().rateLimit, tokens: 2 } } });
    const { agent, csrfToken } = await signIn(app, newIdentity());
    await agent.post('/api/v1/tokens').set('X-CSRF-Token', csrfToken).send({ name: 'one', expiresInDays: 1 }).expect(201);
    await agent.get('/api/v1/tokens').expect(200);
    const res = await agent.post('/api/v1/tokens').set('X-CSRF-Token', csrfToken).send({ name: 'three', expiresInDays: 1 }).expect(429);
    expect(res.body.detail).toMatch(/API-token/);
  });
});
