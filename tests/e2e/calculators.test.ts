import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { maybeScreenshot, useBrowserOnApp } from '../support/browser';

const browser = useBrowserOnApp({ beforeAll, afterAll });

describe('the calculators page in Chromium (no sign-in)', () => {
  it('when a chemist forecasts from one observed ee, then a table across the range and the chart appear, with the convention and a caution', async () => {
    const { page, baseUrl } = browser();
    await page.goto(baseUrl + '/');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Calculators' }).click();
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Selectivity calculators');

    const form = page.getByRole('form', { name: 'Forecast inputs' });
    await form.getByLabel('Observed value').fill('92.5');
    await form.getByLabel('at temperature').fill('-20');
    await form.getByRole('button', { name: 'Forecast' }).click();

    const table = page.getByRole('table').filter({ hasText: 'ΔΔG‡ (kcal/mol)' });
    await expect.poll(() => table.locator('tbody tr').count()).toBe(13);
    // The row at the observed temperature gives back the observed ee (a round trip through the API).
    const row = table.locator('tbody tr').filter({ hasText: '−20.0' });
    expect(await row.locator('td').nth(3).textContent()).toBe('92.5');
    expect(await page.locator('[data-testid="selectivity-chart"] svg[aria-label] path.eyrie-curve-line').count()).toBe(1);
    expect(await page.locator('main').textContent()).toContain('assumed 0');
    expect(await page.locator('main').textContent()).toContain('X‡(TS→B) − X‡(TS→A)');
    await maybeScreenshot(page, 'calculators-forecast');
  });

  it('when the API rejects an input, then its message appears under that input', async () => {
    const { page } = browser();
    const form = page.getByRole('form', { name: 'Forecast inputs' });
    await form.getByLabel('Observed value').fill('100');
    await form.getByRole('button', { name: 'Forecast' }).click();
    const input = form.getByLabel('Observed value');
    await expect.poll(() => input.getAttribute('aria-invalid')).toBe('true');
    const describedBy = (await input.getAttribute('aria-describedby')) ?? '';
    const errorId = describedBy.split(' ').find((id) => id.endsWith('-err'));
    expect(errorId).toBeTruthy();
    expect(await page.locator(`[id="${errorId}"]`).textContent()).toContain('infinite energy gap');
  });

  it('when the invented example screen is fitted, then ΔΔH‡ with ± SE, the Eyring plot and a prediction at the proposed temperature appear', async () => {
    const { page } = browser();
    const form = page.getByRole('form', { name: 'Screen inputs' });
    await form.getByRole('button', { name: 'Load invented example' }).click();
    await form.getByRole('button', { name: 'Fit screen' }).click();

    const params = page.getByRole('table', { name: 'Fitted activation parameters' });
    await expect.poll(() => params.count()).toBe(1);
    const ddH = params.locator('tbody tr').first();
    expect(await ddH.textContent()).toMatch(/ΔΔH‡\+?\d+(\.\d+)? ± \d+(\.\d+)?kJ\/mol/);
    const plot = page.locator('[data-testid="eyring-plot"] svg[aria-label]');
    expect(await plot.count()).toBe(1);
    expect(await plot.locator('path.eyrie-fit-line').count()).toBe(1);
    expect(await plot.locator('path.visx-area').count()).toBe(2);

    const prediction = page.getByRole('region', { name: 'Prediction at the proposed temperature' });
    expect(await prediction.textContent()).toContain('At −50.0 °C');
    expect(await prediction.textContent()).toMatch(/95 % prediction interval \d+\.\d+ to \d+\.\d+ %/);
    expect(await prediction.getByRole('note', { name: 'Safety caution' }).count()).toBe(1);
    await maybeScreenshot(page, 'calculators-fit');

    // Ask for another temperature: the prediction follows.
    await form.getByLabel('Proposed temperature').fill('-70');
    await form.getByRole('button', { name: 'Fit screen' }).click();
    await expect.poll(() => prediction.locator('h3').textContent()).toContain('At −70.0 °C');
  });

  it('when a pasted line cannot be read, then its line number is shown and the fit is not sent', async () => {
    const { page } = browser();
    const form = page.getByRole('form', { name: 'Screen inputs' });
    await form.getByLabel(/Screen: one run per line/).fill('-40, 96.9\n-20, n/a\n0, 93.7');
    const problems = page.getByRole('alert', { name: 'Problems in the pasted screen' });
    expect(await problems.textContent()).toContain('Line 2:');
    await form.getByRole('button', { name: 'Fit screen' }).click();
    expect(await form.getByText('Fix the lines listed under the screen first.').count()).toBe(1);
  });
});
