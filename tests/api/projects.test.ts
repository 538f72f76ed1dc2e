import { afterAll, afterEach, describe, expect, it } from 'vitest';
import { closeTestKnex, testKnex } from '../support/db';
import { signIn, startAuthApp, type AuthTestApp } from '../support/auth';
import { createUser } from '../factories/users';
import { createProject } from '../factories/projects';
import type { User } from '../../api/models/user';
import type { ProjectRole } from '../../api/features/projects/schemas';
import { recordAudit } from '../../api/lib/audit';

afterAll(closeTestKnex);
let env: AuthTestApp | null = null;
afterEach(async () => {
  await env?.close();
  env = null;
});

async function as(user: User) {
  const s = await signIn(env!.app, { login: user.login, name: user.displayName!, email: user.email! });
  const write = (method: 'post' | 'patch' | 'delete', url: string) => s.agent[method](url).set('X-CSRF-Token', s.csrfToken);
  return { ...s, write };
}
/** The app started and an owner signed in to a project of theirs, shared with one more person as `member` when asked. */
async function ownerOfProject(options: { name?: string; member?: ProjectRole } = {}) {
  env = await startAuthApp();
  const owner = await createUser();
  const member = options.member ? await createUser() : null;
  const p = await createProject(
    [{ user: owner, role: 'owner' }, ...(member && options.member ? [{ user: member, role: options.member }] : [])],
    options.name ? { name: options.name } : {},
  );
  return { owner, member: member!, p, o: await as(owner) };
}
const events = (projectId: string) => testKnex()('audit_events').where({ projectId }).orderBy('id');

describe('projects and their members', () => {
  it('when someone creates a project, then they are its owner and the creation is in its history', async () => {
    env = await startAuthApp();
    const me = await as(await createUser());
    const res = await me.write('post', '/api/v1/projects').send({ name: '  Aldol screen  ', description: 'Invented.' }).expect(201);
    expect(res.body.project).toMatchObject({ name: 'Aldol screen', description: 'Invented.', role: 'owner', memberCount: 1 });
    const history = await events(res.body.project.id);
    expect(history.map((e) => [e.action, e.entityType, e.actorUserId])).toEqual([
      ['create', 'project', me.user.id],
      ['create', 'project_member', me.user.id],
    ]);
    expect(history[0].after).toMatchObject({ name: 'Aldol screen' });
  });

  it('when the name is missing or too long, then the 400 problem names the field', async () => {
    env = await startAuthApp();
    const me = await as(await createUser());
    const empty = await me.write('post', '/api/v1/projects').send({ description: 'x' }).expect(400);
    expect(empty.body.errors).toEqual([{ path: 'name', message: 'Give the project a name.' }]);
    const long = await me
      .write('post', '/api/v1/projects')
      .send({ name: 'x'.repeat(121) })
      .expect(400);
    expect(long.body.errors[0].path).toBe('name');
    const wrongType = await me.write('post', '/api/v1/projects').send({ name: 'ok', description: 5 }).expect(400);
    expect(wrongType.body.errors[0].path).toBe('description');
  });

  it('when people list projects, then each sees only the projects they belong to, with their role', async () => {
    env = await startAuthApp();
    const a = await createUser();
    const b = await createUser();
    const shared = await createProject([
      { user: a, role: 'owner' },
      { user: b, role: 'viewer' },
    ]);
    await createProject([{ user: a, role: 'owner' }]);
    const bs = await as(b);
    const list = await bs.agent.get('/api/v1/projects').expect(200);
    expect(list.body.projects).toEqual([expect.objectContaining({ id: shared.id, role: 'viewer', memberCount: 2 })]);
  });

  it('when an owner renames a project, then history keeps the values before and after', async () => {
    const { owner, p, o } = await ownerOfProject({ name: 'Old name' });
    const renamed = await o.write('patch', `/api/v1/projects/${p.id}`).send({ name: 'New name', version: 1 }).expect(200);
    expect(renamed.body.project).toMatchObject({ name: 'New name', version: 2 });
    const [e] = await events(p.id);
    expect(e).toMatchObject({ action: 'update', entityType: 'project', entityId: p.id, actorUserId: owner.id });
    expect(e.before).toMatchObject({ name: 'Old name' });
    expect(e.after).toMatchObject({ name: 'New name' });
    const history = await o.agent.get(`/api/v1/projects/${p.id}/audit-events`).expect(200);
    expect(history.body.events[0]).toMatchObject({
      action: 'update',
      actor: { login: owner.login },
      before: { name: 'Old name' },
      after: { name: 'New name' },
    });
    await o.write('patch', `/api/v1/projects/${p.id}`).send({ version: 2 }).expect(400);
  });

  it('when a project change names an old version, then 409 gives the current version and nothing changes', async () => {
    const { p, o } = await ownerOfProject({ name: 'Versioned' });
    const missing = await o.write('patch', `/api/v1/projects/${p.id}`).send({ name: 'No version' }).expect(400);
    expect(missing.body.errors).toEqual([{ path: 'version', message: expect.any(String) }]);
    await o.write('patch', `/api/v1/projects/${p.id}`).send({ description: 'first', version: 1 }).expect(200);
    const stale = await o.write('patch', `/api/v1/projects/${p.id}`).send({ name: 'Lost update', version: 1 }).expect(409);
    expect(stale.body).toMatchObject({ status: 409, currentVersion: 2 });
    const viaHeader = await o.write('patch', `/api/v1/projects/${p.id}`).set('If-Match', 'W/"2"').send({ name: 'Kept' }).expect(200);
    expect(viaHeader.body.project).toMatchObject({ name: 'Kept', description: 'first', version: 3 });
    expect((await events(p.id)).length).toBe(2);
  });

  it('when the last owner tries to leave or be demoted, then it is refused with 409 and nothing is recorded', async () => {
    const { owner, member: editor, p, o } = await ownerOfProject({ member: 'editor' });
    const leave = await o.write('delete', `/api/v1/projects/${p.id}/membership`).expect(409);
    expect(leave.body.detail).toMatch(/last owner/);
    await o.write('patch', `/api/v1/projects/${p.id}/members/${owner.id}`).send({ role: 'editor' }).expect(409);
    await o.write('delete', `/api/v1/projects/${p.id}/members/${owner.id}`).expect(409);
    expect(await events(p.id)).toEqual([]);

    // With a second owner, the first may step down.
    await o.write('patch', `/api/v1/projects/${p.id}/members/${editor.id}`).send({ role: 'owner' }).expect(200);
    await o.write('patch', `/api/v1/projects/${p.id}/members/${owner.id}`).send({ role: 'viewer' }).expect(200);
    const members = await o.agent.get(`/api/v1/projects/${p.id}/members`).expect(200);
    expect(members.body.members.map((m: { userId: string; role: string }) => [m.userId, m.role])).toEqual([
      [editor.id, 'owner'],
      [owner.id, 'viewer'],
    ]);
    expect((await events(p.id)).map((e) => [e.action, e.entityId, e.before.role, e.after.role])).toEqual([
      ['update', editor.id, 'editor', 'owner'],
      ['update', owner.id, 'owner', 'viewer'],
    ]);
  });

  it('when a role is not one of owner, editor or viewer, then the 400 problem names the role field', async () => {
    const { member: viewer, p, o } = await ownerOfProject({ member: 'viewer' });
    const res = await o.write('patch', `/api/v1/projects/${p.id}/members/${viewer.id}`).send({ role: 'admin' }).expect(400);
    expect(res.body.errors).toEqual([{ path: 'role', message: 'Choose owner, editor or viewer.' }]);
    await o.write('patch', `/api/v1/projects/${p.id}/members/not-a-uuid`).send({ role: 'viewer' }).expect(404);
  });

  it('when an owner deletes a project, then it is gone for everyone and its history survives', async () => {
    const { p, o } = await ownerOfProject({ member: 'viewer' });
    await o.write('delete', `/api/v1/projects/${p.id}`).expect(204);
    await o.agent.get(`/api/v1/projects/${p.id}`).expect(404);
    const [e] = await events(p.id);
    expect(e).toMatchObject({ action: 'delete', entityType: 'project', after: null });
    expect(e.before.members).toHaveLength(2);
  });

  it('when the history is long, then it pages newest first and rejects a bad page size by name', async () => {
    const { p, o } = await ownerOfProject();
    for (const [i, name] of ['one', 'two', 'three'].entries())
      await o
        .write('patch', `/api/v1/projects/${p.id}`)
        .send({ name, version: i + 1 })
        .expect(200);
    const first = await o.agent.get(`/api/v1/projects/${p.id}/audit-events?limit=2`).expect(200);
    expect(first.body.events.map((e: { after: { name: string } }) => e.after.name)).toEqual(['three', 'two']);
    const second = await o.agent.get(`/api/v1/projects/${p.id}/audit-events?limit=2&before=${first.body.nextBefore}`).expect(200);
    expect(second.body.events.map((e: { after: { name: string } }) => e.after.name)).toEqual(['one']);
    expect(second.body.nextBefore).toBeNull();
    const bad = await o.agent.get(`/api/v1/projects/${p.id}/audit-events?limit=0`).expect(400);
    expect(bad.body.errors[0].path).toBe('limit');
  });
});

describe('recordAudit', () => {
  it('when the change it records is rolled back, then the audit event is rolled back with it', async () => {
    const owner = await createUser();
    const p = await createProject([{ user: owner, role: 'owner' }], { name: 'Before' });
    await expect(
      testKnex().transaction(async (trx) => {
        await trx('projects').where({ id: p.id }).update({ name: 'After' });
        await recordAudit(trx, {
          projectId: p.id,
          actorUserId: owner.id,
          action: 'update',
          entityType: 'project',
          entityId: p.id,
          before: { name: 'Before' },
          after: { name: 'After' },
        });
        throw new Error('something later failed');
      }),
    ).rejects.toThrow('something later failed');
    expect(await events(p.id)).toEqual([]);
    expect((await testKnex()('projects').where({ id: p.id }).first()).name).toBe('Before');
  });
});
