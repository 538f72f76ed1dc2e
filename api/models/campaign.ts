import objection from 'objection';
import type { SelectivityMeasure } from '../science/quantities';
import type { AssayMethod, CampaignStatus } from './enums';

/** A temperature screen of one reaction: the measurements fitted together in one Eyring analysis. */
export class Campaign extends objection.Model {
  static override tableName = 'campaigns';

  declare id: string;
  declare projectId: string;
  declare title: string;
  declare reactionDescription: string | null;
  declare productNameA: string;
  declare productNameB: string;
  declare measure: SelectivityMeasure;
  declare assayMethod: AssayMethod;
  declare defaultUncertainty: number | null;
  /** SD of the assay for the next run, in the measure's units; null → median of the runs'. */
  declare newRunUncertainty: number | null;
  /** Quantitation limit in the measure's terms (ee %, % A/er major share %, dr/ratio r); null → 99.8 % ee. */
  declare quantitationLimit: number | null;
  declare status: CampaignStatus;
  declare notes: string | null;
  declare version: number;
  declare createdByUserId: string | null;
  /** Set while the campaign is signed off: its measurements are locked. */
  declare signedOffAt: Date | null;
  declare signedOffByUserId: string | null;
  declare signOffNote: string | null;
  declare createdAt: Date;
  declare updatedAt: Date;
}
