import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import { maybeScreenshot, type BrowserSession } from '../support/browser';
import { openSignInBrowser, signInThroughForm } from '../support/browser-auth';
import { createUser, newIdentity, type TestIdentity } from '../factories/users';
import { createProject } from '../factories/projects';
import { createCampaign, createMeasurements } from '../factories/campaigns';

let browser: BrowserSession;
let closeBrowser: (() => Promise<void>) | undefined;
let who: TestIdentity;
let projectId: string;
let campaignId: string;

/** axe-core's browser build, injected into each page as a script. */
const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

beforeAll(async () => {
  ({ browser, close: closeBrowser } = await openSignInBrowser());
  who = newIdentity({ name: 'Noor Phone' });
  const user = await createUser(who);
  const project = await createProject([{ user, role: 'owner' }], { name: 'Handheld check (invented)' });
  projectId = project.id;
  const campaign = await createCampaign(project.id, { title: 'Skylark ligand, phone check (invented)', createdByUserId: user.id });
  campaignId = campaign.id;
  await createMeasurements(campaign.id, [233.15, 243.15, 253.15, 263.15, 273.15, 283.15, 293.15]);
});

afterAll(() => closeBrowser?.());

async function signIn(page: Page, returnPath: string) {
  await page.context().clearCookies();
  await signInThroughForm(page, browser.baseUrl + returnPath, who);
}

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** Serious and critical axe-core findings on the page as it is now, one line each. */
async function seriousViolations(page: Page): Promise<string[]> {
  // Evaluated through the debugging protocol: the app's Content-Security-Policy refuses inline scripts.
  await page.evaluate(AXE_SOURCE);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } }).axe;
    const result = await axe.run(document, { resultTypes: ['violations'] });
    return result.violations;
  });
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map(
      (v) =>
        `${v.impact} ${v.id}: ${v.help} — ${v.nodes
          .slice(0, 3)
          .map((n) => n.target.join(' '))
          .join(' | ')}`,
    );
}

/** How far the page reaches past the viewport's right edge (0 when nothing scrolls sideways). */
const sidewaysOverflow = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);

/** The outermost elements that stick out past the right edge, to name the culprit in a failure. */
const widestElements = (page: Page) =>
  page.evaluate(() => {
    const out: string[] = [];
    const sticksOut = (el: Element) => el.getBoundingClientRect().right > window.innerWidth + 0.5;
    // Inside a box that scrolls or clips, sticking out is that box's business.
    const clipped = (el: Element) => {
      if (getComputedStyle(el).position === 'absolute' || getComputedStyle(el).position === 'fixed') return false;
      for (let p = el.parentElement; p && p !== document.body; p = p.parentElement)
        if (getComputedStyle(p).overflowX !== 'visible') return true;
      return false;
    };
    for (const el of Array.from(document.querySelectorAll('body *'))) {
      if (!sticksOut(el) || clipped(el)) continue;
      out.push(
        `${el.tagName.toLowerCase()}.${String(el.getAttribute('class') ?? '')
          .split(' ')
          .slice(0, 4)
          .join('.')} "${(el.textContent ?? '').trim().slice(0, 40)}" ${getComputedStyle(el).position}`,
      );
      if (out.length >= 4) break;
    }
    return out;
  });

const PAGES = () => [
  { name: 'home', path: '/', heading: /selectivity specification/ },
  { name: 'calculators', path: '/calculators', heading: /./ },
  { name: 'rate-and-hold', path: '/rate-and-hold', heading: /./ },
  { name: 'api-docs', path: '/api-docs', heading: /./ },
  { name: 'projects', path: '/projects', heading: /./ },
  { name: 'project', path: `/projects/${projectId}`, heading: /Handheld check/ },
  { name: 'project-settings', path: `/projects/${projectId}/settings`, heading: /Handheld check/ },
  { name: 'project-history', path: `/projects/${projectId}/history`, heading: /History of/ },
  { name: 'campaign', path: `/campaigns/${campaignId}`, heading: /phone check/ },
  { name: 'tokens', path: '/settings/tokens', heading: /./ },
];

async function openAndSettle(page: Page, pagePath: string, heading: RegExp) {
  await page.goto(browser.baseUrl + pagePath);
  await expect.poll(async () => heading.test((await page.getByRole('heading', { level: 1 }).first().textContent()) ?? '')).toBe(true);
  // Let queries settle (loading texts replaced by content) before measuring.
  await expect.poll(() => page.getByText(/^Loading/).count()).toBe(0);
}

describe('on a 390 px phone', () => {
  it('when each main page is opened, then nothing scrolls sideways, the menu folds and sign-in stays reachable', async () => {
    const { page } = browser;
    await page.setViewportSize({ width: 390, height: 844 });
    await page.context().clearCookies();
    await page.goto(browser.baseUrl + '/');
    // Signed out: the header keeps Sign in visible; the main links sit behind the menu button.
    expect(await page.getByRole('banner').getByRole('link', { name: 'Sign in' }).isVisible()).toBe(true);
    const menu = page.getByRole('button', { name: 'Menu' });
    expect(await menu.getAttribute('aria-expanded')).toBe('false');
    await menu.click();
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Calculators' }).click();
    await page.waitForURL(browser.baseUrl + '/calculators');
    await expect.poll(() => page.getByRole('button', { name: 'Menu' }).getAttribute('aria-expanded')).toBe('false');

    await signIn(page, '/projects');
    // Signed in: the account menu stays in the bar.
    await expect.poll(() => page.getByRole('banner').locator('summary').isVisible()).toBe(true);
    const wide: string[] = [];
    for (const p of PAGES()) {
      await openAndSettle(page, p.path, p.heading);
      const over = await sidewaysOverflow(page);
      if (over > 0) wide.push(`${p.name}: ${over} px — ${(await widestElements(page)).join(' ; ')}`);
      await maybeScreenshot(page, `phone-${p.name}`);
    }
    expect(wide).toEqual([]);
  }, 120_000);
});

describe('accessibility', () => {
  it('when every page is scanned with axe-core (phone and desktop widths), then none has a serious or critical violation', async () => {
    const { page } = browser;
    const found: string[] = [];
    await signIn(page, '/projects');
    for (const width of [1360, 390]) {
      await page.setViewportSize({ width, height: 900 });
      for (const p of PAGES()) {
        await openAndSettle(page, p.path, p.heading);
        for (const v of await seriousViolations(page)) found.push(`${width}px ${p.name}: ${v}`);
      }
    }
    await page.context().clearCookies();
    await page.setViewportSize({ width: 1360, height: 900 });
    await page.goto(browser.baseUrl + '/sign-in');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).count()).toBeGreaterThan(0);
    for (const v of await seriousViolations(page)) found.push(`sign-in: ${v}`);
    expect(found).toEqual([]);
  }, 240_000);

  it('when the grid is used from the keyboard, then left and right move between cells and up and down between rows', async () => {
    const { page } = browser;
    await page.setViewportSize({ width: 1360, height: 900 });
    await signIn(page, `/campaigns/${campaignId}`);
    const first = page.getByLabel('Selectivity, row 1');
    await first.focus();
    await page.keyboard.press('End');
    await page.keyboard.press('ArrowRight');
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('Uncertainty, row 1');
    await page.keyboard.press('Home');
    await page.keyboard.press('ArrowLeft');
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('Selectivity, row 1');
    await page.keyboard.press('ArrowDown');
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('Selectivity, row 2');
  });

  it('when a file is uploaded from the keyboard, then every step is reached with Tab and confirmed with Enter or Space', async () => {
    const { page } = browser;
    await page.setViewportSize({ width: 1360, height: 900 });
    await signIn(page, `/campaigns/${campaignId}`);
    const csv = 'Sample ID,Replicate,Temperature (°C),ee (%)\r\nKB-1,a,-35,97.1\r\nKB-2,a,5,90.4\r\n';
    const input = page.getByLabel(/CSV, TSV or Excel workbook/);
    await input.focus();
    expect(await page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.type)).toBe('file');
    await input.setInputFiles({ name: 'keyboard.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    const importButton = page.getByRole('button', { name: /^Import 2 rows/ });
    await expect.poll(() => importButton.isEnabled()).toBe(true);
    // Reach the import button with Tab alone, then press Enter.
    let reached = false;
    for (let i = 0; i < 60 && !reached; i++) {
      await page.keyboard.press('Tab');
      reached = await importButton.evaluate((el) => el === document.activeElement);
    }
    expect(reached).toBe(true);
    await page.keyboard.press('Enter');
    await expect.poll(() => page.getByRole('status').filter({ hasText: 'Imported 2 rows' }).count()).toBe(1);
  });
});
