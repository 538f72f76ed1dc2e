import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, existsSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import type { Express } from 'express';

/** Debian's Chromium, found on PATH (never a downloaded browser build). */
export function chromiumPath(): string {
  for (const name of ['chromium', 'chromium-browser']) {
    try {
      const p = execFileSync('which', [name], { encoding: 'utf8' }).trim();
      if (p) return p;
    } catch {
      // try the next name
    }
  }
  if (existsSync('/usr/bin/chromium')) return '/usr/bin/chromium';
  throw new Error('Chromium was not found. Install it with: apt-get install -y chromium');
}

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  baseUrl: string;
  close(): Promise<void>;
}

/** Serve `app` on a random loopback port and open a fresh headless Chromium profile against it. */
export async function openBrowser(app: Express): Promise<BrowserSession> {
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const profile = mkdtempSync(path.join(os.tmpdir(), 'eyrie-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: chromiumPath(),
    headless: true,
    viewport: { width: 1360, height: 900 },
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--disable-dev-shm-usage',
    ],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    baseUrl,
    async close() {
      await context.close().catch(() => undefined);
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections?.();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Save a screenshot under .tmp/screens when EYRIE_SCREENSHOTS is set (for looking at pages by hand). */
export async function maybeScreenshot(page: Page, name: string) {
  if (!process.env.EYRIE_SCREENSHOTS) return;
  // Panels far down a page are drawn only as they near the screen (content-visibility: auto); a
  // full-page capture does not scroll, so draw them all for it, as a reader scrolling down sees them.
  const drawAll = await page.addStyleTag({ content: '.laid-out-near-screen { content-visibility: visible !important; }' });
  await page.screenshot({ path: path.join('.tmp', 'screens', `${name}.png`), fullPage: true });
  await drawAll.evaluate((style) => (style as Element).remove());
}

/**
 * For a browser test file: serve the real app (built web + API on the test database) and open
 * Chromium before the tests, close both after. Returns a getter because the session exists only
 * once `beforeAll` has run.
 */
export function useBrowserOnApp(hooks: { beforeAll: (fn: () => Promise<void>) => void; afterAll: (fn: () => Promise<void>) => void }) {
  let session: BrowserSession | undefined;
  hooks.beforeAll(async () => {
    const [{ createApp }, { loadConfig }, { testKnex }] = await Promise.all([
      import('../../api/app'),
      import('../../api/config'),
      import('./db'),
    ]);
    session = await openBrowser(createApp({ knex: testKnex(), config: loadConfig({ nodeEnv: 'test' }) }));
  });
  hooks.afterAll(async () => {
    await session?.close();
    const { closeTestKnex } = await import('./db');
    await closeTestKnex();
  });
  return () => {
    if (!session) throw new Error('the browser session is opened in beforeAll');
    return session;
  };
}
