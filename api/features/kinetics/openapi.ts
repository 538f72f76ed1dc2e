import type { z } from 'zod';
import { problemResponses, security, type OpenApiRegistrar } from '../../lib/openapi';
import {
  distributionRequestSchema,
  distributionResponseSchema,
  erosionRequestSchema,
  erosionResponseSchema,
  rateRequestSchema,
  rateResponseSchema,
} from './schemas';

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
export const registerKinetics: OpenApiRegistrar = (registry) => {
  registry.registerPath(
    statelessPost(
      '/api/v1/distribution',
      'Product distribution over competing pathways',
      'Percent of each product over temperature from 2 to 50 competing transition states (Boltzmann weighting under Curtin–Hammett conditions); with diastereomer groups also the share and ee of each group, and dr when there are exactly two.',
      distributionRequestSchema,
      distributionResponseSchema,
    ),
  );
  registry.registerPath(
    statelessPost(
      '/api/v1/rate',
      'Rate, half-life and time to a target conversion',
      'Eyring–Polanyi rate constants over temperature from a barrier, from one measured run plus an assumed ΔH‡ (with the times at ΔH‡ ± 10 kJ/mol), or from two runs at two temperatures (derived ΔH‡, ΔS‡ and Ea).',
      rateRequestSchema,
      rateResponseSchema,
    ),
  );
  registry.registerPath(
    statelessPost(
      '/api/v1/erosion',
      'Loss of ee by racemization or epimerization',
      'One-way k_e, k_rac = 2k_e, the ee half-life ln 2/(2k_e), ee after a hold and the longest hold above an ee floor over temperature, with the atropisomer stability class at 37 °C.',
      erosionRequestSchema,
      erosionResponseSchema,
    ),
  );
};
