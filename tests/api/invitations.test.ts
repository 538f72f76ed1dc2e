import { afterAll, afterEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { closeTestKnex, testKnex } from '../support/db';
import { signIn, startAuthApp, type AuthTestApp } from '../support/auth';
import { createUser, newIdentity } from '../factories/users';
import { createProject } from '../factories/projects';
import type { User } from '../../api/models/user';

afterAll(closeTestKnex);
let env: AuthTestApp | null = null;
afterEach(async () => {
  await env?.close();
  env = null;
});

async function as(who: { login: string; displayName?: string | null; name?: string; email?: string | null }) {
  const s = await signIn(env!.app, { login: who.login, name: who.name ?? who.displayName ?? who.login, email: who.email! });
  const write = (method: 'post' | 'patch' | 'delete', url: string) => s.agent[method](url).set('X-CSRF-Token', s.csrfToken);
  return { ...s, write };
}

/** Invite through the API and read the link out of the e-mail the SMTP sink received. */
async function inviteAndReadLink(owner: Awaited<ReturnType<typeof as>>, projectId: string, email: string, role: string) {
  await owner.write('post', `/api/v1/projects/${projectId}/invitations`).send({ email, role }).expect(201);
  const message = await waitForMail(email.toLowerCase());
  const link = /https?:\/\/\S+\/invitations\/([A-Za-z0-9_-]+)/.exec(message.text);
  if (!link) throw new Error(`no invitation link in: ${message.text}`);
  return { message, token: link[1] };
}

async function waitForMail(to: string) {
  for (let i = 0; i < 50; i++) {
    const found = env!.mailbox.list().find((m) => m.to.includes(to));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 20));
  }
  throw new Error(`no mail reached the sink for ${to}`);
}

describe('invitations by e-mail', () => {
  it('when an owner invites an address, then the mail reaches the SMTP sink and the invitee who signs in with it joins with that role', async () => {
    env = await startAuthApp({ smtpSink: true });
    const ownerUser = await createUser({ name: 'Olive Owner' });
    const project = await createProject([{ user: ownerUser, role: 'owner' }], { name: 'Hydrogenation (invented)' });
    const owner = await as(ownerUser);
    const invitee = newIdentity();
    const { message, token } = await inviteAndReadLink(owner, project.id, invitee.email.toUpperCase(), 'editor');
    expect(message.subject).toBe('Olive Owner invited you to “Hydrogenation (invented)” on Eyrie');
    expect(message.text).toContain('as editor');
    expect(await testKnex()('invitations').where({ projectId: project.id }).first('email')).toEqual({ email: invitee.email });
    expect(JSON.stringify(await testKnex()('invitations').where({ projectId: project.id }))).not.toContain(token);

    const pending = await owner.agent.get(`/api/v1/projects/${project.id}/invitations`).expect(200);
    expect(pending.body.invitations).toEqual([expect.objectContaining({ email: invitee.email, role: 'editor', status: 'pending' })]);

    await request(env.app).get(`/api/v1/invitations/${token}`).expect(401);
    const them = await as(invitee);
    const details = await them.agent.get(`/api/v1/invitations/${token}`).expect(200);
    expect(details.body.invitation).toMatchObject({ projectId: project.id, projectName: 'Hydrogenation (invented)', role: 'editor' });
    const accepted = await them.write('post', `/api/v1/invitations/${token}/accept`).expect(200);
    expect(accepted.body).toEqual({ projectId: project.id, role: 'editor' });
    expect((await them.agent.get(`/api/v1/projects/${project.id}`).expect(200)).body.project.role).toBe('editor');
    expect((await owner.agent.get(`/api/v1/projects/${project.id}/invitations`)).body.invitations).toEqual([]);

    const history = (await owner.agent.get(`/api/v1/projects/${project.id}/audit-events`)).body.events;
    expect(history.map((e: { action: string; entityType: string }) => `${e.action} ${e.entityType}`)).toEqual([
      'update invitation',
      'create project_member',
      'create invitation',
    ]);

    // The link works once.
    const again = await them.write('post', `/api/v1/invitations/${token}/accept`).expect(410);
    expect(again.body).toMatchObject({ code: 'invitation-used', detail: expect.stringMatching(/already been used/) });
  });

  it('when someone signed in with another address opens or accepts the link, then it is refused and the invitation stays usable', async () => {
    env = await startAuthApp({ smtpSink: true });
    const ownerUser = await createUser();
    const project = await createProject([{ user: ownerUser, role: 'owner' }]);
    const owner = await as(ownerUser);
    const invitee = newIdentity();
    const { token } = await inviteAndReadLink(owner, project.id, invitee.email, 'viewer');
    const stranger = await as(newIdentity());
    const look = await stranger.agent.get(`/api/v1/invitations/${token}`).expect(403);
    expect(look.body.code).toBe('invitation-wrong-account');
    expect(look.body.detail).toContain(invitee.email.slice(0, 1) + '•••@example.test');
    expect(look.body.detail).not.toContain(invitee.email);
    await stranger.write('post', `/api/v1/invitations/${token}/accept`).expect(403);
    await stranger.agent.get(`/api/v1/projects/${project.id}`).expect(404);
    const rightOne = await as(invitee);
    await rightOne.write('post', `/api/v1/invitations/${token}/accept`).expect(200);
  });

  it('when the link has expired or was withdrawn, then opening it says so with 410 and a code', async () => {
    env = await startAuthApp({ smtpSink: true });
    const ownerUser = await createUser();
    const project = await createProject([{ user: ownerUser, role: 'owner' }]);
    const owner = await as(ownerUser);
    const invitee = newIdentity();
    const them = await as(invitee);
    const first = await inviteAndReadLink(owner, project.id, invitee.email, 'viewer');
    await testKnex()('invitations')
      .where({ projectId: project.id })
      .update({ expiresAt: new Date(Date.now() - 60_000) });
    const expired = await them.write('post', `/api/v1/invitations/${first.token}/accept`).expect(410);
    expect(expired.body).toMatchObject({ code: 'invitation-expired', detail: expect.stringMatching(/expired on/) });

    env.mailbox.list().length = 0;
    const second = await inviteAndReadLink(owner, project.id, invitee.email, 'viewer');
    const [pending] = (await owner.agent.get(`/api/v1/projects/${project.id}/invitations`)).body.invitations;
    await owner.write('delete', `/api/v1/projects/${project.id}/invitations/${pending.id}`).expect(204);
    expect((await them.agent.get(`/api/v1/invitations/${second.token}`).expect(410)).body.code).toBe('invitation-revoked');
    await them.agent.get('/api/v1/invitations/not-a-real-link').expect(404);
    await them.agent.get(`/api/v1/projects/${project.id}`).expect(404);
  });

  it('when the address is invalid or already a member, then the owner gets a specific error', async () => {
    env = await startAuthApp({ smtpSink: true });
    const ownerUser = await createUser();
    const member: User = await createUser();
    const project = await createProject([
      { user: ownerUser, role: 'owner' },
      { user: member, role: 'viewer' },
    ]);
    const owner = await as(ownerUser);
    const bad = await owner.write('post', `/api/v1/projects/${project.id}/invitations`).send({ email: 'nobody', role: 'boss' }).expect(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['email', 'role']);
    const dup = await owner
      .write('post', `/api/v1/projects/${project.id}/invitations`)
      .send({ email: member.email, role: 'editor' })
      .expect(409);
    expect(dup.body.detail).toContain(member.login);
  });

  it('when the mail cannot be sent, then the owner gets 502 and no invitation is left behind', async () => {
    env = await startAuthApp({ mailer: { send: async () => Promise.reject(new Error('connection refused')) } });
    const ownerUser = await createUser();
    const project = await createProject([{ user: ownerUser, role: 'owner' }]);
    const owner = await as(ownerUser);
    const res = await owner
      .write('post', `/api/v1/projects/${project.id}/invitations`)
      .send({ email: 'someone@example.test', role: 'viewer' })
      .expect(502);
    // The mail server's own words stay in the server log: they may name hosts or accounts.
    expect(res.body.type).toBe('/problems/mail-not-sent');
    expect(JSON.stringify(res.body)).not.toMatch(/connection refused/);
    expect(await testKnex()('invitations').where({ projectId: project.id })).toEqual([]);
    expect(await testKnex()('audit_events').where({ projectId: project.id })).toEqual([]);
  });

  it('when dev tools are on, then the invitee reads the caught message with its link in the mailbox', async () => {
    env = await startAuthApp({ smtpSink: true });
    const ownerUser = await createUser();
    const project = await createProject([{ user: ownerUser, role: 'owner' }], { name: 'Mailbox <check>' });
    const owner = await as(ownerUser);
    const reader = newIdentity();
    const { token } = await inviteAndReadLink(owner, project.id, reader.email, 'viewer');
    const them = await as(reader);
    const page = await them.agent.get('/dev/mailbox').expect(200);
    expect(page.headers['cache-control']).toBe('no-store');
    expect(page.text).toContain(reader.email);
    expect(page.text).toContain('Mailbox &lt;check&gt;');
    expect(page.text).toMatch(new RegExp(`<a href="[^"]+/invitations/${token}">`));
  });

  it('when the mailbox is opened anonymously or by someone else, then no invitation link is shown; the owner sees what their project sent', async () => {
    env = await startAuthApp({ smtpSink: true });
    const ownerUser = await createUser();
    const project = await createProject([{ user: ownerUser, role: 'owner' }], { name: 'Private screen (invented)' });
    const owner = await as(ownerUser);
    const invitee = newIdentity();
    const { token } = await inviteAndReadLink(owner, project.id, invitee.email, 'owner');

    const anonymous = await request(env.app).get('/dev/mailbox').expect(401);
    expect(anonymous.text).not.toContain(token);
    expect(anonymous.text).toContain('Sign in');
    const anonymousJson = await request(env.app).get('/dev/mailbox.json').expect(401);
    expect(anonymousJson.body).toMatchObject({ status: 401 });
    expect(JSON.stringify(anonymousJson.body)).not.toContain(token);

    const stranger = await as(newIdentity());
    const strangerPage = await stranger.agent.get('/dev/mailbox').expect(200);
    expect(strangerPage.text).not.toContain(token);
    expect(strangerPage.text).not.toContain(invitee.email);
    const strangerJson = await stranger.agent.get('/dev/mailbox.json').expect(200);
    expect(strangerJson.body.messages.filter((m: { text: string }) => m.text.includes(token))).toEqual([]);

    // An editor of the project is not its owner and does not see what it sent.
    const editorUser = await createUser();
    await testKnex()('project_members').insert({ projectId: project.id, userId: editorUser.id, role: 'editor' });
    const editor = await as(editorUser);
    expect((await editor.agent.get('/dev/mailbox.json').expect(200)).text).not.toContain(token);

    const ownerView = await owner.agent.get('/dev/mailbox.json').expect(200);
    expect(ownerView.body.messages).toEqual([
      expect.objectContaining({ to: [invitee.email], projectId: project.id, text: expect.stringContaining(token) }),
    ]);
    const inviteeView = await (await as(invitee)).agent.get('/dev/mailbox.json').expect(200);
    expect(inviteeView.body.messages.map((m: { text: string }) => m.text.includes(token))).toEqual([true]);
  });
});
