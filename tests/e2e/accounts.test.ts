import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import { closeTestKnex, testKnex } from '../support/db';
import { openBrowser, maybeScreenshot, type BrowserSession } from '../support/browser';
import { startAuthApp, type AuthTestApp } from '../support/auth';
import { signInThroughForm } from '../support/browser-auth';
import { createUser, newIdentity } from '../factories/users';
import { createProject } from '../factories/projects';

let env: AuthTestApp;
let browser: BrowserSession;

beforeAll(async () => {
  env = await startAuthApp({ smtpSink: true, webDist: path.resolve('dist/web') });
  browser = await openBrowser(env.app);
});

afterAll(async () => {
  await browser?.close();
  await env?.close();
  await closeTestKnex();
});

describe('accounts and projects in Chromium', () => {
  it('when someone signs in through the local provider, then they see their projects, can manage them, and can sign out', async () => {
    const { page, baseUrl } = browser;
    const who = newIdentity({ name: 'Petra Browser' });
    const colleague = await createUser({ name: 'Colm Colleague' });
    const project = await createProject([{ user: colleague, role: 'owner' }], {
      name: 'KL-9001 screen (invented)',
      description: 'Invented demo project for the browser test.',
    });

    await page.goto(baseUrl + '/projects');
    await page.getByRole('main').getByRole('link', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Sign in');
    await maybeScreenshot(page, 'sign-in');
    await page.getByRole('link', { name: 'Sign in with GitHub' }).click();

    // The local provider's page: type an identity.
    await page.getByRole('heading', { name: 'Local sign-in' }).waitFor();
    await maybeScreenshot(page, 'local-provider');
    await page.getByLabel('Display name').fill(who.name);
    await page.getByLabel('Login').fill(who.login);
    await page.getByLabel('E-mail').fill(who.email);
    await page.getByRole('button', { name: 'Continue', exact: true }).click();

    // Back in Eyrie, on the page asked for, signed in.
    await page.waitForURL(`${baseUrl}/projects`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Projects');
    expect(await page.getByRole('group').or(page.locator('summary')).first().textContent()).toContain('Petra Browser');
    await expect.poll(() => page.getByText('You are not in any project yet').isVisible()).toBe(true);

    // Someone adds Petra to a project as viewer; after a reload it is listed with the role.
    const me = await testKnex()('users').where({ login: who.login }).first();
    await testKnex()('project_members').insert({ projectId: project.id, userId: me.id, role: 'viewer' });
    await page.reload();
    await expect.poll(() => page.getByRole('table', { name: 'Your projects' }).textContent()).toContain('KL-9001 screen (invented)');
    expect(await page.getByRole('table', { name: 'Your projects' }).textContent()).toContain('viewer');

    // A form error from the client-side schema lands on its field.
    await page.getByRole('button', { name: 'Create project' }).click();
    await expect.poll(() => page.getByText('Give the project a name.').isVisible()).toBe(true);
    expect(await page.getByLabel('Name', { exact: true }).getAttribute('aria-invalid')).toBe('true');
    await page.getByLabel('Name', { exact: true }).fill('Petra’s own screen (invented)');
    await page.getByRole('button', { name: 'Create project' }).click();
    // A new project opens on its own page; members and invitations are one link away.
    await page.waitForURL(/\/projects\/[0-9a-f-]+$/);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Petra’s own screen (invented)');
    await page.getByRole('link', { name: 'Members & settings' }).click();
    await page.waitForURL(/\/projects\/[0-9a-f-]+\/settings$/);
    expect(await page.getByRole('navigation', { name: 'Breadcrumb' }).textContent()).toContain('Petra’s own screen (invented)');

    // Details are saved with the version the page loaded; a second save uses the version the first returned.
    const details = page.getByRole('form', { name: 'Project details' });
    await details.getByLabel('Description').fill('Temperature screen of an invented ketone reduction.');
    await details.getByRole('button', { name: 'Save details' }).click();
    await expect.poll(() => details.getByRole('status').textContent()).toContain('Saved');
    await details.getByLabel('Description').fill('Temperature screen of an invented ketone reduction, second pass.');
    await details.getByRole('button', { name: 'Save details' }).click();
    await expect
      .poll(async () => await testKnex()('projects').where({ name: 'Petra’s own screen (invented)' }).first('version', 'description'))
      .toEqual({ version: 3, description: 'Temperature screen of an invented ketone reduction, second pass.' });

    // Invite someone; the pending invitation is listed and the mail reached the sink.
    await page.getByLabel('E-mail address').fill('not-an-address');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => page.getByText('Enter a valid e-mail address').isVisible()).toBe(true);
    await page.getByLabel('E-mail address').fill('new.colleague@example.test');
    await page.getByLabel('Role', { exact: true }).selectOption('editor');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => page.getByRole('list', { name: 'Pending invitations' }).textContent()).toContain('new.colleague@example.test');
    await expect.poll(() => env.mailbox.list().some((m) => m.to.includes('new.colleague@example.test'))).toBe(true);
    await maybeScreenshot(page, 'project-settings');

    await page.getByRole('link', { name: 'See the project’s history' }).click();
    await expect.poll(() => page.getByRole('main').textContent()).toContain('invited new.colleague@example.test as editor.');
    await maybeScreenshot(page, 'project-history');

    // Tokens: created, shown once, revoked.
    await page.locator('summary').click();
    await page.getByRole('link', { name: 'API tokens' }).click();
    await page.getByLabel('Name').fill('nightly export');
    await page.getByRole('button', { name: 'Create token' }).click();
    await expect.poll(() => page.getByTestId('new-token-secret').textContent()).toMatch(/^eyr_/);
    await maybeScreenshot(page, 'tokens');
    await page.getByRole('button', { name: 'Revoke nightly export' }).click();
    await expect.poll(() => page.getByRole('table', { name: 'Your API tokens' }).textContent()).toContain('revoked');

    // A viewer's settings page has no owner tools.
    await page.goto(`${baseUrl}/projects/${project.id}/settings`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('KL-9001 screen (invented)');
    expect(await page.getByRole('button', { name: 'Send invitation' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Delete project' }).count()).toBe(0);

    // Sign out: back to Sign in, and the projects page asks to sign in again.
    await page.locator('summary').click();
    await page.getByRole('button', { name: 'Sign out' }).click();
    await expect.poll(() => page.getByRole('banner').getByRole('link', { name: 'Sign in' }).isVisible()).toBe(true);
    await page.goto(baseUrl + '/projects');
    await expect.poll(() => page.getByText('Sign in to see this page.').isVisible()).toBe(true);
  });

  it('when an invitation link is opened by the wrong account, then the page says so; the right account can accept it', async () => {
    const { page, baseUrl } = browser;
    const owner = await createUser();
    const project = await createProject([{ user: owner, role: 'owner' }], { name: 'Invitation target (invented)' });
    const invitee = newIdentity({ name: 'Ivo Invitee' });
    // Owner invites through the API with a bearer token (no browser needed for that side).
    const { createApiToken } = await import('../factories/tokens');
    const { secret } = await createApiToken(owner);
    const res = await fetch(`${baseUrl}/api/v1/projects/${project.id}/invitations`, {
      method: 'POST',
      headers: { authorization: `Bearer ${secret}`, 'content-type': 'application/json' },
      body: JSON.stringify({ email: invitee.email, role: 'editor' }),
    });
    expect(res.status).toBe(201);
    await expect.poll(() => env.mailbox.list().some((m) => m.to.includes(invitee.email))).toBe(true);
    const mail = env.mailbox.list().find((m) => m.to.includes(invitee.email))!;
    const link = new URL(/https?:\/\/\S+\/invitations\/\S+/.exec(mail.text)![0]);

    const signInAs = (who: { login: string; name: string; email: string }) => signInThroughForm(page, `${baseUrl}${link.pathname}`, who);

    await signInAs(newIdentity({ name: 'Wanda Wrong' }));
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('This invitation is for another account');
    // Her mailbox does not show someone else's invitation.
    await page.goto(`${baseUrl}/dev/mailbox`);
    await expect.poll(() => page.getByRole('main').textContent()).toContain('No messages for');
    expect(await page.content()).not.toContain(link.pathname);
    await page.goto(`${baseUrl}${link.pathname}`);
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('This invitation is for another account');
    await maybeScreenshot(page, 'invitation-wrong-account');
    await page.getByRole('button', { name: 'Sign out and sign in with the invited account' }).click();
    await page.waitForURL(/\/sign-in\?returnTo=/);
    await page.getByRole('link', { name: 'Sign in with GitHub' }).click();
    await page.getByLabel('Display name').fill(invitee.name);
    await page.getByLabel('Login').fill(invitee.login);
    await page.getByLabel('E-mail').fill(invitee.email);
    await page.getByRole('button', { name: 'Continue', exact: true }).click();
    await page.waitForURL(`${baseUrl}${link.pathname}`);
    await expect.poll(() => page.getByRole('heading', { level: 2 }).first().textContent()).toContain('Join “Invitation target (invented)”');
    await maybeScreenshot(page, 'invitation');
    await page.getByRole('button', { name: 'Accept and join' }).click();
    await page.waitForURL(`${baseUrl}/projects/${project.id}`);
    await page.getByRole('link', { name: 'Members & settings' }).click();
    await expect.poll(() => page.getByRole('main').textContent()).toContain('Your role here: ◇editor');

    // The invitee reads the mail in the development mailbox; its link is spent now.
    await page.goto(`${baseUrl}/dev/mailbox`);
    await expect.poll(() => page.getByRole('main').textContent()).toContain(invitee.email);
    await maybeScreenshot(page, 'dev-mailbox');
    // The mail's links name the configured public address; this test server listens elsewhere, so follow the path.
    const href = await page
      .getByRole('link', { name: /\/invitations\// })
      .first()
      .getAttribute('href');
    expect(new URL(href!).pathname).toBe(link.pathname);
    await page.goto(`${baseUrl}${link.pathname}`);
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('already been used');
  });
});
