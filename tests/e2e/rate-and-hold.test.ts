import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maybeScreenshot, useBrowserOnApp } from '../support/browser';

const browser = useBrowserOnApp({ beforeAll, afterAll });

describe('the rate and hold page in Chromium (no sign-in)', () => {
  it('when one run (95 % in 4 h at 0 °C) is entered, then the 0 °C row takes 4 h and the ±10 kJ/mol ΔH‡ variants stand beside it', async () => {
    const { page, baseUrl } = browser();
    await page.goto(baseUrl + '/');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Rate and hold' }).click();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Rate and hold');

    const form = page.getByRole('form', { name: 'Time to finish inputs' });
    await form.getByLabel('Reached conversion (%)').fill('95');
    await form.getByLabel('after').fill('4');
    await form.getByLabel('at temperature').fill('0');
    await form.getByRole('button', { name: 'Calculate times' }).click();

    const table = page.getByRole('table', { name: /time to the target conversion by temperature/ });
    await expect.poll(() => table.locator('tbody tr').count()).toBe(9);
    const headers = await table.locator('thead th').allTextContents();
    expect(headers).toContain('Time to 95 %');
    expect(headers).toContain('if ΔH‡ −10 kJ/mol');
    expect(headers).toContain('if ΔH‡ +10 kJ/mol');
    // At the run's own temperature every variant gives back the measured 4 h (a round trip through the API).
    const row = table.locator('tbody tr').filter({ has: page.locator('td:nth-child(2)', { hasText: /^0\.0$/ }) });
    const cells = await row.locator('td').allTextContents();
    expect(cells.slice(4, 7)).toEqual(['4 h', '4 h', '4 h']);
    // Colder is slower, and the variants differ away from the run.
    const cold = await table.locator('tbody tr').first().locator('td').allTextContents();
    expect(cold[1]).toBe('−40.0');
    expect(new Set(cold.slice(4, 7)).size).toBe(3);
    const panel = page.locator('section').filter({ has: page.getByRole('heading', { name: 'Time to finish' }) });
    expect(await page.locator('[data-testid="rate-chart"] svg[aria-label] path.eyrie-line').count()).toBe(3);
    expect(await page.locator('main').textContent()).toContain('ΔH‡ assumed 60.0 kJ/mol');
    expect(await panel.getByRole('note', { name: 'Safety caution' }).count()).toBe(1);
    await maybeScreenshot(page, 'rate-and-hold-rate');
  });

  it('when a racemization barrier and a hold are entered, then k_rac = 2k_e, the ee half-life and the 37 °C stability class appear', async () => {
    const { page } = browser();
    const form = page.getByRole('form', { name: 'Erosion inputs' });
    await form.getByLabel('Barrier ΔG‡').fill('25');
    await form.getByLabel('Initial ee (%)').fill('99.5');
    await form.getByLabel('ee floor (%), optional').fill('99');
    await form.getByLabel('Hold time, optional').fill('2');
    await form.getByLabel('From').fill('-15');
    await form.getByLabel('to', { exact: true }).fill('65');
    await form.getByRole('button', { name: 'Calculate erosion' }).click();

    const table = page.getByRole('table', { name: 'Erosion of ee by temperature' });
    await expect.poll(() => table.locator('tbody tr').count()).toBe(9);
    const headers = await table.locator('thead th').allTextContents();
    expect(headers).toEqual(
      expect.arrayContaining(['k_e one-way (s⁻¹)', 'k_rac = 2k_e (s⁻¹)', 'ee half-life', 'ee after hold (%)', 'Longest hold above floor']),
    );
    // [C] 25 °C, ΔG‡ = 25 kcal/mol, κ = 1: k_e = 2.94 × 10⁻⁶ s⁻¹, so t½(ee) = ln 2/(2k_e) = 32.8 h.
    const row = table.locator('tbody tr').filter({ has: page.locator('td:nth-child(2)', { hasText: /^25\.0$/ }) });
    const cells = await row.locator('td').allTextContents();
    expect(cells[3]).toBe('2.94 × 10⁻⁶');
    expect(cells[4]).toBe('5.88 × 10⁻⁶');
    expect(cells[5]).toBe('32.8 h');
    // [C] ee after 2 h = 99.5·exp(−2k_e·7200 s) = 95.4 %, under the 99 % floor: said in words, not colour alone.
    expect(cells[6]).toBe('95.4✗ below floor');
    const erosion = page.locator('section').filter({ has: page.getByRole('heading', { name: 'Erosion during a hold' }) });
    expect(await erosion.textContent()).toContain('t½ = ln 2/(2k_e)');
    const stability = page.getByRole('region', { name: 'Stability class at 37 °C' });
    expect(await stability.textContent()).toContain('Stability class 2 at 37 °C');
    expect(await stability.textContent()).toContain('LaPlante');
    await maybeScreenshot(page, 'rate-and-hold-erosion');
  });

  it('when the invented pathways are calculated, then shares, ee per diastereomer and dr appear with a line per product', async () => {
    const { page } = browser();
    const form = page.getByRole('form', { name: 'Pathway inputs' });
    await form.getByRole('button', { name: 'Load invented example' }).click();
    await form.getByRole('button', { name: 'Calculate distribution' }).click();
    const table = page.getByRole('table', { name: 'Product distribution by temperature' });
    await expect.poll(() => table.locator('tbody tr').count()).toBe(9);
    const headers = await table.locator('thead th').allTextContents();
    expect(headers).toEqual(expect.arrayContaining(['syn-A (%)', 'anti-B (%)', 'syn: share (%) · ee (%)', 'dr (syn : anti)']));
    expect(await page.locator('[data-testid="distribution-chart"] svg[aria-label] path.eyrie-line').count()).toBe(4);
    await maybeScreenshot(page, 'rate-and-hold-distribution');
  });

  it('when the API rejects an input, then its message appears under that input', async () => {
    const { page } = browser();
    const form = page.getByRole('form', { name: 'Erosion inputs' });
    await form.getByLabel('Barrier ΔG‡').fill('25');
    await form.getByLabel('at temperature').fill('-300');
    await form.getByRole('button', { name: 'Calculate erosion' }).click();
    const input = form.getByLabel('at temperature');
    await expect.poll(() => input.getAttribute('aria-invalid')).toBe('true');
    const errorId = ((await input.getAttribute('aria-describedby')) ?? '').split(' ').find((id) => id.endsWith('-err'));
    expect(errorId).toBeTruthy();
    expect(await page.locator(`[id="${errorId}"]`).textContent()).toMatch(/absolute zero/);
  });
});
