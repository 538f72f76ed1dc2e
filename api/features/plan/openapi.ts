import { problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';
import { z } from 'zod';
import {
  campaignPlanPutSchema,
  campaignPlanSchema,
  campaignSpecificationResponseSchema,
  comparisonCreateSchema,
  comparisonSchema,
  planRequestSchema,
  planResponseSchema,
  specificationPutSchema,
  storedSpecificationSchema,
} from './schemas';

export const registerPlan: OpenApiRegistrar = (registry) => {
  registry.registerPath({
    method: 'post',
    path: '/api/v1/plan',
    tags: ['Planning'],
    summary: 'Choose the temperature: probability of meeting a specification, operating window, recommendation',
    description:
      'Fits the screen (ln r on 1/T) and, when runs with conversion and time are given, the rate (ln(k/T) on 1/T). At every temperature of the allowed range it gives the probability that the next run meets the specification (Student t predictive distribution), the time to the target conversion and the ee after a planned hold; the window where every constraint holds; the recommended temperature by the chosen rule (root finding, not a grid); the binding constraints, and when nothing is feasible which constraints conflict and by how much. Optionally the next runs that most narrow the interval at the recommended temperature.',
    security: security.open,
    request: { body: { required: true, content: { 'application/json': { schema: planRequestSchema } } } },
    responses: {
      200: {
        description: 'The plan (a specification no temperature can meet is an answer, not an error)',
        content: { 'application/json': { schema: planResponseSchema } },
      },
      ...problemResponses(400, 413, 422, 429),
    },
  });
};

const signedIn: Record<string, string[]>[] = [{ session: [] }, { bearer: [] }];
const json = (schema: z.ZodType) => ({ content: { 'application/json': { schema } } });

/** Specifications, stored campaign plans and saved comparisons. */
export const registerPlanStore: OpenApiRegistrar = (registry) => {
  const projectParams = z.object({ projectId: z.uuid() });
  const campaignParams = z.object({ campaignId: z.uuid() });
  const specOut = z.object({ specification: storedSpecificationSchema.nullable() });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/projects/{projectId}/specification',
    tags: ['Planning'],
    summary: "The project's default specification (null when none). Needs viewer.",
    security: signedIn,
    request: { params: projectParams },
    responses: { 200: { description: 'The specification', ...json(specOut) }, ...problemResponses(401, 404) },
  });
  registry.registerPath({
    method: 'put',
    path: '/api/v1/projects/{projectId}/specification',
    tags: ['Planning'],
    summary: "Set the project's default specification (audited; send the version once one exists). Needs editor.",
    security: signedIn,
    request: { params: projectParams, body: json(specificationPutSchema) },
    responses: { 200: { description: 'The stored specification', ...json(specOut) }, ...problemResponses(400, 401, 403, 404, 409) },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/specification',
    tags: ['Planning'],
    summary: "The campaign's override, the project default and which one applies. Needs viewer.",
    security: signedIn,
    request: { params: campaignParams },
    responses: { 200: { description: 'Specifications', ...json(campaignSpecificationResponseSchema) }, ...problemResponses(401, 404) },
  });
  registry.registerPath({
    method: 'put',
    path: '/api/v1/campaigns/{campaignId}/specification',
    tags: ['Planning'],
    summary: "Override the project's specification for this campaign (audited, versioned). Needs editor.",
    security: signedIn,
    request: { params: campaignParams, body: json(specificationPutSchema) },
    responses: {
      200: { description: 'Specifications after the change', ...json(campaignSpecificationResponseSchema) },
      ...problemResponses(400, 401, 403, 404, 409),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/campaigns/{campaignId}/plan',
    tags: ['Planning'],
    summary: "The campaign's stored plan (inputs and result), null when none. Needs viewer.",
    security: signedIn,
    request: { params: campaignParams },
    responses: {
      200: { description: 'The plan', ...json(z.object({ plan: campaignPlanSchema.nullable() })) },
      ...problemResponses(401, 404),
    },
  });
  registry.registerPath({
    method: 'put',
    path: '/api/v1/campaigns/{campaignId}/plan',
    tags: ['Planning'],
    summary: 'Plan the campaign from its stored runs and keep inputs and result (audited, versioned). Needs editor.',
    description:
      "The specification defaults to the campaign's, else the project's; the rate runs default to the campaign's runs that carry conversion and time.",
    security: signedIn,
    request: { params: campaignParams, body: json(campaignPlanPutSchema) },
    responses: {
      200: { description: 'The stored plan', ...json(z.object({ plan: campaignPlanSchema })) },
      ...problemResponses(400, 401, 403, 404, 409, 422),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/comparisons',
    tags: ['Planning'],
    summary: 'Saved comparisons in every project you belong to, newest first.',
    security: signedIn,
    responses: {
      200: { description: 'Comparisons', ...json(z.object({ comparisons: z.array(comparisonSchema.omit({ result: true })) })) },
      ...problemResponses(401),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/comparisons',
    tags: ['Planning'],
    summary: 'Compare 2–6 campaigns you can read at one temperature and save it in a project (needs editor there).',
    security: signedIn,
    request: { body: json(comparisonCreateSchema) },
    responses: {
      201: { description: 'The saved comparison with its result', ...json(comparisonSchema) },
      ...problemResponses(400, 401, 403, 404),
    },
  });
  registry.registerPath({
    method: 'get',
    path: '/api/v1/comparisons/{comparisonId}',
    tags: ['Planning'],
    summary:
      "A saved comparison, recomputed from the campaigns' current runs (campaigns you cannot read are marked unavailable). Needs viewer.",
    security: signedIn,
    request: { params: z.object({ comparisonId: z.uuid() }) },
    responses: { 200: { description: 'The comparison', ...json(comparisonSchema) }, ...problemResponses(401, 404) },
  });
};
