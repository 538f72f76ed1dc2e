import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { testKnex } from '../support/db';
import { maybeScreenshot, type BrowserSession } from '../support/browser';
import { openSignInBrowser, signInThroughForm } from '../support/browser-auth';
import { createUser, type TestIdentity } from '../factories/users';
import { createProject } from '../factories/projects';

let browser: BrowserSession;
let closeBrowser: (() => Promise<void>) | undefined;

beforeAll(async () => {
  ({ browser, close: closeBrowser } = await openSignInBrowser());
});

afterAll(() => closeBrowser?.());

/** An element's screenshot under .tmp/screens when EYRIE_SCREENSHOTS is set (for looking closely). */
async function maybeElementShot(page: Page, name: string, locator: ReturnType<Page['locator']>) {
  if (!process.env.EYRIE_SCREENSHOTS) return;
  await locator.screenshot({ path: path.join('.tmp', 'screens', `${name}.png`) });
}

/**
 * Screenshots of the page's Eyring plot and selectivity chart at 1440 px and 390 px wide, to check by eye
 * that no label overprints another; the viewport is put back afterwards.
 */
async function chartShotsAtBothWidths(page: Page, prefix: string) {
  if (!process.env.EYRIE_SCREENSHOTS) return;
  const before = page.viewportSize();
  for (const width of [1440, 390]) {
    await page.setViewportSize({ width, height: 900 });
    await maybeElementShot(page, `${prefix}-eyring-${width}`, page.getByRole('figure').filter({ hasText: 'Eyring plot' }).first());
    await maybeElementShot(
      page,
      `${prefix}-selectivity-${width}`,
      page.getByRole('figure').filter({ hasText: 'Selectivity against temperature' }).first(),
    );
  }
  if (before) await page.setViewportSize(before);
}

/** Sign in through the local provider as `who`, landing on `returnPath`. */
async function signInAs(page: Page, baseUrl: string, who: TestIdentity, returnPath: string) {
  await page.context().clearCookies();
  await signInThroughForm(page, baseUrl + returnPath, who);
}

async function signOut(page: Page) {
  await page.locator('summary').click();
  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect.poll(() => page.getByRole('banner').getByRole('link', { name: 'Sign in' }).isVisible()).toBe(true);
}

describe('campaign pages in Chromium', () => {
  it('when an editor creates a campaign and uploads the demo CSV, then the fit, charts and a saved forecast appear; a viewer sees them read-only', async () => {
    const { page, baseUrl } = browser;
    const editorId = { login: `ed-${Date.now().toString(36)}`, name: 'Edda Editor', email: `ed-${Date.now().toString(36)}@example.test` };
    const viewerId = { login: `vw-${Date.now().toString(36)}`, name: 'Vik Viewer', email: `vw-${Date.now().toString(36)}@example.test` };
    const owner = await createUser({ name: 'Olga Owner' });
    const editor = await createUser(editorId);
    const viewer = await createUser(viewerId);
    const project = await createProject(
      [
        { user: owner, role: 'owner' },
        { user: editor, role: 'editor' },
        { user: viewer, role: 'viewer' },
      ],
      { name: 'Kestrelmoor KL-7702 screens (invented)', description: 'Invented demo project for the browser test.' },
    );

    // The editor finds the project from the projects list.
    await signInAs(page, baseUrl, editorId, '/projects');
    await page.getByRole('link', { name: 'Kestrelmoor KL-7702 screens (invented)', exact: true }).click();
    await page.waitForURL(`${baseUrl}/projects/${project.id}`);
    await expect.poll(() => page.getByText('No campaigns yet.').isVisible()).toBe(true);
    await maybeScreenshot(page, 'campaigns-project-empty');

    // New campaign: a client-side check first, then created and opened.
    await page.getByRole('button', { name: 'New campaign' }).click();
    await page.getByRole('button', { name: 'Create campaign' }).click();
    await expect.poll(() => page.getByText('title is required').isVisible()).toBe(true);
    expect(await page.getByLabel('Title').getAttribute('aria-invalid')).toBe('true');
    await maybeScreenshot(page, 'campaigns-new-campaign-form');
    await page.getByLabel('Title').fill('Skylark ligand in methanol (invented)');
    await page.getByLabel('Product A (numerator)').fill('(S)-amide');
    await page.getByLabel('Product B').fill('(R)-amide');
    await page.getByLabel('Default uncertainty (SD)').fill('0.3');
    await page.getByRole('button', { name: 'Create campaign' }).click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]+$/);
    const campaignUrl = page.url();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Skylark ligand in methanol (invented)');
    await expect
      .poll(() =>
        page
          .getByText('Fewer than', { exact: false })
          .or(page.getByText('No fit yet', { exact: false }))
          .first()
          .isVisible(),
      )
      .toBe(true);

    // A cell is checked as typed, with the reason beside it.
    await page.getByRole('button', { name: 'Add row' }).click();
    await page.getByLabel('Temperature, row 1').fill('-300');
    await page.getByLabel('Selectivity, row 1').fill('101');
    await expect.poll(() => page.getByLabel('Temperature, row 1').getAttribute('aria-invalid')).toBe('true');
    expect(await page.getByRole('table', { name: 'Measurements' }).textContent()).toContain('absolute zero');
    expect(await page.getByRole('table', { name: 'Measurements' }).textContent()).toContain('outside −100 to 100 %');
    await maybeScreenshot(page, 'campaigns-grid-errors');
    await page.getByRole('button', { name: 'Discard changes' }).click();

    // Upload the demo CSV: detected, mapped from its headers, checked, imported with progress.
    await page.getByLabel(/CSV, TSV or Excel workbook/).setInputFiles(path.resolve('samples/kestrelmoor-skylark-screen.csv'));
    await expect.poll(() => page.getByRole('table', { name: 'Column mapping' }).isVisible()).toBe(true);
    await expect.poll(() => page.getByRole('region', { name: 'Import preview' }).textContent()).toContain('12 of 12 rows ready');
    await maybeScreenshot(page, 'campaigns-upload-preview');
    await page.getByRole('button', { name: 'Import 12 rows' }).click();
    await expect.poll(() => page.getByText(/Imported 12 rows at 6 temperatures/).isVisible()).toBe(true);

    // The fit: parameters with the convention, the charts, and the grid.
    const parameters = page.getByRole('table', { name: 'Fitted activation parameters' });
    await expect.poll(() => parameters.isVisible(), { timeout: 15_000 }).toBe(true);
    expect(await parameters.textContent()).toMatch(/ΔΔH‡\+1[34]\.\d+ ± \d/);
    expect(await page.getByRole('main').textContent()).toContain('Sign convention:');
    await expect.poll(() => page.locator('svg[aria-label^="Eyring plot"]').count()).toBeGreaterThan(0);
    await expect.poll(() => page.locator('svg[aria-label^="Selectivity against temperature"]').count()).toBeGreaterThan(0);
    await expect.poll(() => page.getByRole('table', { name: 'Measurements' }).getByRole('row').count()).toBe(13);

    // Exclude a point with a reason: it stays, marked as excluded.
    await page.getByRole('button', { name: 'Exclude row 1 from the fit' }).click();
    await page.getByLabel(/Why exclude row 1/).fill('bath drifted 3 K during the run');
    await page.getByRole('button', { name: 'Exclude', exact: true }).click();
    await expect.poll(() => page.getByRole('table', { name: 'Measurements' }).textContent()).toContain('“bath drifted 3 K during the run”');
    await expect
      .poll(() => page.getByRole('region', { name: 'Residual diagnostics' }).textContent())
      .toContain('excluded: bath drifted 3 K');

    // Forecast at −30 °C, with its interval and the caution, saved with a note.
    await page.getByRole('textbox', { name: 'Proposed temperature' }).fill('-30');
    await page.getByRole('button', { name: 'Forecast', exact: true }).click();
    const prediction = page.getByRole('region', { name: 'Prediction at the proposed temperature' });
    await expect.poll(() => prediction.textContent(), { timeout: 15_000 }).toContain('At −30.0 °C');
    expect(await prediction.textContent()).toMatch(/95 % prediction interval 9\d\.\d+ to 9\d\.\d+ %/);
    expect(await prediction.getByRole('note', { name: 'Safety caution' }).isVisible()).toBe(true);
    await page.getByLabel('Note', { exact: true }).fill('try on 5 g before scale-up');
    await page.getByRole('button', { name: 'Save forecast at −30.0 °C' }).click();
    const saved = page.getByRole('table', { name: 'Saved forecasts' });
    await expect.poll(() => saved.textContent()).toContain('try on 5 g before scale-up');
    expect(await saved.textContent()).toContain('−30.0');
    expect(await saved.textContent()).toContain('no run yet');
    // A run measured later at that temperature, typed into the grid, is set against the forecast.
    await page.getByRole('button', { name: 'Add row' }).click();
    await page.getByLabel('Temperature, row 13').fill('−30');
    await page.getByLabel('Selectivity, row 13').fill('99,0');
    await page.getByLabel('Sample id, row 13').fill('KL7702-S-013');
    await page.getByLabel('Selectivity, row 13').press('Control+Enter');
    await expect.poll(() => page.getByText(/Saved 1 new row and 0 changed rows/).isVisible(), { timeout: 15_000 }).toBe(true);
    await expect.poll(() => saved.textContent()).toMatch(/99\.00 % ee at −30\.0 °C ✓ inside the interval/);
    await maybeScreenshot(page, 'campaigns-campaign-editor');
    await maybeElementShot(page, 'campaigns-el-grid', page.getByRole('table', { name: 'Measurements' }));
    await maybeElementShot(page, 'campaigns-el-eyring', page.getByRole('figure').filter({ hasText: 'Eyring plot' }));
    await maybeElementShot(
      page,
      'campaigns-el-selectivity',
      page.getByRole('figure').filter({ hasText: 'Selectivity against temperature' }),
    );
    await maybeElementShot(page, 'campaigns-el-parameters', page.getByRole('region', { name: 'Fitted parameters' }));
    await chartShotsAtBothWidths(page, 'campaigns-el');

    // Back on the project page the campaign is listed with its fit and forecast.
    await page.getByRole('link', { name: /Kestrelmoor KL-7702 screens/ }).click();
    const list = page.getByRole('table', { name: 'Campaigns of the project' });
    await expect.poll(() => list.textContent()).toContain('Skylark ligand in methanol (invented)');
    await expect.poll(() => list.textContent()).toMatch(/13 \(12\)/);
    await expect.poll(() => page.getByRole('table', { name: 'Side-by-side comparison' }).textContent()).toContain('ΔΔH‡ (kJ/mol)');
    await maybeScreenshot(page, 'campaigns-project');
    await signOut(page);

    // A viewer sees the same results but no control that changes anything.
    await signInAs(page, baseUrl, viewerId, new URL(campaignUrl).pathname);
    await expect.poll(() => page.getByRole('table', { name: 'Fitted activation parameters' }).isVisible(), { timeout: 15_000 }).toBe(true);
    await expect.poll(() => page.getByRole('table', { name: 'Saved forecasts' }).textContent()).toContain('try on 5 g before scale-up');
    expect(await page.getByRole('main').textContent()).toContain('Your role○viewer');
    expect(await page.getByRole('table', { name: 'Measurements' }).textContent()).toContain('KL7702-S-013');
    expect(await page.getByRole('table', { name: 'Measurements' }).locator('input').count()).toBe(0);
    for (const name of ['Add row', 'Edit campaign details', 'Import 12 rows', /^Exclude row/, /^Delete/]) {
      expect(await page.getByRole('button', { name }).count()).toBe(0);
    }
    expect(await page.getByLabel(/CSV, TSV or Excel workbook/).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Download spreadsheet report' }).getAttribute('href')).toMatch(
      /\/api\/v1\/campaigns\/[0-9a-f-]+\/report\.xlsx$/,
    );
    // A forecast can be looked at, not saved.
    await page.getByRole('textbox', { name: 'Proposed temperature' }).fill('-10');
    await page.getByRole('button', { name: 'Forecast', exact: true }).click();
    await expect
      .poll(() => page.getByRole('region', { name: 'Prediction at the proposed temperature' }).textContent(), { timeout: 15_000 })
      .toContain('At −10.0 °C');
    expect(await page.getByRole('button', { name: /^Save forecast/ }).count()).toBe(0);
    // Viewers may send the report to chosen members.
    await page.getByRole('checkbox', { name: 'Edda Editor' }).check();
    await page.getByRole('button', { name: 'Send the report' }).click();
    await expect
      .poll(() => page.getByRole('status').filter({ hasText: 'Sent to' }).textContent(), { timeout: 30_000 })
      .toContain(editorId.email);
    await maybeScreenshot(page, 'campaigns-campaign-viewer');
    await page.goto(`${baseUrl}/projects/${project.id}`);
    await expect.poll(() => page.getByRole('table', { name: 'Campaigns of the project' }).isVisible()).toBe(true);
    expect(await page.getByRole('button', { name: 'New campaign' }).count()).toBe(0);
    await signOut(page);
  }, 120_000);

  it('when someone else changed the campaign first, then saving the edit form says so and offers a reload', async () => {
    const { page, baseUrl } = browser;
    const who = { login: `ce-${Date.now().toString(36)}`, name: 'Cora Concurrent', email: `ce-${Date.now().toString(36)}@example.test` };
    const editor = await createUser(who);
    const project = await createProject([{ user: editor, role: 'owner' }], { name: 'Concurrency check (invented)' });
    const { createCampaign } = await import('../factories/campaigns');
    const campaign = await createCampaign(project.id, { title: 'Version race (invented)' });

    await signInAs(page, baseUrl, who, `/campaigns/${campaign.id}`);
    await page.getByRole('button', { name: 'Edit campaign details' }).click();
    await page.getByLabel('Title').fill('Version race, my title (invented)');
    // Meanwhile the row moves on.
    await testKnex()('campaigns')
      .where({ id: campaign.id })
      .update({ title: 'Their title (invented)', version: campaign.version + 1 });
    await page.getByRole('button', { name: 'Save details' }).click();
    await expect.poll(() => page.getByRole('alert').first().textContent()).toContain('Changed by someone else — reload');
    expect(await page.getByRole('alert').first().textContent()).toContain(`now at version ${campaign.version + 1}`);
    await maybeElementShot(page, 'campaigns-el-conflict', page.getByRole('form', { name: 'Edit campaign' }));
    // My typed title is still in the form until I choose to reload.
    expect(await page.getByLabel('Title').inputValue()).toBe('Version race, my title (invented)');
    await page.getByRole('button', { name: 'Reload the current version' }).click();
    await expect.poll(() => page.getByLabel('Title').inputValue()).toBe('Their title (invented)');
    expect(await page.getByRole('form', { name: 'Edit campaign' }).textContent()).toContain(`Editing version ${campaign.version + 1}`);
    await page.getByLabel('Title').fill('Their title, then mine (invented)');
    await page.getByRole('button', { name: 'Save details' }).click();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Their title, then mine (invented)');
    await signOut(page);
  }, 60_000);

  it('when a second editor signs the campaign off and reopens it, then the bar says so each time; the last editor is told to ask someone else', async () => {
    const { page, baseUrl } = browser;
    const tag = Date.now().toString(36);
    const who = { login: `so-${tag}`, name: 'Sol Second', email: `so-${tag}@example.test` };
    const editor = await createUser(who);
    const author = await createUser({ login: `sa-${tag}`, name: 'Ada Author', email: `sa-${tag}@example.test` });
    const project = await createProject(
      [
        { user: author, role: 'owner' },
        { user: editor, role: 'editor' },
      ],
      { name: 'Sign-off check (invented)' },
    );
    const { createCampaign } = await import('../factories/campaigns');
    // Made by Sol, so Sol is its last editor for now.
    const campaign = await createCampaign(project.id, { title: 'Four-eyes screen (invented)', createdByUserId: editor.id });

    await signInAs(page, baseUrl, who, `/campaigns/${campaign.id}`);
    const bar = page.getByText(/^Open: measurements can be changed/);
    await expect.poll(() => bar.isVisible()).toBe(true);
    // The form opens on demand, takes the focus and closes with Escape.
    await page.getByRole('button', { name: 'Sign off…' }).click();
    const note = page.getByLabel('Note beside the sign-off (optional)');
    await expect.poll(() => note.evaluate((el) => el === document.activeElement)).toBe(true);
    await note.press('Escape');
    await expect.poll(() => note.count()).toBe(0);

    // The last editor cannot be the one to sign it off: the server's reason is shown in the form, which stays open.
    await page.getByRole('button', { name: 'Sign off…' }).click();
    await page.getByRole('button', { name: 'Sign off', exact: true }).click();
    await expect.poll(async () => (await page.getByRole('alert').allTextContents()).join(' ')).toContain('another owner or editor');
    expect(await note.isVisible()).toBe(true);
    await page.getByRole('button', { name: 'Cancel' }).click();
    await expect.poll(() => note.count()).toBe(0);

    // Once someone else made it, Sol can sign it off.
    await testKnex()('campaigns').where({ id: campaign.id }).update({ createdByUserId: author.id });
    await page.getByRole('button', { name: 'Sign off…' }).click();
    await note.fill('checked against the notebook');
    await page.getByRole('button', { name: 'Sign off', exact: true }).click();
    const signed = page.getByText(/Signed off by Sol Second/);
    await expect.poll(() => signed.isVisible()).toBe(true);
    expect(await signed.textContent()).toContain('“checked against the notebook”');

    // Reopening needs a reason of at least three characters.
    await page.getByRole('button', { name: 'Reopen…' }).click();
    const reason = page.getByLabel('Why reopen it? (kept in the history)');
    const reopen = page.getByRole('button', { name: 'Reopen', exact: true });
    await reason.fill('ok');
    expect(await reopen.isDisabled()).toBe(true);
    await reason.fill('one run to repeat');
    await reopen.click();
    await expect.poll(() => bar.isVisible()).toBe(true);
    await signOut(page);
  }, 60_000);

  it('when a German-locale CSV with a broken Eyring plot is uploaded, then decimal commas are read and the two-branch fit is drawn and named', async () => {
    const { page, baseUrl } = browser;
    const who = { login: `tb-${Date.now().toString(36)}`, name: 'Theo Branch', email: `tb-${Date.now().toString(36)}@example.test` };
    const editor = await createUser(who);
    const project = await createProject([{ user: editor, role: 'editor' }], { name: 'Merlin ligand screens (invented)' });
    const { createCampaign } = await import('../factories/campaigns');
    const campaign = await createCampaign(project.id, { title: 'Merlin ligand in toluene (invented)', defaultUncertainty: 0.3 });

    await signInAs(page, baseUrl, who, `/campaigns/${campaign.id}`);
    await page.getByLabel(/CSV, TSV or Excel workbook/).setInputFiles(path.resolve('samples/kestrelmoor-merlin-screen-de.csv'));
    const read = page.getByRole('region', { name: 'How the file was read' });
    await expect.poll(() => read.isVisible()).toBe(true);
    expect(await page.getByLabel('Decimal separator').inputValue()).toBe(',');
    expect(await page.getByLabel('Delimiter').inputValue()).toBe(';');
    expect(await page.getByLabel('Header row').inputValue()).toBe('3');
    await expect.poll(() => page.getByRole('region', { name: 'Import preview' }).textContent()).toMatch(/(\d+) of \1 rows ready/);
    await page.getByRole('button', { name: /^Import \d+ rows$/ }).click();
    await expect.poll(() => page.getByText(/^✓ Imported \d+ rows/).isVisible(), { timeout: 15_000 }).toBe(true);

    const twoBranch = page.getByRole('region', { name: 'Curvature check' });
    await expect
      .poll(() => twoBranch.textContent(), { timeout: 15_000 })
      .toContain('two straight branches meeting at a break describe the screen better than one line');
    // Invented Merlin-ligand screen: ΔΔH‡ +16 kJ/mol above and −5 kJ/mol below −15 °C, so r peaks there [C].
    expect(await page.getByTestId('break-temperature').textContent()).toMatch(
      /^Isoinversion temperature, where r passes through a maximum: −?1[0-9] °C \(2\d\d K\) · 95 % CI −?\d+ to −?\d+ °C$/,
    );
    expect(await twoBranch.textContent()).toContain('change of the selectivity-determining step');
    expect(await page.getByRole('figure').filter({ hasText: 'Eyring plot' }).textContent()).toContain('two-branch fit');
    // A forecast below the break comes from the cold branch and says so.
    await page.getByRole('textbox', { name: 'Proposed temperature' }).fill('-40');
    await page.getByRole('button', { name: 'Forecast', exact: true }).click();
    await expect
      .poll(() => page.getByTestId('forecast-branch').textContent(), { timeout: 15_000 })
      .toContain('From the two-branch model: the low-temperature branch (colder than the break) covers this temperature.');
    await maybeScreenshot(page, 'campaigns-two-branch');
    await chartShotsAtBothWidths(page, 'campaigns-el-two-branch');
    await page.setViewportSize({ width: 390, height: 844 });
    await maybeScreenshot(page, 'campaigns-two-branch-phone');
    await page.setViewportSize({ width: 1360, height: 900 });
    await signOut(page);
  }, 60_000);

  it('when a workbook with runs at the quantitation limit is uploaded, then its sheet is named and those runs are lower bounds', async () => {
    const { page, baseUrl } = browser;
    const who = { login: `wb-${Date.now().toString(36)}`, name: 'Wanja Workbook', email: `wb-${Date.now().toString(36)}@example.test` };
    const editor = await createUser(who);
    const project = await createProject([{ user: editor, role: 'editor' }], { name: 'Skylark ligand in 2-MeTHF (invented)' });
    const { createCampaign } = await import('../factories/campaigns');
    const campaign = await createCampaign(project.id, { title: 'Skylark ligand in 2-MeTHF (invented)', defaultUncertainty: 0.3 });

    await signInAs(page, baseUrl, who, `/campaigns/${campaign.id}`);
    await page.getByLabel(/CSV, TSV or Excel workbook/).setInputFiles(path.resolve('samples/kestrelmoor-skylark-methf-screen.xlsx'));
    const read = page.getByRole('region', { name: 'How the file was read' });
    await expect.poll(() => read.textContent()).toContain('XLSX');
    expect(await page.getByLabel('Worksheet').inputValue()).toBe('Screen');
    const preview = page.getByRole('region', { name: 'Import preview' });
    await expect.poll(() => preview.textContent()).toMatch(/(\d+) of \1 rows ready/);
    expect(await preview.textContent()).toContain('≥ 99.8');
    await page.getByRole('button', { name: /^Import \d+ rows$/ }).click();
    await expect.poll(() => page.getByText(/^✓ Imported \d+ rows/).isVisible(), { timeout: 15_000 }).toBe(true);
    const residuals = page.getByRole('region', { name: 'Residual diagnostics' });
    await expect.poll(() => residuals.textContent(), { timeout: 15_000 }).toContain('lower bound');
    expect(await page.getByRole('table', { name: 'Measurements' }).textContent()).toContain('lower bound');
    await maybeScreenshot(page, 'campaigns-workbook');
    await signOut(page);
  }, 60_000);
  it('when a campaign is reported as dr, then the page shows dr, % de and % major diastereomer and never ee', async () => {
    const { page, baseUrl } = browser;
    const who = { login: `dr-${Date.now().toString(36)}`, name: 'Dara Diastereomer', email: `dr-${Date.now().toString(36)}@example.test` };
    const editor = await createUser(who);
    const project = await createProject([{ user: editor, role: 'editor' }], { name: 'Aldol dr screens (invented)' });
    const { createCampaign } = await import('../factories/campaigns');
    const { Measurement } = await import('../../api/models/measurement');
    const campaign = await createCampaign(project.id, {
      title: 'Invented aldol: dr against temperature',
      productNameA: 'syn-aldol',
      productNameB: 'anti-aldol',
      measure: 'dr',
      assayMethod: 'nmr',
      defaultUncertainty: 0.05,
    });
    // Invented runs: ln r = 1500/T − 3.2 with a small fixed zig-zag, dr to one decimal.
    const runs = [25, 10, 0, -10, -20, -40].map((c, i) => {
      const temperatureK = c + 273.15;
      return {
        campaignId: campaign.id,
        temperatureK,
        measure: 'dr' as const,
        value: Math.round(Math.exp(1500 / temperatureK - 3.2 + (i % 2 ? 0.02 : -0.02)) * 10) / 10,
      };
    });
    await Measurement.query(testKnex()).insert(runs);

    await signInAs(page, baseUrl, who, `/campaigns/${campaign.id}`);
    const residuals = page.getByRole('region', { name: 'Residual diagnostics' });
    await expect.poll(() => residuals.textContent(), { timeout: 15_000 }).toMatch(/\d+(\.\d)?:1/);
    await page.getByRole('textbox', { name: 'Proposed temperature' }).fill('-30');
    await page.getByRole('textbox', { name: 'Proposed temperature' }).press('Enter');
    const box = page.getByRole('region', { name: 'Prediction at the proposed temperature' });
    await expect.poll(() => box.textContent(), { timeout: 15_000 }).toContain('major diastereomer');
    const text = (await box.textContent())!;
    expect(text).toMatch(/\d+(\.\d)?:1/);
    expect(text).toContain('de');
    expect(text).not.toMatch(/\bee\b/);
    expect(await page.getByRole('radio', { name: '% de' }).count()).toBe(1);
    expect(await page.getByRole('radio', { name: 'ee %' }).count()).toBe(0);
    await maybeScreenshot(page, 'campaigns-dr');
    const size = page.viewportSize();
    await page.setViewportSize({ width: 390, height: 844 });
    await maybeElementShot(page, 'campaigns-dr-forecast-390', box);
    await maybeElementShot(page, 'campaigns-dr-residuals-390', residuals);
    if (size) await page.setViewportSize(size);
    await signOut(page);
  }, 60_000);
  it('when the analysis fails to reload after a good load, then the last one stays greyed and labelled stale with a retry, and the forecast never asks for measurements', async () => {
    const { page, baseUrl } = browser;
    const who = { login: `st-${Date.now().toString(36)}`, name: 'Stig Stale', email: `st-${Date.now().toString(36)}@example.test` };
    const editor = await createUser(who);
    const project = await createProject([{ user: editor, role: 'editor' }], { name: 'Stale result checks (invented)' });
    const { createCampaign } = await import('../factories/campaigns');
    const { Measurement } = await import('../../api/models/measurement');
    const campaign = await createCampaign(project.id, { title: 'Invented screen of 150 runs' });
    // Invented runs: 15 temperatures from −80 to +32 °C, ln r = 1200/T − 1.2 with a fixed zig-zag of ±0.03.
    const runs = Array.from({ length: 150 }, (_, i) => {
      const temperatureK = 193.15 + (i % 15) * 8;
      const lnR = 1200 / temperatureK - 1.2 + (i % 2 ? 0.03 : -0.03);
      return { campaignId: campaign.id, temperatureK, measure: 'ee' as const, value: Math.round(10000 * Math.tanh(lnR / 2)) / 100 };
    });
    await Measurement.query(testKnex()).insert(runs);

    await signInAs(page, baseUrl, who, `/campaigns/${campaign.id}`);
    const parameters = page.getByRole('region', { name: 'Fitted parameters' });
    await expect.poll(() => parameters.textContent(), { timeout: 15_000 }).toContain('ΔΔH‡');
    const before = (await parameters.textContent())!;
    // 150 runs: the residual table (built once the page is first idle) draws the rows in view of its box, not all of them.
    const residualRows = page.getByRole('region', { name: 'Residuals and flags for each run' }).locator('tbody tr[data-index]');
    await expect.poll(() => residualRows.count(), { timeout: 15_000 }).toBeGreaterThan(5);
    expect(await residualRows.count()).toBeLessThan(150);

    // Every analysis request from here on meets a server fault.
    const failing = '**/api/v1/campaigns/*/analysis?*';
    await page.route(failing, (route) =>
      route.fulfill({
        status: 503,
        contentType: 'application/problem+json',
        body: JSON.stringify({ type: 'about:blank', title: 'Service Unavailable', status: 503, detail: 'The analysis is unavailable.' }),
      }),
    );
    // The segmented control's label takes the click for its visually hidden radio.
    await page.locator('label').filter({ hasText: 'By assay uncertainty' }).click();
    const result = page.locator('[data-stale="failed"]');
    await expect.poll(() => result.count(), { timeout: 15_000 }).toBe(1);
    expect(await result.getByText('stale', { exact: true }).isVisible()).toBe(true);
    expect(await result.locator('.opacity-50').count()).toBe(1);
    // The last analysis is the one on screen, unchanged.
    expect(await parameters.textContent()).toBe(before);
    const forecast = page.getByRole('region', { name: 'Forecast at a proposed temperature' });
    expect(await forecast.textContent()).not.toContain('add measurements');
    await maybeScreenshot(page, 'campaigns-stale-analysis');

    await page.unroute(failing);
    await result.getByRole('button', { name: 'Retry' }).click();
    await expect.poll(() => page.locator('[data-stale]').count(), { timeout: 15_000 }).toBe(0);
    expect(await parameters.textContent()).toContain('ΔΔH‡');
    await signOut(page);
  }, 60_000);
});
