import type { OpenApiRegistrar } from '../../lib/openapi';
import { registerHealth } from '../health/openapi';
import { registerDocs } from './openapi';
import { registerSession } from '../auth/openapi';
import { registerProjects } from '../projects/openapi';
import { registerInvitations } from '../invitations/openapi';
import { registerTokens } from '../tokens/openapi';
import { registerCalculators } from '../calculators/openapi';
import { registerCampaigns } from '../campaigns/openapi';
import { registerJobs } from '../jobs/openapi';
import { registerPlan, registerPlanStore } from '../plan/openapi';

/**
 * Every feature documents its routes in the OpenAPI description through a registrar listed here;
 * tests/api/openapi.test.ts fails for any /api route that none of them describes.
 */
export const openApiRegistrars: OpenApiRegistrar[] = [
  registerHealth,
  registerDocs,
  registerSession,
  registerProjects,
  registerInvitations,
  registerTokens,
  registerCalculators,
  registerPlan,
  registerCampaigns,
  registerPlanStore,
  registerJobs,
];
