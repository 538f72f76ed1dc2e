import type { z } from 'zod';
import { problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';
import { calculators } from './catalog';

const { forecast, fit, distribution, rate, erosion } = calculators;

/** POST /forecast and /fit in the API description. */
const registerSelectivity: OpenApiRegistrar = (registry) => {
  registry.registerPath({
    method: 'post',
    path: '/api/v1/forecast',
    tags: ['Selectivity'],
    summary: 'Forecast selectivity over temperature',
    description:
      'From ΔΔH‡ and ΔΔS‡, from ΔΔG‡ at one temperature, or from one observed selectivity at one temperature (ΔΔS‡ given or assumed 0, stated in assumptions). Returns r, ee, % A and ΔΔG‡ per temperature and the zero-selectivity temperature where it exists.',
    security: security.open,
    request: { body: { content: { 'application/json': { schema: forecast.request } } } },
    responses: {
      200: { description: 'The forecast', content: { 'application/json': { schema: forecast.response } } },
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
    request: { body: { content: { 'application/json': { schema: fit.request } } } },
    responses: {
      200: { description: 'The fit', content: { 'application/json': { schema: fit.response } } },
      ...problemResponses(400, 413, 422, 429),
    },
  });
};

function statelessPost(path: string, summary: string, description: string, request: z.ZodType, response: z.ZodType) {
  return {
    method: 'post' as const,
    path,
    tags: ['Kinetics'],
    summary,
    description,
    security: security.open,
    request: { body: { required: true, content: { 'application/json': { schema: request } } } },
    responses: {
      200: { description: 'The computed result.', content: { 'application/json': { schema: response } } },
      ...problemResponses(400, 413, 422, 429),
    },
  };
}

/** The three stateless kinetics endpoints in the API description. */
const registerKinetics: OpenApiRegistrar = (registry) => {
  registry.registerPath(
    statelessPost(
      '/api/v1/distribution',
      'Product distribution over competing pathways',
      'Percent of each product over temperature from 2 to 50 competing transition states (Boltzmann weighting under Curtin–Hammett conditions); with diastereomer groups also the share and ee of each group, and dr when there are exactly two.',
      distribution.request,
      distribution.response,
    ),
  );
  registry.registerPath(
    statelessPost(
      '/api/v1/rate',
      'Rate, half-life and time to a target conversion',
      'Eyring–Polanyi rate constants over temperature from a barrier, from one measured run plus an assumed ΔH‡ (with the times at ΔH‡ ± 10 kJ/mol), or from two runs at two temperatures (derived ΔH‡, ΔS‡ and Ea).',
      rate.request,
      rate.response,
    ),
  );
  registry.registerPath(
    statelessPost(
      '/api/v1/erosion',
      'Loss of ee by racemization or epimerization',
      'One-way k_e, k_rac = 2k_e, the ee half-life ln 2/(2k_e), ee after a hold and the longest hold above an ee floor over temperature, with the atropisomer stability class at 37 °C.',
      erosion.request,
      erosion.response,
    ),
  );
};

/** Every calculator endpoint in the API description. */
export const registerCalculators: OpenApiRegistrar = (registry) => {
  registerSelectivity(registry);
  registerKinetics(registry);
};
