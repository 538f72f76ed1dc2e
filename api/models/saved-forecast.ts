import objection from 'objection';

/** A forecast a user chose to keep: the analysis result as it was when saved, never recomputed. */
export class SavedForecast extends objection.Model {
  static override tableName = 'saved_forecasts';
  static override jsonAttributes = ['result'];

  declare id: string;
  declare campaignId: string;
  declare temperatureK: number;
  declare label: string | null;
  declare notes: string | null;
  declare result: Record<string, unknown>;
  declare createdByUserId: string | null;
  declare createdAt: Date;
}
