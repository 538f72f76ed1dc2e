/**
 * The browser's check of a campaign analysis against the server's own schema. Every field of the
 * answer is checked except that, of each per-run list (points, residuals, curve, predictions), only
 * the first and last rows are: a thousand-run campaign would otherwise spend tens of milliseconds of
 * the page's first second copying rows whose type the server already states (the same zod schema
 * types it, and the API tests check its answers against that schema). What this still catches is
 * the failure a browser can meet, an answer of another shape (say, from a server of another
 * version), which shows in any row as in all.
 *
 * Loaded on demand beside the request (it carries zod and the schemas), so the request never
 * waits for it.
 */
import { analysisResponseSchema } from '../../../../api/features/campaigns/analysis-schemas';
import type { AnalysisResponse } from './types';

const ends = <T>(rows: T[]): T[] => (rows.length > 2 ? [rows[0]!, rows[rows.length - 1]!] : rows);

/** Throws zod's error when the answer is not an analysis; returns it as it came (nothing to strip or default). */
export function checkAnalysis(data: unknown): AnalysisResponse {
  const answer = data as AnalysisResponse;
  const lists = (v: unknown): v is unknown[] => Array.isArray(v);
  // The answer with each per-run list cut to its ends; a list that is not a list fails in the parse below.
  const sample =
    answer && typeof answer === 'object'
      ? {
          ...answer,
          points: lists(answer.points) ? ends(answer.points) : answer.points,
          curve: lists(answer.curve) ? ends(answer.curve) : answer.curve,
          fit:
            answer.fit && typeof answer.fit === 'object'
              ? {
                  ...answer.fit,
                  residuals: lists(answer.fit.residuals) ? ends(answer.fit.residuals) : answer.fit.residuals,
                  predictions: lists(answer.fit.predictions) ? ends(answer.fit.predictions) : answer.fit.predictions,
                }
              : answer.fit,
        }
      : data;
  analysisResponseSchema.parse(sample);
  return answer;
}
