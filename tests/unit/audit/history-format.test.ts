import { describe, expect, it } from 'vitest';
import { formatCelsius, formatNumber, formatReading, runLabel } from '../../../api/features/audit/history';

describe('history wording', () => {
  it('when stored numbers carry float artefacts or are negative, then they read as people write them', () => {
    expect(formatNumber(0.1 + 0.2)).toBe('0.3');
    expect(formatNumber(-39.99999999999997)).toBe('−40');
    // 253.15 K − 273.15 = −20 °C exactly [C].
    expect(formatCelsius(253.15)).toBe('−20 °C');
    // 300 K = 26.85 °C, shown to 0.1 °C [C].
    expect(formatCelsius(300)).toBe('26.9 °C');
  });

  it('when readings are ee, pairs, single ratios or bounds, then each has its own form', () => {
    expect(formatReading({ measure: 'ee', value: 98.7, valueB: null, isLowerBound: false })).toBe('ee 98.7 %');
    expect(formatReading({ measure: 'ee', value: 99.8, valueB: null, isLowerBound: true })).toBe('ee ≥ 99.8 %');
    expect(formatReading({ measure: 'er', value: 95, valueB: 5, isLowerBound: false })).toBe('er 95:5');
    expect(formatReading({ measure: 'dr', value: 12, valueB: null, isLowerBound: false })).toBe('dr 12:1');
    expect(formatReading({ measure: 'percentA', value: 97.5, valueB: null, isLowerBound: false })).toBe('share of A 97.5 %');
  });

  it('when a run has a sample id, a replicate, both or neither, then its label says what it has', () => {
    expect(runLabel({ sampleId: 'KL-12', replicateLabel: 'a', temperatureK: 253.15 })).toBe('run KL-12 a at −20 °C');
    expect(runLabel({ sampleId: null, replicateLabel: 'b', temperatureK: 273.15 })).toBe('run b at 0 °C');
    expect(runLabel({ sampleId: null, replicateLabel: null, temperatureK: 298.15 })).toBe('the run at 25 °C');
  });
});
