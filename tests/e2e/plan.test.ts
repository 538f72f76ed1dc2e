import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import ExcelJS from 'exceljs';
import type { Page } from 'playwright-core';
import { testKnex } from '../support/db';
import { maybeScreenshot, type BrowserSession } from '../support/browser';
import { openSignInBrowser, signInThroughForm } from '../support/browser-auth';
import { createUser, type TestIdentity } from '../factories/users';
import { createProject } from '../factories/projects';
import { createCampaign } from '../factories/campaigns';
import { Measurement } from '../../api/models/measurement';

let browser: BrowserSession;
let closeBrowser: (() => Promise<void>) | undefined;

beforeAll(async () => {
  ({ browser, close: closeBrowser } = await openSignInBrowser());
});

afterAll(() => closeBrowser?.());

/** Click the campaign's spreadsheet link and read the downloaded workbook back. */
async function downloadReport(page: Page): Promise<ExcelJS.Workbook> {
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: /Download spreadsheet report/ }).click(),
  ]);
  const file = await download.path();
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load((await readFile(file)) as unknown as ArrayBuffer);
  return wb;
}

/** The value beside a label in column A of a sheet. */
function valueBeside(ws: ExcelJS.Worksheet, label: string): ExcelJS.CellValue | undefined {
  let found: ExcelJS.CellValue | undefined;
  ws.eachRow((row) => {
    if (found === undefined && row.getCell(1).value === label) found = row.getCell(2).value;
  });
  return found;
}

async function signInAs(page: Page, baseUrl: string, who: TestIdentity, returnPath: string) {
  await page.context().clearCookies();
  await signInThroughForm(page, baseUrl + returnPath, who);
}

const R = 8.314462618;
const TEMPS_C = [-60, -60, -40, -40, -20, -20, 0, 0, 20, 20];
const NOISE = [0.04, -0.03, 0.02, -0.05, 0.03, -0.01, 0.05, -0.02, 0.01, -0.04]; // invented scatter in ln r

/** An invented ee screen with conversion and time on every run (ΔΔH‡ = 12 kJ/mol + offset in ln r). */
async function inventedScreen(projectId: string, title: string, shift: number) {
  const campaign = await createCampaign(projectId, { title });
  await Measurement.query(testKnex()).insert(
    TEMPS_C.map((c, i) => {
      const t = c + 273.15;
      const y = 12_000 / (R * t) - 10 / R + shift + NOISE[i]!;
      const k = 2.083661912e10 * t * Math.exp(-100 / R) * Math.exp(-55_000 / (R * t));
      const timeS = 3600 * 30 * Math.exp(-((t - 213.15) / 25));
      return {
        campaignId: campaign.id,
        temperatureK: t,
        measure: 'ee' as const,
        value: 100 * Math.tanh(y / 2),
        conversionPercent: 100 * (1 - Math.exp(-k * timeS)),
        reactionTimeS: timeS,
      };
    }),
  );
  return campaign;
}

describe('temperature planner in Chromium', () => {
  it('when an editor sets a specification and plans, then the recommendation, the window chart and a saved comparison appear', async () => {
    const { page, baseUrl } = browser;
    const stamp = Date.now().toString(36);
    const editorId = { login: `pl-${stamp}`, name: 'Pia Planner', email: `pl-${stamp}@example.test` };
    const editor = await createUser(editorId);
    const project = await createProject([{ user: editor, role: 'owner' }], {
      name: 'Invented planning project',
      description: 'Invented demo data for the browser test.',
    });
    const first = await inventedScreen(project.id, 'Invented Osprey ligand', 0.5);
    await inventedScreen(project.id, 'Invented Plover ligand', 0);

    await signInAs(page, baseUrl, editorId, `/campaigns/${first.id}`);
    const form = page.getByRole('form', { name: 'Plan the temperature' });
    await form.getByLabel('Minimum').fill('98');
    await form.getByLabel('Required probability').fill('0.95');
    await form.getByLabel('Coldest jacket (°C)').fill('-70');
    await form.getByLabel('Warmest jacket (°C)').fill('25');
    await form.getByLabel('Longest reaction time (h)').fill('24');
    await form.getByRole('button', { name: 'Plan and save' }).click();

    await page.getByTestId('recommended').waitFor();
    const recommended = await page.getByTestId('recommended').innerText();
    expect(recommended).toMatch(/−?\d+\.\d °C/);
    expect(await page.getByTestId('plan-summary').innerText()).toMatch(/Rule: The warmest temperature/);
    expect(await page.getByTestId('plan-summary').getByRole('note', { name: 'Safety caution' }).isVisible()).toBe(true);
    // The window chart draws every panel, marks the recommendation and names what excludes the rest.
    await page.getByTestId('window-selectivity').locator('svg').first().waitFor();
    await page.getByTestId('window-time').locator('svg').first().waitFor();
    expect(await page.getByTestId('window-selectivity').innerText()).toMatch(/recommended/);
    expect(await page.getByTestId('window-selectivity').innerText()).toMatch(/excluded: /);
    await maybeScreenshot(page, 'plan-feasible-1440');

    // The saved plan travels in the downloaded workbook: its Plan sheet holds the same recommended temperature.
    const report = await downloadReport(page);
    const planSheet = report.getWorksheet('Plan');
    expect(planSheet).toBeDefined();
    const shownC = Number(/(−?\d+\.\d) °C/.exec(recommended)![1]!.replace('−', '-'));
    const sheetC = valueBeside(planSheet!, 'Recommended temperature');
    expect(typeof sheetC).toBe('number');
    expect(Math.round((sheetC as number) * 10) / 10).toBeCloseTo(shownC, 5);
    expect(String(valueBeside(planSheet!, 'Caution'))).toMatch(/calorimetry/);
    expect(planSheet!.getImages()).toHaveLength(1);
    expect(valueBeside(report.getWorksheet('Summary')!, 'Recommended temperature')).toBe(sheetC);
    await page.setViewportSize({ width: 390, height: 900 });
    await maybeScreenshot(page, 'plan-feasible-390');
    await page.setViewportSize({ width: 1440, height: 900 });

    // A specification the range cannot meet is an answer: no recommendation, the conflict named.
    await form.getByLabel('Minimum').fill('99.9');
    await form.getByRole('button', { name: 'Plan and save' }).click();
    await page.getByTestId('no-recommendation').waitFor();
    expect(await page.getByTestId('no-recommendation').innerText()).toMatch(/specification needs ≤/);
    await maybeScreenshot(page, 'plan-infeasible-1440');

    // The plan is stored: a reload shows it.
    await page.reload();
    await page.getByTestId('no-recommendation').waitFor();

    // Compare the two screens and save the comparison.
    await page.getByRole('link', { name: 'Compare campaigns →' }).click();
    await page.waitForURL(`${baseUrl}/projects/${project.id}/compare`);
    await page.getByLabel(/Osprey ligand/).check();
    await page.getByLabel(/Plover ligand/).check();
    await page.getByLabel('Name').fill('Osprey against Plover');
    await page.getByRole('button', { name: 'Compare and save' }).click();
    await page.waitForURL(/\/comparisons\//);
    await page.getByTestId('comparison-pairs').waitFor();
    expect(await page.getByTestId('comparison-pairs').innerText()).toMatch(/the first is more selective/);
    await page.getByTestId('comparison-chart').locator('svg').first().waitFor();
    await page.getByTestId('comparison-eyring').locator('svg').first().waitFor();
    await maybeScreenshot(page, 'comparison-1440');

    // The saved comparison is in the next report of the campaign.
    await page.goto(`${baseUrl}/campaigns/${first.id}`);
    const withComparison = await downloadReport(page);
    const cmp = withComparison.getWorksheet('Comparison');
    expect(cmp).toBeDefined();
    const texts: string[] = [];
    cmp!.eachRow((row) => texts.push(String(row.getCell(1).value)));
    expect(texts.some((t) => t.startsWith('Osprey against Plover'))).toBe(true);
  }, 90_000);
});
