/**
 * The service calls made from below the HTTP layer (the demo seed in api/db/). api/db and api/models import no feature
 * directly; this narrow list is the one door, so a feature may reorganise its files without touching the seed.
 */
export { computeCampaignPlan } from './features/plan/store';
export { campaignPlanInputsSchema, type CampaignPlanInputs } from './features/plan/schemas';
