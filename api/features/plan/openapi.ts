import { problemResponses, type OpenApiRegistrar } from '../../lib/openapi';
import { planRequestSchema, planResponseSchema } from './schemas';

export const registerPlan: OpenApiRegistrar = (registry) => {
  registry.registerPath({
    method: 'post',
    path: '/api/v1/plan',
    tags: ['Planning'],
    summary: 'Choose the temperature: probability of meeting a specification, operating window, recommendation',
    description:
      'Fits the screen (ln r on 1/T) and, when runs with conversion and time are given, the rate (ln(k/T) on 1/T). At every temperature of the allowed range it gives the probability that the next run meets the specification (Student t predictive distribution), the time to the target conversion and the ee after a planned hold; the window where every constraint holds; the recommended temperature by the chosen rule (root finding, not a grid); the binding constraints, and when nothing is feasible which constraints conflict and by how much. Optionally the next runs that most narrow the interval at the recommended temperature.',
    request: { body: { required: true, content: { 'application/json': { schema: planRequestSchema } } } },
    responses: {
      200: { description: 'The plan (a specification no temperature can meet is an answer, not an error)', content: { 'application/json': { schema: planResponseSchema } } },
      ...problemResponses(400, 413, 422, 429),
    },
  });
};
