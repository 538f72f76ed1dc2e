// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from '../../../web/lib/api-client';
import { isQueuedJob, pollJob } from '../../../web/features/campaigns/api/jobs';

const job = (over: Record<string, unknown>) => ({
  id: 'j1',
  kind: 'import',
  state: 'queued',
  progress: { stage: 'queued', percent: 0 },
  result: null,
  error: null,
  ...over,
});

function answering(...bodies: unknown[]) {
  const calls: string[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      calls.push(url);
      return new Response(JSON.stringify(bodies[Math.min(calls.length - 1, bodies.length - 1)]), {
        status: 200,
        headers: { 'content-type': 'application/json' },
      });
    }),
  );
  return calls;
}

afterEach(() => vi.unstubAllGlobals());

describe('polling a background job', () => {
  it('when the job goes queued → running → succeeded, then its result is returned and each state is reported', async () => {
    const calls = answering(
      job({}),
      job({ state: 'running', progress: { stage: 'saving', percent: 90 } }),
      job({ state: 'succeeded', progress: { stage: 'done', percent: 100 }, result: { inserted: 12 } }),
    );
    const seen: string[] = [];
    const result = await pollJob<{ inserted: number }>('j1', {
      intervalMs: 1,
      onProgress: (j) => seen.push(`${j.state}:${j.progress.percent}`),
    });
    expect(result).toEqual({ inserted: 12 });
    expect(seen).toEqual(['queued:0', 'running:90', 'succeeded:100']);
    expect(calls).toEqual(['/api/v1/jobs/j1', '/api/v1/jobs/j1', '/api/v1/jobs/j1']);
  });

  it('when the job fails, then it rejects with the problem details, issues included, as the direct route would', async () => {
    const problem = {
      type: '/problems/import-rejected',
      title: 'Import rejected',
      status: 422,
      detail: '2 problems found',
      issues: [{ severity: 'error', row: 3, column: 'B', message: 'not a number' }],
    };
    answering(job({ state: 'failed', error: problem }));
    const err = await pollJob('j1', { intervalMs: 1 }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect((err as ApiError).status).toBe(422);
    expect((err as ApiError).problem.issues).toEqual(problem.issues);
  });

  it('when the answer is a 202 body, then it is recognised as a queued job; a 201 result is not', () => {
    expect(isQueuedJob({ job: job({}) })).toBe(true);
    expect(isQueuedJob({ campaignId: 'c', inserted: 3 })).toBe(false);
  });
});
