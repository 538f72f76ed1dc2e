/**
 * A campaign's stored specification and plan, as the campaign page opens with them. Like the
 * analysis (features/campaigns/api/analysis.ts), each request leaves at once and the module that
 * checks the answer (zod and the plan schemas) loads beside it, so this module stays free of zod
 * and the route loader sends both requests at navigation rather than once the page's code is in.
 */
import { queryOptions } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { CampaignPlan, CampaignSpecifications } from './stored-check';

/** Keys general → specific: ['plan', campaignId] covers a campaign's specification and plan. */
export const planKeys = {
  all: ['plan'] as const,
  campaign: (campaignId: string) => [...planKeys.all, campaignId] as const,
  specification: (campaignId: string) => [...planKeys.campaign(campaignId), 'specification'] as const,
  stored: (campaignId: string) => [...planKeys.campaign(campaignId), 'stored'] as const,
  comparison: (comparisonId: string) => [...planKeys.all, 'comparison', comparisonId] as const,
};

const check = () => import('./stored-check');

export const getCampaignSpecification = (campaignId: string): Promise<CampaignSpecifications> =>
  Promise.all([api<unknown>(`/api/v1/campaigns/${campaignId}/specification`), check()]).then(([answer, { checkSpecifications }]) =>
    checkSpecifications(answer),
  );
export const campaignSpecificationQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: planKeys.specification(campaignId), queryFn: () => getCampaignSpecification(campaignId) });

export const getCampaignPlan = (campaignId: string): Promise<CampaignPlan | null> =>
  Promise.all([api<{ plan: unknown }>(`/api/v1/campaigns/${campaignId}/plan`), check()]).then(([answer, { checkPlan }]) =>
    answer.plan ? checkPlan(answer.plan) : null,
  );
export const campaignPlanQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: planKeys.stored(campaignId), queryFn: () => getCampaignPlan(campaignId) });
