import type { OpenApiRegistrar } from '../../lib/openapi';
import { registerCompute } from '../compute/openapi';
import { registerKinetics } from '../kinetics/openapi';
import { registerCampaigns } from '../campaigns/openapi';
import { registerJobs } from '../jobs/openapi';
import { registerPlan, registerPlanStore } from '../plan/openapi';

/** Every feature that documents its routes in the OpenAPI description adds its registrar here. */
export const openApiRegistrars: OpenApiRegistrar[] = [
  registerCompute,
  registerKinetics,
  registerPlan,
  registerCampaigns,
  registerPlanStore,
  registerJobs,
];
