import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ImportPreviewRequest, ImportRequest } from '../../../../api/features/campaigns/schemas';
import { sessionKey, type SessionInfo } from '../../../lib/session';
import { postWithProgress, type UploadProgress } from '../lib/upload';
import { campaignKeys } from './keys';
import type { ImportPreview, ImportResult } from './types';
import { isQueuedJob, pollJob, type QueuedJob } from './jobs';

type ImportPreviewBody = Omit<ImportPreviewRequest, 'parse'> & { parse?: ImportPreviewRequest['parse'] };
type ImportBody = Omit<ImportRequest, 'parse' | 'acknowledgeWarnings' | 'mapping'> & {
  mapping: ImportRequest['mapping'] | Record<string, unknown>;
  parse?: ImportRequest['parse'];
  acknowledgeWarnings?: boolean;
};

function multipart(file: File, request: unknown): FormData {
  const form = new FormData();
  form.append('request', JSON.stringify(request));
  form.append('file', file, file.name);
  return form;
}

/** The session's CSRF token from the cache (the XHR path does not go through `api()`). */
function useCsrfToken() {
  const client = useQueryClient();
  return () => client.getQueryData<SessionInfo>(sessionKey)?.csrfToken ?? null;
}

/** POST …/imports/preview: read and check the file, write nothing. */
export function usePreviewImport(campaignId: string, onProgress: (p: UploadProgress) => void) {
  const csrf = useCsrfToken();
  return useMutation({
    mutationFn: (v: { file: File; request: ImportPreviewBody; signal?: AbortSignal }) =>
      postWithProgress<ImportPreview>(`/api/v1/campaigns/${campaignId}/imports/preview`, multipart(v.file, v.request), {
        csrfToken: csrf(),
        onProgress,
        signal: v.signal,
      }),
  });
}

/**
 * POST …/imports: all rows or none; a 422 lists `issues`. A large file is answered 202 with a
 * background job, which is polled here until it ends (its failure carries the same `issues`).
 */
export function useImportFile(campaignId: string, projectId: string, onProgress: (p: UploadProgress) => void) {
  const csrf = useCsrfToken();
  const client = useQueryClient();
  return useMutation({
    mutationFn: async (v: { file: File; request: ImportBody; signal?: AbortSignal }) => {
      const answer = await postWithProgress<ImportResult | QueuedJob>(
        `/api/v1/campaigns/${campaignId}/imports`,
        multipart(v.file, v.request),
        {
          csrfToken: csrf(),
          onProgress,
          signal: v.signal,
        },
      );
      if (!isQueuedJob(answer)) return answer;
      return pollJob<ImportResult>(answer.job.id, {
        signal: v.signal,
        onProgress: (job) =>
          onProgress({ loaded: 1, total: 1, phase: 'processing', stage: job.progress.stage, percent: job.progress.percent }),
      });
    },
    onSuccess: () =>
      Promise.all([
        client.invalidateQueries({ queryKey: campaignKeys.one(campaignId) }),
        client.invalidateQueries({ queryKey: campaignKeys.project(projectId) }),
      ]),
  });
}
