/**
 * The stateless calculators: each one's request and response schemas and its computation, in one
 * table that the routes and the API description both read.
 */
import type { z } from 'zod';
import { computeDistribution } from './distribution';
import { computeErosion } from './erosion';
import { runFit } from './fit';
import { runForecast } from './forecast';
import {
  distributionRequestSchema,
  distributionResponseSchema,
  erosionRequestSchema,
  erosionResponseSchema,
  rateRequestSchema,
  rateResponseSchema,
} from './kinetics-schemas';
import { computeRate } from './rate';
import { fitRequestSchema, fitResponseSchema, forecastRequestSchema, forecastResponseSchema } from './schemas';

export interface Calculator<Req extends z.ZodType, Res extends z.ZodType> {
  request: Req;
  response: Res;
  run(input: z.output<Req>): z.output<Res>;
}

const calculator = <Req extends z.ZodType, Res extends z.ZodType>(c: Calculator<Req, Res>) => c;

export const calculators = {
  forecast: calculator({ request: forecastRequestSchema, response: forecastResponseSchema, run: runForecast }),
  fit: calculator({ request: fitRequestSchema, response: fitResponseSchema, run: runFit }),
  distribution: calculator({ request: distributionRequestSchema, response: distributionResponseSchema, run: computeDistribution }),
  rate: calculator({ request: rateRequestSchema, response: rateResponseSchema, run: computeRate }),
  erosion: calculator({ request: erosionRequestSchema, response: erosionResponseSchema, run: computeErosion }),
};
