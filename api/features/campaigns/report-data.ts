/** What the campaign's exports read from the database about the campaign itself, in one place. */
import type { Knex } from 'knex';
import { SavedForecast } from '../../models/saved-forecast';
import { computeAnalysis, loadCampaignData } from './analysis';
import { forecastViews } from './analysis-forecasts';
import { signOffOf } from './service';

/** Everything the spreadsheet report needs, read in one place. */
export async function loadReportData(db: Knex, projectId: string, campaignId: string) {
  const { campaign, measurements } = await loadCampaignData(db, projectId, campaignId);
  const analysis = computeAnalysis(campaign, measurements, { weighting: 'none', uncertaintyScale: 'absolute', confidence: 0.95 });
  const forecasts = await SavedForecast.query(db).where({ campaignId }).orderBy('createdAt', 'desc').orderBy('id');
  const views = await forecastViews(db, campaign, forecasts, measurements);
  // Who signed the campaign off and when (null while open), for the report's summary.
  const signOff = await signOffOf(db, campaign);
  return { campaign, measurements, analysis, forecasts: views, signOff };
}
