/** One fetch wrapper for the whole app: JSON in and out, problem details become typed errors. */
import type { ProblemTypeId } from '../../api/lib/problem-types';

export interface FieldError {
  path: string;
  message: string;
}

/** Where in an uploaded file an import problem is (`issues` of import-rejected and warnings-need-confirmation). */
export interface ProblemImportIssue {
  severity: 'error' | 'warning';
  row: number | null;
  column: string | null;
  message: string;
}

/**
 * RFC 9457 problem details as the API sends them (the Problem schema of /api/v1/openapi.json). `type` is one of
 * the server's registered types (`/problems/<id>`); "network", "aborted" or "about:blank" when none came back.
 */
export interface Problem {
  type: `/problems/${ProblemTypeId}` | 'network' | 'aborted' | 'about:blank';
  title: string;
  status: number;
  detail: string;
  instance?: string;
  requestId?: string;
  /** Each offending field, by its path in the request. */
  errors?: FieldError[];
  /** The reason within the type (cannot-compute, invitation problems), e.g. "invitation-expired". */
  code?: string;
  /** On a stale version (409, 412): the version stored now. */
  currentVersion?: number;
  /** Every issue found in an uploaded file, with its row and column. */
  issues?: ProblemImportIssue[];
  acknowledgeWarnings?: boolean;
  [key: string]: unknown;
}

export class ApiError extends Error {
  readonly status: number;
  readonly problem: Problem;
  constructor(problem: Problem) {
    super(problem.detail || problem.title);
    this.name = 'ApiError';
    this.status = problem.status;
    this.problem = problem;
  }
  get fieldErrors(): FieldError[] {
    return this.problem.errors ?? [];
  }
  /** Errors for one field path (exact, or nested below it). */
  errorsFor(path: string): string[] {
    return this.fieldErrors.filter((e) => e.path === path || e.path.startsWith(`${path}.`)).map((e) => e.message);
  }
}

let csrfToken: string | null = null;
export function setCsrfToken(token: string | null) {
  csrfToken = token;
}

export interface RequestOptions extends Omit<RequestInit, 'body'> {
  body?: unknown;
}

export async function api<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const headers = new Headers(options.headers);
  headers.set('accept', 'application/json, application/problem+json');
  let body: BodyInit | undefined;
  if (options.body instanceof FormData) {
    body = options.body;
  } else if (options.body !== undefined) {
    headers.set('content-type', 'application/json');
    body = JSON.stringify(options.body);
  }
  const method = (options.method ?? 'GET').toUpperCase();
  if (csrfToken && !['GET', 'HEAD', 'OPTIONS'].includes(method)) headers.set('x-csrf-token', csrfToken);
  let res: Response;
  try {
    res = await fetch(path, { ...options, method, headers, body, credentials: 'same-origin' });
  } catch {
    throw new ApiError({
      type: 'network',
      title: 'No connection',
      status: 0,
      detail: 'The server could not be reached. Check that Eyrie is running.',
    });
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  let data: unknown = undefined;
  try {
    data = text ? JSON.parse(text) : undefined;
  } catch {
    data = undefined;
  }
  if (!res.ok) {
    const p = (data && typeof data === 'object' ? data : {}) as Partial<Problem>;
    throw new ApiError({
      ...p,
      type: p.type ?? 'about:blank',
      title: p.title ?? res.statusText ?? 'Request failed',
      status: res.status,
      detail: p.detail ?? `The server answered ${res.status}.`,
    });
  }
  return data as T;
}
