import path from 'node:path';
import type { Page } from 'playwright-core';
import { openBrowser, type BrowserSession } from './browser';
import { startAuthApp, type AuthTestApp } from './auth';
import { closeTestKnex } from './db';
import type { TestIdentity } from '../factories/users';

/**
 * For a browser test file that signs people in: the app with the local sign-in provider serving the built web client,
 * and Chromium on it. A missing element fails after 15 s with its locator named instead of running into the test
 * timeout. `close` shuts the browser, the app and the test database handle.
 */
export async function openSignInBrowser(): Promise<{ env: AuthTestApp; browser: BrowserSession; close: () => Promise<void> }> {
  const env = await startAuthApp({ webDist: path.resolve('dist/web') });
  const browser = await openBrowser(env.app).catch(async (err: unknown) => {
    await env.close();
    throw err;
  });
  browser.page.setDefaultTimeout(15_000);
  return {
    env,
    browser,
    close: async () => {
      await browser.close();
      await env.close();
      await closeTestKnex();
    },
  };
}

/** From `url` (a page with a Sign in link), sign in as `who` through the local provider's form and land back on `url`. */
export async function signInThroughForm(page: Page, url: string, who: Pick<TestIdentity, 'name' | 'login' | 'email'>) {
  await page.goto(url);
  await page.getByRole('main').getByRole('link', { name: 'Sign in' }).click();
  await page.getByRole('link', { name: 'Sign in with GitHub' }).click();
  await page.getByLabel('Display name').fill(who.name);
  await page.getByLabel('Login').fill(who.login);
  await page.getByLabel('E-mail').fill(who.email);
  await page.getByRole('button', { name: 'Continue', exact: true }).click();
  await page.waitForURL(url);
}
