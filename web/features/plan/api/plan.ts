import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import {
  type campaignPlanInputsSchema,
  campaignPlanSchema,
  comparisonSchema,
  type CampaignPlanInputs,
  type ComparisonCreate,
  type SpecificationInput,
} from '../../../../api/features/plan/schemas';
import { api } from '../../../lib/api-client';
import { campaignPlanQueryOptions, campaignSpecificationQueryOptions, getCampaignPlan, getCampaignSpecification, planKeys } from './stored';
import type { CampaignPlan } from './stored-check';

export type { CampaignPlan };
export type PlanResult = CampaignPlan['result'];
export type ComparisonView = z.infer<typeof comparisonSchema>;
/** What the planner form sends (defaults filled in by the server). */
export type PlanInputsBody = z.input<typeof campaignPlanInputsSchema>;
export type { CampaignPlanInputs, ComparisonCreate, SpecificationInput };

export const useCampaignSpecification = (campaignId: string) => useQuery(campaignSpecificationQueryOptions(campaignId));

export const useCampaignPlan = (campaignId: string) => useQuery(campaignPlanQueryOptions(campaignId));

/**
 * Keep the specification as the campaign's own (when it changed), then plan from the stored runs and
 * keep the plan: two writes, each with the version last read.
 */
export function useSavePlan(campaignId: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: async (v: { specification: SpecificationInput; inputs: PlanInputsBody }) => {
      const specs = await getCampaignSpecification(campaignId);
      const current = specs.campaign;
      const same =
        current &&
        current.measure === v.specification.measure &&
        current.minimum === v.specification.minimum &&
        current.probability === v.specification.probability;
      if (!same) {
        await api(`/api/v1/campaigns/${campaignId}/specification`, {
          method: 'PUT',
          body: { ...v.specification, ...(current ? { version: current.version } : {}) },
        });
      }
      const stored = await getCampaignPlan(campaignId);
      const res = await api<{ plan: unknown }>(`/api/v1/campaigns/${campaignId}/plan`, {
        method: 'PUT',
        body: { inputs: v.inputs, ...(stored ? { version: stored.version } : {}) },
      });
      return campaignPlanSchema.parse(res.plan);
    },
    onSettled: () => client.invalidateQueries({ queryKey: planKeys.campaign(campaignId) }),
  });
}

export const getComparison = (comparisonId: string) =>
  api<unknown>(`/api/v1/comparisons/${comparisonId}`).then((d) => comparisonSchema.parse(d));
export const comparisonQueryOptions = (comparisonId: string) =>
  queryOptions({ queryKey: planKeys.comparison(comparisonId), queryFn: () => getComparison(comparisonId) });
export const useComparison = (comparisonId: string) => useQuery(comparisonQueryOptions(comparisonId));

export function useCreateComparison() {
  return useMutation({
    mutationFn: (body: ComparisonCreate) =>
      api<unknown>('/api/v1/comparisons', { method: 'POST', body }).then((d) => comparisonSchema.parse(d)),
  });
}
