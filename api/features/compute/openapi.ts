import type { OpenApiRegistrar } from '../../lib/openapi';
import { problemResponses, security } from '../../lib/openapi';
import { fitRequestSchema, fitResponseSchema, forecastRequestSchema, forecastResponseSchema } from './schemas';

export const registerCompute: OpenApiRegistrar = (registry) => {
  registry.registerPath({
    method: 'post',
    path: '/api/v1/forecast',
    tags: ['Selectivity'],
    summary: 'Forecast selectivity over temperature',
    description:
      'From ΔΔH‡ and ΔΔS‡, from ΔΔG‡ at one temperature, or from one observed selectivity at one temperature (ΔΔS‡ given or assumed 0, stated in assumptions). Returns r, ee, % A and ΔΔG‡ per temperature and the zero-selectivity temperature where it exists.',
    security: security.open,
    request: { body: { content: { 'application/json': { schema: forecastRequestSchema } } } },
    responses: {
      200: { description: 'The forecast', content: { 'application/json': { schema: forecastResponseSchema } } },
      ...problemResponses(400, 413, 422, 429),
    },
  });
  registry.registerPath({
    method: 'post',
    path: '/api/v1/fit',
    tags: ['Selectivity'],
    summary: 'Fit a temperature screen (differential Eyring analysis)',
    description:
      'Regresses ln r on 1/T (OLS, or WLS with weights from the assay uncertainty), keeps the covariance of slope and intercept, and returns ΔΔH‡ and ΔΔS‡ with SE and CI, residual diagnostics, censored (≥ 99.8 % ee) points as bounds, a curvature check (continuous two-branch model with the break as a parameter, simulated sup-F test, isoinversion only for branch slopes of opposite sign), and predictions — from the branches when a break is accepted — with the confidence interval of the mean line and the prediction interval for a new run.',
    security: security.open,
    request: { body: { content: { 'application/json': { schema: fitRequestSchema } } } },
    responses: {
      200: { description: 'The fit', content: { 'application/json': { schema: fitResponseSchema } } },
      ...problemResponses(400, 413, 422, 429),
    },
  });
};
