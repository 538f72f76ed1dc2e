import { ApiError, type Problem } from '../../../lib/api-client';

export interface UploadProgress {
  /** Bytes sent so far and in all (total 0 when the browser cannot tell). */
  loaded: number;
  total: number;
  /** 'sending' while the body goes up, 'processing' once it is all sent and the server works on it. */
  phase: 'sending' | 'processing';
  /** While a background job does the work: its stage in words and how far it got (0–100). */
  stage?: string;
  percent?: number;
}

/**
 * POST a multipart body with upload progress. fetch() reports no upload progress, so this uses
 * XMLHttpRequest's `upload.onprogress`. Rejects with ApiError on any non-2xx answer, like `api()`.
 */
export function postWithProgress<T>(
  url: string,
  body: FormData,
  options: { csrfToken?: string | null; onProgress?: (p: UploadProgress) => void; signal?: AbortSignal } = {},
): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.withCredentials = true;
    xhr.setRequestHeader('accept', 'application/json, application/problem+json');
    if (options.csrfToken) xhr.setRequestHeader('x-csrf-token', options.csrfToken);
    xhr.upload.onprogress = (e) => options.onProgress?.({ loaded: e.loaded, total: e.lengthComputable ? e.total : 0, phase: 'sending' });
    xhr.upload.onload = () => options.onProgress?.({ loaded: 1, total: 1, phase: 'processing' });
    xhr.onerror = () =>
      reject(
        new ApiError({
          type: 'network',
          title: 'No connection',
          status: 0,
          detail: 'The upload did not reach the server. Check the connection and try again.',
        }),
      );
    xhr.onabort = () => reject(new ApiError({ type: 'aborted', title: 'Cancelled', status: 0, detail: 'The upload was cancelled.' }));
    xhr.onload = () => {
      let data: unknown;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        data = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        resolve(data as T);
        return;
      }
      const p = (data && typeof data === 'object' ? data : {}) as Partial<Problem>;
      reject(
        new ApiError({
          ...p,
          type: p.type ?? 'about:blank',
          title: p.title ?? (xhr.statusText || 'Request failed'),
          status: xhr.status,
          detail: p.detail ?? `The server answered ${xhr.status}.`,
        }),
      );
    };
    options.signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    xhr.send(body);
  });
}
