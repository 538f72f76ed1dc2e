/**
 * An invented temperature screen for trying the fit: Kestrelmoor Laboratories' (invented)
 * allylation of KL-207, ee of (S)-KL-208 by chiral HPLC. Not real data.
 */
export const exampleScreen = {
  unit: 'C' as const,
  measure: 'ee' as const,
  proposedTemperature: '-50',
  text: [
    '# Invented example: Kestrelmoor Laboratories, KL-207 allylation (not real data)',
    '# °C, ee %, SD of ee (percentage points)',
    '-78, 98.9, 0.2',
    '-60, 98.2, 0.2',
    '-40, 96.9, 0.3',
    '-20, 95.6, 0.3',
    '0, 93.7, 0.4',
    '25, 91.3, 0.4',
  ].join('\n'),
};
