/**
 * Query keys of the campaign feature, general → specific, so a prefix refreshes a family:
 * ['campaigns', id] covers a campaign with its measurements, analysis and forecasts;
 * ['campaigns', 'project', projectId] covers a project's list and comparison.
 */
export const campaignKeys = {
  all: ['campaigns'] as const,
  project: (projectId: string) => [...campaignKeys.all, 'project', projectId] as const,
  list: (projectId: string) => [...campaignKeys.project(projectId), 'list'] as const,
  comparison: (projectId: string, atCelsius: number) => [...campaignKeys.project(projectId), 'comparison', atCelsius] as const,
  one: (campaignId: string) => [...campaignKeys.all, campaignId] as const,
  detail: (campaignId: string) => [...campaignKeys.one(campaignId), 'detail'] as const,
  measurements: (campaignId: string) => [...campaignKeys.one(campaignId), 'measurements'] as const,
  analysis: (campaignId: string, params: AnalysisParams) => [...campaignKeys.one(campaignId), 'analysis', params] as const,
  forecasts: (campaignId: string) => [...campaignKeys.one(campaignId), 'forecasts'] as const,
};

export interface AnalysisParams {
  weighting: 'none' | 'uncertainty';
  /** °C, or null for no extra temperature. */
  atCelsius: number | null;
}
