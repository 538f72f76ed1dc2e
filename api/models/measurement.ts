import objection from 'objection';
import type { SelectivityMeasure } from '../science/quantities';

/** One selectivity result at one temperature. Temperatures are stored in kelvin. */
export class Measurement extends objection.Model {
  static override tableName = 'measurements';

  declare id: string;
  declare campaignId: string;
  declare temperatureK: number;
  declare measure: SelectivityMeasure;
  /** The reported number; with `valueB` set, the pair value:valueB. */
  declare value: number;
  declare valueB: number | null;
  declare isLowerBound: boolean;
  declare uncertainty: number | null;
  declare replicateLabel: string | null;
  declare sampleId: string | null;
  declare conversionPercent: number | null;
  declare reactionTimeS: number | null;
  declare excluded: boolean;
  declare excludedReason: string | null;
  declare notes: string | null;
  declare sourceRow: number | null;
  /** The kept upload this row came from (with `sourceRow`, its row there); null when typed in. */
  declare importFileId: string | null;
  declare version: number;
  declare createdByUserId: string | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}
