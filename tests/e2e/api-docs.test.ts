import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { maybeScreenshot, useBrowserOnApp } from '../support/browser';
import { buildOpenApiDocument } from '../../api/lib/openapi';
import { openApiRegistrars } from '../../api/features/docs/registrars';
import { PROBLEM_TYPES } from '../../api/lib/problem-types';

const browser = useBrowserOnApp({ beforeAll, afterAll });

const operationCount = () =>
  Object.values(buildOpenApiDocument(openApiRegistrars, 'test').paths ?? {}).reduce(
    (n, item) => n + ['get', 'post', 'put', 'patch', 'delete'].filter((m) => (item as Record<string, unknown>)[m]).length,
    0,
  );

/** What the screen shows at this scroll position (not the whole page), for looking at it by hand. */
async function viewportShot(page: Page, name: string) {
  if (!process.env.EYRIE_SCREENSHOTS) return;
  await page.screenshot({ path: path.join('.tmp', 'screens', `${name}.png`) });
}

async function openApiPage(page: Page, baseUrl: string) {
  await page.goto(baseUrl + '/api-docs');
  await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('API reference');
  await expect.poll(() => page.getByText(/^Loading/).count()).toBe(0);
}

describe('the API page', () => {
  it('when it is opened, then every operation, who may call it and every problem type with its description are shown', async () => {
    const { page, baseUrl } = browser();
    page.setDefaultTimeout(10_000);
    await page.setViewportSize({ width: 1440, height: 900 });
    await openApiPage(page, baseUrl);
    expect(await page.getByRole('main').getByRole('heading', { level: 3 }).count()).toBe(operationCount());
    const main = (await page.getByRole('main').textContent()) ?? '';
    expect(main).toContain('Operation: postCampaignsByCampaignIdImports');
    expect(main).toContain('browser session + x-csrf-token header, or API token (Authorization: Bearer)');
    expect(main).toContain('anyone, no sign-in needed');
    const rows = page.locator('#problem-types ~ section tbody tr, #problem-types ~ * tbody tr');
    expect(await rows.count()).toBe(Object.keys(PROBLEM_TYPES).length);
    for (const t of Object.values(PROBLEM_TYPES)) expect(main).toContain(t.description);
    await viewportShot(page, 'api-docs-1440-top');
    await page.locator('#problem-types').scrollIntoViewIfNeeded();
    await viewportShot(page, 'api-docs-1440-problems');
    await page
      .locator('h3 code', { hasText: /\/imports$/ })
      .first()
      .scrollIntoViewIfNeeded();
    await viewportShot(page, 'api-docs-1440-imports');
    await maybeScreenshot(page, 'api-docs-1440');
  });

  it('when it is opened on a 390 px phone, then nothing scrolls sideways', async () => {
    const { page, baseUrl } = browser();
    await page.setViewportSize({ width: 390, height: 844 });
    await openApiPage(page, baseUrl);
    expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
    await viewportShot(page, 'api-docs-390-top');
    await page
      .locator('h3 code', { hasText: /\/sign-off$/ })
      .first()
      .scrollIntoViewIfNeeded();
    await viewportShot(page, 'api-docs-390-operation');
    await page.locator('#problem-types').scrollIntoViewIfNeeded();
    await viewportShot(page, 'api-docs-390-problems');
  });
});
