import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maybeScreenshot, useBrowserOnApp } from '../support/browser';

const browser = useBrowserOnApp({ beforeAll, afterAll });

describe('the app shell in Chromium', () => {
  it('when a newcomer opens the home page, then the product name, navigation, convention and caution are visible', async () => {
    const { page, baseUrl } = browser();
    await page.goto(baseUrl + '/');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('selectivity specification');
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(true);
    expect(await page.getByRole('note', { name: 'Safety caution' }).textContent()).toContain('calorimetry');
    expect(await page.locator('main').textContent()).toContain('X‡(TS→B) − X‡(TS→A)');
    await maybeScreenshot(page, 'home');
  });

  it('when an unknown address is opened, then a not-found page is shown inside the shell', async () => {
    const { page, baseUrl } = browser();
    await page.goto(baseUrl + '/no/such/page');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Page not found');
    expect(await page.getByRole('link', { name: 'Eyrie' }).isVisible()).toBe(true);
  });
});

/** The build files a script names through static imports, itself included, read from the running server. */
async function staticallyLoaded(baseUrl: string, file: string, seen = new Set<string>()): Promise<Set<string>> {
  if (seen.has(file)) return seen;
  seen.add(file);
  const code = await (await fetch(`${baseUrl}/assets/${file}`)).text();
  for (const [, next] of code.matchAll(/(?:from|import)\s*"\.\/([^"]+\.js)"/g)) await staticallyLoaded(baseUrl, next!, seen);
  return seen;
}

describe('build files', () => {
  it('when the home page loads, then its code names neither of the pages’ chunks; the campaign page’s code is in them', async () => {
    const { baseUrl } = browser();
    const html = await (await fetch(baseUrl + '/')).text();
    const entry = /<script type="module"[^>]* src="\/assets\/([^"]+)"/.exec(html)?.[1];
    expect(entry).toBeTruthy();
    const first = [...(await staticallyLoaded(baseUrl, entry!))];
    expect(first.filter((f) => /^(campaign-page|pages-common)-/.test(f))).toEqual([]);
    expect(html).not.toMatch(/campaign-page|pages-common/);
    // The campaign route's own module lives in the campaign-page chunk (the router imports it lazily).
    const entryCode = await (await fetch(`${baseUrl}/assets/${entry}`)).text();
    expect(entryCode).toMatch(/campaign-page-[\w-]+\.js/);
  });

  it('when a build file that does not exist is asked for, then the answer is 404, not the page', async () => {
    const res = await fetch(browser().baseUrl + '/assets/no-such-chunk-123.js');
    expect(res.status).toBe(404);
    const page = await fetch(browser().baseUrl + '/campaigns/anything');
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('<div id="root">');
  });
});
