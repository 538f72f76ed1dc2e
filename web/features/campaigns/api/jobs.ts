import { api, ApiError, type Problem } from '../../../lib/api-client';
import type { JobView } from '../../../../api/features/jobs/routes';

export type { JobView };

/** What a large upload answers instead of its result: 202 with the job that does the work. */
export interface QueuedJob {
  job: JobView;
}

export const isQueuedJob = (body: unknown): body is QueuedJob =>
  typeof body === 'object' && body !== null && 'job' in body && typeof (body as QueuedJob).job?.id === 'string';

const wait = (ms: number, signal?: AbortSignal) =>
  new Promise<void>((resolve, reject) => {
    const timer = setTimeout(resolve, ms);
    signal?.addEventListener(
      'abort',
      () => {
        clearTimeout(timer);
        reject(
          new ApiError({
            type: 'aborted',
            title: 'Cancelled',
            status: 0,
            detail: 'Stopped waiting for the job; it carries on on the server.',
          }),
        );
      },
      { once: true },
    );
  });

/**
 * Poll GET /api/v1/jobs/:id until the job has ended. Resolves with its result; a failed job
 * rejects with the problem details the direct route would have answered (same `issues`).
 */
export async function pollJob<T>(
  id: string,
  options: { onProgress?: (job: JobView) => void; signal?: AbortSignal; intervalMs?: number } = {},
): Promise<T> {
  let delay = options.intervalMs ?? 400;
  for (;;) {
    const job = await api<JobView>(`/api/v1/jobs/${id}`, { signal: options.signal });
    options.onProgress?.(job);
    if (job.state === 'succeeded') return job.result as T;
    if (job.state === 'failed')
      throw new ApiError((job.error ?? { type: 'about:blank', title: 'Job failed', status: 500, detail: 'The job failed.' }) as Problem);
    await wait(delay, options.signal);
    delay = Math.min(delay * 1.5, 3000);
  }
}
