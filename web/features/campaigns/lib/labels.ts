import type { AssayMethod, CampaignStatus, SelectivityMeasure } from '../../../../api/features/campaigns/schemas';

export const MEASURE_LABEL: Record<SelectivityMeasure, string> = {
  ee: 'ee (%)',
  percentA: '% A',
  er: 'er (A:B)',
  dr: 'dr (A:B)',
  ratio: 'r = A/B',
};

/** The unit an uncertainty is given in, per measure (as the engine reads it). */
export function uncertaintyUnit(measure: SelectivityMeasure): string {
  switch (measure) {
    case 'ee':
      return '(% ee)';
    case 'percentA':
    case 'er':
      return '(% A)';
    default:
      return '(relative)';
  }
}

export const ASSAY_LABEL: Record<AssayMethod, string> = {
  'chiral-hplc': 'chiral HPLC',
  'chiral-sfc': 'chiral SFC',
  'chiral-gc': 'chiral GC',
  nmr: 'NMR',
  other: 'other',
};

/** Status as a word with a shape, never colour alone. */
export const STATUS_MARK: Record<CampaignStatus, string> = { planned: '◌', active: '●', completed: '✓', archived: '▪' };

/** Kelvin at 0 °C, from the shared quantities module. */
export { CELSIUS_OFFSET_K as CELSIUS } from '../../../../api/science/quantities';
