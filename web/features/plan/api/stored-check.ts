/** The browser's check of a stored specification or plan against the server's own schemas (loaded beside the request, see stored.ts). */
import type { z } from 'zod';
import { campaignPlanSchema, campaignSpecificationResponseSchema } from '../../../../api/features/plan/schemas';

export type CampaignPlan = z.infer<typeof campaignPlanSchema>;
export type CampaignSpecifications = z.infer<typeof campaignSpecificationResponseSchema>;

export const checkSpecifications = (data: unknown): CampaignSpecifications => campaignSpecificationResponseSchema.parse(data);
export const checkPlan = (data: unknown): CampaignPlan => campaignPlanSchema.parse(data);
