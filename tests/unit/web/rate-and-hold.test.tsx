// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { RatePanel } from '../../../web/features/calculators/components/rate-panel';
import { ErosionPanel } from '../../../web/features/calculators/components/erosion-panel';
import { DistributionPanel } from '../../../web/features/calculators/components/distribution-panel';
import { initialRateForm, toRateRequest } from '../../../web/features/calculators/lib/rate-form';
import { distributionRequestSchema, erosionRequestSchema, rateRequestSchema } from '../../../api/features/calculators/kinetics-schemas';

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function renderWithClient(node: ReactNode) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  return render(<QueryClientProvider client={client}>{node}</QueryClientProvider>);
}

/** A fetch stand-in that records request bodies and answers with the given status and body. */
function stubFetch(status: number, body: unknown) {
  const bodies: unknown[] = [];
  const spy = vi.fn(async (_url: string, init?: RequestInit) => {
    bodies.push(JSON.parse(String(init?.body)));
    return new Response(JSON.stringify(body), {
      status,
      headers: { 'content-type': status < 400 ? 'application/json' : 'application/problem+json' },
    });
  });
  vi.stubGlobal('fetch', spy);
  return { spy, bodies };
}

const type = (label: string | RegExp, value: string, root: HTMLElement = document.body) =>
  fireEvent.change(within(root).getByLabelText(label), { target: { value } });

describe('the time-to-finish form', () => {
  it('when one run (95 % in 4 h at 0 °C) is entered, then the request carries it with the stated default ΔH‡ and validates against the API schema', async () => {
    const { spy, bodies } = stubFetch(500, { title: 'stop here', status: 500, detail: 'not needed' });
    renderWithClient(<RatePanel />);
    const form = screen.getByRole('form', { name: 'Time to finish inputs' });
    type('Reached conversion (%)', '95', form);
    type('after', '4', form);
    type('at temperature', '0', form);
    type('Target conversion (%)', '99', form);
    fireEvent.click(within(form).getByRole('button', { name: 'Calculate times' }));
    await waitFor(() => expect(spy).toHaveBeenCalledTimes(1));
    expect(spy.mock.calls[0]![0]).toBe('/api/v1/rate');
    const sent = bodies[0];
    expect(rateRequestSchema.safeParse(sent).success).toBe(true);
    expect(sent).toEqual({
      setup: { order: 'first' },
      basis: {
        kind: 'one-run',
        run: { conversionPercent: 95, time: { value: 4, unit: 'h' }, temperature: { value: 0, unit: 'C' } },
        assumedDH: { value: 60, unit: 'kJ/mol' },
      },
      targetConversionPercent: 99,
      temperatures: { from: { value: -40, unit: 'C' }, to: { value: 40, unit: 'C' }, count: 9 },
    });
  });

  it('when two runs and second order are chosen, then both runs and c₀ are sent in the API shape', () => {
    const { request, errors } = toRateRequest({
      ...initialRateForm,
      kind: 'two-runs',
      order: 'second',
      initial: '0,5',
      run1: { conversion: '90', time: '30', timeUnit: 'min', temperature: '25', temperatureUnit: 'C' },
      run2: { conversion: '90', time: '3', timeUnit: 'h', temperature: '\u22125', temperatureUnit: 'C' },
    });
    expect(errors).toEqual([]);
    expect(request!.setup).toEqual({ order: 'second', initial: { value: 0.5, unit: 'mol/L' } });
    expect(request!.basis).toEqual({
      kind: 'two-runs',
      runs: [
        { conversionPercent: 90, time: { value: 30, unit: 'min' }, temperature: { value: 25, unit: 'C' } },
        { conversionPercent: 90, time: { value: 3, unit: 'h' }, temperature: { value: -5, unit: 'C' } },
      ],
    });
  });

  it('when the conversion is 100 % and the time is not a number, then each message appears under its field and nothing is sent', () => {
    const { spy } = stubFetch(200, {});
    renderWithClient(<RatePanel />);
    const form = screen.getByRole('form', { name: 'Time to finish inputs' });
    type('Reached conversion (%)', '100', form);
    type('after', 'four', form);
    type('at temperature', '0', form);
    fireEvent.click(within(form).getByRole('button', { name: 'Calculate times' }));
    const conversion = within(form).getByLabelText('Reached conversion (%)');
    expect(conversion.getAttribute('aria-invalid')).toBe('true');
    const errId = conversion
      .getAttribute('aria-describedby')!
      .split(' ')
      .find((id) => id.endsWith('-err'))!;
    expect(document.getElementById(errId)!.textContent).toContain('must be below 100 %');
    expect(within(form).getByLabelText('after').getAttribute('aria-invalid')).toBe('true');
    expect(within(form).getByLabelText('at temperature').getAttribute('aria-invalid')).toBe('false');
    expect(spy).not.toHaveBeenCalled();
  });

  it('when the API rejects a run temperature, then its message is shown under that input', async () => {
    stubFetch(422, {
      type: 'about:blank',
      title: 'Unprocessable',
      status: 422,
      detail: 'The request could not be computed.',
      errors: [{ path: 'basis.run.temperature.value', message: 'must be above absolute zero' }],
    });
    renderWithClient(<RatePanel />);
    const form = screen.getByRole('form', { name: 'Time to finish inputs' });
    type('Reached conversion (%)', '95', form);
    type('after', '4', form);
    type('at temperature', '-20', form);
    fireEvent.click(within(form).getByRole('button', { name: 'Calculate times' }));
    const input = within(form).getByLabelText('at temperature');
    await waitFor(() => expect(input.getAttribute('aria-invalid')).toBe('true'));
    const errId = input
      .getAttribute('aria-describedby')!
      .split(' ')
      .find((id) => id.endsWith('-err'))!;
    expect(document.getElementById(errId)!.textContent).toBe('must be above absolute zero');
  });
});

describe('the erosion form', () => {
  it('when a barrier, ee, hold, floor and K are entered, then the request validates and carries each of them', async () => {
    const { spy, bodies } = stubFetch(500, { title: 'stop here', status: 500, detail: 'not needed' });
    renderWithClient(<ErosionPanel />);
    const form = screen.getByRole('form', { name: 'Erosion inputs' });
    type('Barrier ΔG‡', '24.5', form);
    type('Initial ee (%)', '99.5', form);
    type('ee floor (%), optional', '99', form);
    type('Hold time, optional', '12', form);
    type('Equilibrium K = [B]/[A], optional', '0.5', form);
    fireEvent.click(within(form).getByRole('button', { name: 'Calculate erosion' }));
    await waitFor(() => expect(spy).toHaveBeenCalledTimes(1));
    expect(spy.mock.calls[0]![0]).toBe('/api/v1/erosion');
    expect(erosionRequestSchema.safeParse(bodies[0]).success).toBe(true);
    expect(bodies[0]).toEqual({
      barrier: { kind: 'gibbs', dG: { value: 24.5, unit: 'kcal/mol' }, temperature: { value: 25, unit: 'C' } },
      initialEePercent: 99.5,
      hold: { value: 12, unit: 'h' },
      eeFloorPercent: 99,
      equilibriumRatio: 0.5,
      temperatures: { from: { value: -20, unit: 'C' }, to: { value: 60, unit: 'C' }, count: 9 },
    });
  });

  it('when the optional fields are left empty, then they are left out of the request (racemization, no hold)', async () => {
    const { spy, bodies } = stubFetch(500, { title: 'stop here', status: 500, detail: 'not needed' });
    renderWithClient(<ErosionPanel />);
    const form = screen.getByRole('form', { name: 'Erosion inputs' });
    type('Barrier ΔG‡', '28', form);
    type('Initial ee (%)', '98', form);
    fireEvent.click(within(form).getByRole('button', { name: 'Calculate erosion' }));
    await waitFor(() => expect(spy).toHaveBeenCalledTimes(1));
    expect(Object.keys(bodies[0] as object).sort()).toEqual(['barrier', 'initialEePercent', 'temperatures']);
  });
});

describe('the several-pathways form', () => {
  it('when the invented example is loaded, then four H‡/S‡ pathways in two diastereomer groups are sent and validate', async () => {
    const { spy, bodies } = stubFetch(500, { title: 'stop here', status: 500, detail: 'not needed' });
    renderWithClient(<DistributionPanel />);
    const form = screen.getByRole('form', { name: 'Pathway inputs' });
    fireEvent.click(within(form).getByRole('button', { name: 'Load invented example' }));
    fireEvent.click(within(form).getByRole('button', { name: 'Calculate distribution' }));
    await waitFor(() => expect(spy).toHaveBeenCalledTimes(1));
    const sent = distributionRequestSchema.parse(bodies[0]);
    expect(sent.pathways.map((p) => [p.label, p.diastereomer, p.enantiomer, p.barrier.kind])).toEqual([
      ['syn-A', 'syn', 'A', 'activation'],
      ['syn-B', 'syn', 'B', 'activation'],
      ['anti-A', 'anti', 'A', 'activation'],
      ['anti-B', 'anti', 'B', 'activation'],
    ]);
  });

  it('when two G‡ rows share a label, then the duplicate is marked on its row and nothing is sent', () => {
    const { spy } = stubFetch(200, {});
    renderWithClient(<DistributionPanel />);
    const form = screen.getByRole('form', { name: 'Pathway inputs' });
    type('Label, row 2', 'P1', form);
    const [g1, g2] = within(form).getAllByLabelText('G‡, P1');
    fireEvent.change(g1!, { target: { value: '0' } });
    fireEvent.change(g2!, { target: { value: '3' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Calculate distribution' }));
    const second = within(form).getByLabelText('Label, row 2');
    expect(second.getAttribute('aria-invalid')).toBe('true');
    expect(within(form).getByLabelText('Label, row 1').getAttribute('aria-invalid')).toBe('false');
    expect(form.textContent).toContain('the label "P1" is used twice');
    expect(spy).not.toHaveBeenCalled();
  });
});
