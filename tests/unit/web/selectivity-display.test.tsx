// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { PredictionBox } from '../../../web/components/fit/prediction-box';
import { ChartControls } from '../../../web/components/charts/chart-controls';
import { SelectivityChart } from '../../../web/components/charts/selectivity-chart';
import type { FitResponse } from '../../../api/features/calculators/schemas';

afterEach(cleanup);

type Prediction = FitResponse['predictions'][number];

/** A prediction at r = 18.5 with a new-run interval of r = 12…25 (invented numbers for the display). */
function prediction(): Prediction {
  const at = (r: number) => ({ ratio: r, eePercent: (100 * (r - 1)) / (r + 1), percentA: (100 * r) / (1 + r) });
  const iv = (a: number, b: number) => ({
    ratio: [a, b] as [number, number],
    eePercent: [at(a).eePercent, at(b).eePercent] as [number, number],
    percentA: [at(a).percentA, at(b).percentA] as [number, number],
  });
  return {
    kelvin: 253.15,
    celsius: -20,
    ...at(18.5),
    ddG: { 'kJ/mol': 6.14, 'kcal/mol': 1.47 },
    ddGSe: null,
    extrapolated: false,
    model: 'one-line',
    branch: null,
    confidenceInterval: iv(16, 21),
    predictionInterval: iv(12, 25),
  };
}

describe('selectivity in the measure of the campaign', () => {
  it('when the runs are a dr, then the forecast shows dr, % de and % major and no ee', () => {
    const { container } = render(<PredictionBox prediction={prediction()} confidence={0.95} measure="dr" />);
    const text = container.textContent!;
    // [C] r = 18.5: de = 17.5/19.5 = 89.7 %, major = 18.5/19.5 = 94.9 %; r = 12 → de 84.6 %, r = 25 → de 92.3 %
    expect(text).toContain('18.5:1');
    expect(text).toContain('95 % prediction interval 12.0:1 to 25.0:1');
    expect(text).toContain('89.7 %');
    expect(text).toContain('84.6 to 92.3 %');
    expect(text).toContain('94.9 %');
    expect(text).toContain('major diastereomer');
    expect(text).not.toMatch(/\bee\b|\ber\b/);
  });

  it('when the runs are an ee, then the forecast still shows ee, % A and er', () => {
    const { container } = render(<PredictionBox prediction={prediction()} confidence={0.95} />);
    expect(container.textContent).toContain('ee');
    expect(container.textContent).toContain('er 94.9:5.1');
  });

  it('when the chart is for a dr campaign, then its axis choices are % de and % major and its y axis says so', () => {
    render(<ChartControls name="t" measure="percentA" onMeasure={() => {}} spec="" onSpec={() => {}} family="dr" />);
    expect(screen.getByLabelText('% de')).toBeTruthy();
    expect(screen.getByLabelText('% major')).toBeTruthy();
    expect(screen.queryByLabelText('ee %')).toBeNull();
    const curve = [
      { celsius: -40, eePercent: 95, percentA: 97.5 },
      { celsius: 20, eePercent: 80, percentA: 90 },
    ];
    const { container } = render(
      <SelectivityChart title="dr chart" curve={curve} measure="percentA" family="dr" width={500} height={260} />,
    );
    expect(container.textContent).toContain('major diastereomer (%)');
    expect(container.textContent).not.toContain('ee (%)');
  });
});
