/**
 * Every problem `type` the API can answer with, in one place. A type is a stable identifier: clients may
 * branch on it, so an entry is never renamed or reused for something else (add a new one instead). The
 * title is what a person reads; the type, not the title, is the contract. The list is served with the
 * OpenAPI description (`x-problem-types`) and shown on the API page.
 */
export interface ProblemTypeInfo {
  status: number;
  title: string;
  /** One sentence: when the API answers with this type. */
  description: string;
}

export const PROBLEM_TYPES = {
  'invalid-request': {
    status: 400,
    title: 'Invalid request',
    description:
      'The body, query or a path parameter failed validation, or the body is not valid JSON; errors[] names each offending field by its path in the request.',
  },
  'unreadable-file': {
    status: 400,
    title: 'Unreadable file',
    description:
      'An uploaded file cannot be read at all (empty, not a spreadsheet or CSV, broken quoting, no worksheet); nothing was imported.',
  },
  'not-signed-in': {
    status: 401,
    title: 'Not signed in',
    description: 'The call needs a signed-in session or a valid, unrevoked API token.',
  },
  'not-allowed': {
    status: 403,
    title: 'Not allowed',
    description: "The caller's role in the project does not allow this, or a browser session sent no valid CSRF token.",
  },
  'invitation-is-for-someone-else': {
    status: 403,
    title: 'Invitation is for someone else',
    description: 'The invitation was sent to another e-mail address than the signed-in account’s; `code` is "invitation-wrong-account".',
  },
  'not-found': {
    status: 404,
    title: 'Not found',
    description: 'Nothing exists at this address, or it belongs to a project the caller is not a member of.',
  },
  conflict: {
    status: 409,
    title: 'Conflict',
    description:
      'The change clashes with the current state: someone else saved first (`currentVersion` holds the version to reload), a unique value is taken, or the record is in use.',
  },
  'invitation-no-longer-valid': {
    status: 410,
    title: 'Invitation no longer valid',
    description: 'The invitation link expired, was used or was revoked; `code` says which.',
  },
  'precondition-failed': {
    status: 412,
    title: 'Precondition failed',
    description: 'The version in If-Match is not the current one; `currentVersion` holds the version to reload.',
  },
  'payload-too-large': {
    status: 413,
    title: 'Payload too large',
    description: 'The body, an uploaded file or what it unpacks to is larger, or takes longer to read, than the server accepts.',
  },
  'unsupported-media-type': {
    status: 415,
    title: 'Unsupported media type',
    description: 'The body is in a character set or content encoding the server does not read.',
  },
  'cannot-compute': {
    status: 422,
    title: 'Cannot compute',
    description:
      'The request is well formed but its values have no answer (for example 100 % ee has no finite energy gap); `code` names the reason when the science core gave one.',
  },
  'import-rejected': {
    status: 422,
    title: 'Import rejected',
    description: 'Rows of an uploaded file failed their checks; nothing was imported. `issues` lists each with its row and column.',
  },
  'warnings-need-confirmation': {
    status: 422,
    title: 'Warnings need confirmation',
    description:
      'The file is valid but has warnings (listed in `issues`) that were not acknowledged; send it again with acknowledgeWarnings to import it.',
  },
  'too-many-requests': {
    status: 429,
    title: 'Too many requests',
    description: 'The caller used up their budget of calculations, uploads or report builds for now; wait and try again.',
  },
  internal: {
    status: 500,
    title: 'Internal error',
    description: 'Something failed on the server; it was logged under the `requestId` of the answer.',
  },
  'job-failed': {
    status: 500,
    title: 'Job failed',
    description: 'A background job could not be finished after its retries (seen in a job’s `error`); start it again.',
  },
  'mail-not-sent': {
    status: 502,
    title: 'Mail not sent',
    description: 'The outgoing mail server refused or could not be reached; nothing was sent and nothing was created.',
  },
  'service-unavailable': {
    status: 503,
    title: 'Service unavailable',
    description: 'The database is not answering; try again after the seconds given in Retry-After.',
  },
} as const satisfies Record<string, ProblemTypeInfo>;

export type ProblemTypeId = keyof typeof PROBLEM_TYPES;

/** The `type` member of a problem: a relative URI under /problems/, resolved against the API's origin. */
export const problemTypeUri = (id: ProblemTypeId) => `/problems/${id}`;

export const problemTypeIds = Object.keys(PROBLEM_TYPES) as ProblemTypeId[];
