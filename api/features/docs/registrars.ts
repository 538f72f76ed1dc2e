import type { OpenApiRegistrar } from '../../lib/openapi';
import { registerCalculators } from '../calculators/openapi';
import { registerCampaigns } from '../campaigns/openapi';
import { registerJobs } from '../jobs/openapi';
import { registerPlan, registerPlanStore } from '../plan/openapi';

/** Every feature that documents its routes in the OpenAPI description adds its registrar here. */
export const openApiRegistrars: OpenApiRegistrar[] = [
  registerCalculators,
  registerPlan,
  registerCampaigns,
  registerPlanStore,
  registerJobs,
];
