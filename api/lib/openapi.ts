import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { PROBLEM_TYPES, problemTypeIds, problemTypeUri } from './problem-types';

/**
 * The API description is generated from the same zod schemas that validate
 * requests; features add their paths through `register` functions.
 */
export type OpenApiRegistrar = (registry: OpenAPIRegistry) => void;

type SecurityRequirement = Record<string, string[]>;

/**
 * Who may call an operation. A browser session (cookie) or a personal API token (bearer); a write made with
 * the cookie also needs the CSRF token from GET /api/v1/session in `x-csrf-token` (added to the document for
 * every unsafe method, see `withCsrfOnWrites`).
 */
export const security = {
  /** Anyone: no credentials needed (a token, when sent, must be valid). */
  open: [{}] as SecurityRequirement[],
  signedIn: [{ session: [] }, { bearer: [] }] as SecurityRequirement[],
  /** Only from a signed-in browser: managing tokens cannot be done with a token. */
  sessionOnly: [{ session: [] }] as SecurityRequirement[],
};

const fieldErrorSchema = z
  .object({
    path: z.string().meta({
      description:
        'Where in the request: a dotted path into the JSON body ("measurements.3.temperature.value"), a query or path parameter name, a multipart field ("file", "request.mapping"), a header ("If-Match"), or "(body)" for the body as a whole.',
    }),
    message: z.string(),
  })
  .meta({ id: 'FieldError' });

const importIssueSchema = z
  .object({
    severity: z.enum(['error', 'warning']),
    row: z
      .number()
      .int()
      .nullable()
      .meta({ description: '1-based row of the file as a spreadsheet program shows it; null for the whole file' }),
    column: z.string().nullable().meta({ description: 'Column letter and header, e.g. `B "ee (%)"`; null for a whole row or the file' }),
    message: z.string(),
  })
  .meta({ id: 'ImportIssue' });

export const problemSchema = z
  .object({
    type: z.enum(problemTypeIds.map(problemTypeUri) as [string, ...string[]]).meta({
      description: 'Stable identifier of the kind of problem (see x-problem-types); branch on this, not on the title.',
    }),
    title: z.string().meta({ description: 'Short, fixed wording of the type, for people.' }),
    status: z.number().int(),
    detail: z.string().meta({ description: 'What went wrong in this request, in a sentence for people.' }),
    instance: z.string().optional().meta({ description: 'The path that was called.' }),
    requestId: z.string().optional().meta({ description: 'Quote it when reporting a problem: the server logged the request under it.' }),
    errors: z.array(fieldErrorSchema).optional().meta({ description: 'One entry per offending field of the request.' }),
    code: z
      .string()
      .optional()
      .meta({ description: 'Machine-readable reason within the type (cannot-compute, invitation problems), e.g. "invitation-expired".' }),
    currentVersion: z
      .number()
      .int()
      .optional()
      .meta({ description: 'On a stale version (409 conflict, 412): the version stored now, to reload and retry from.' }),
    issues: z
      .array(importIssueSchema)
      .optional()
      .meta({ description: 'import-rejected, warnings-need-confirmation: every issue found in the file, with its row and column.' }),
    acknowledgeWarnings: z.boolean().optional().meta({ description: 'warnings-need-confirmation: send true to import despite them.' }),
  })
  .meta({ id: 'Problem', description: 'RFC 9457 problem details; errors[] names each offending field by its path in the request.' });

const problemText: Record<number, string> = {
  400: 'The request failed validation (errors[] names each field).',
  401: 'Not signed in.',
  403: 'Your role does not allow this.',
  404: 'Not found (or not visible to you).',
  409: 'Conflict with the current state.',
  410: 'Gone: the link expired, was used or was revoked.',
  412: 'The version in If-Match is not the current one.',
  413: 'The body is larger than the server accepts.',
  415: 'The body is in an encoding the server does not read.',
  422: 'Valid shape, but the values cannot be computed (e.g. 100 % ee has no finite energy gap).',
  429: 'Rate limit reached.',
  502: 'The mail server did not take the message.',
  503: 'The database is not answering; retry after Retry-After seconds.',
};

export function problemResponses(...statuses: number[]) {
  return Object.fromEntries(
    statuses.map((s) => [
      s,
      { description: problemText[s] ?? 'Error', content: { 'application/problem+json': { schema: problemSchema } } },
    ]),
  );
}

/** Path parameters are ids of stored things (uuid), except where a route says otherwise. */
export const idParams = <K extends string>(...names: K[]) =>
  z.object(Object.fromEntries(names.map((n) => [n, z.string().uuid()])) as Record<K, z.ZodString>);

const UNSAFE = new Set(['post', 'put', 'patch', 'delete']);
const METHODS = ['get', 'put', 'post', 'delete', 'options', 'head', 'patch', 'trace'];

interface Operation {
  operationId?: string;
  security?: SecurityRequirement[];
}

/** "post /api/v1/campaigns/{campaignId}/sign-off" → "postCampaignsByCampaignIdSignOff": stable while the URL is. */
export function operationIdFor(method: string, path: string): string {
  const words = path
    .replace(/^\/api(\/v1)?/, '')
    .split('/')
    .filter(Boolean)
    .flatMap((seg) => {
      const param = /^\{(\w+)\}$/.exec(seg);
      return param ? ['by', param[1]] : seg.split(/[^A-Za-z0-9]+/);
    })
    .filter(Boolean);
  return method + words.map((w) => w[0].toUpperCase() + w.slice(1)).join('');
}

/**
 * Fill in what every operation states the same way: an operationId from its method and path when the
 * registrar gave none, and the CSRF header beside the session cookie on every unsafe method.
 */
function completeOperations(paths: Record<string, Record<string, unknown>>) {
  for (const [path, item] of Object.entries(paths)) {
    for (const method of METHODS) {
      const op = item[method] as Operation | undefined;
      if (!op) continue;
      op.operationId ??= operationIdFor(method, path);
      if (UNSAFE.has(method) && op.security)
        op.security = op.security.map((req) => ('session' in req && !('csrf' in req) ? { ...req, csrf: [] } : req));
    }
  }
}

export function buildOpenApiDocument(registrars: OpenApiRegistrar[], version: string) {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', {
    type: 'apiKey',
    in: 'cookie',
    name: 'eyrie.sid',
    description: 'The browser session set by signing in (GitHub or, in development, the local demo provider).',
  });
  registry.registerComponent('securitySchemes', 'csrf', {
    type: 'apiKey',
    in: 'header',
    name: 'x-csrf-token',
    description: 'With a session cookie, every write sends the csrfToken that GET /api/v1/session returns.',
  });
  registry.registerComponent('securitySchemes', 'bearer', {
    type: 'http',
    scheme: 'bearer',
    description: 'A personal API token (Settings → API tokens): `Authorization: Bearer <token>`. No CSRF token needed.',
  });
  for (const register of registrars) register(registry);
  const document = new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Eyrie API',
      version,
      description:
        'Temperature, selectivity and rate computations for stereoselective reactions. Sign convention: ΔΔX‡ = X‡(TS→B) − X‡(TS→A); r = [A]/[B]; positive values favour A. Quantities travel as { value, unit }. Every error is an RFC 9457 problem (application/problem+json) whose `type` is one of x-problem-types.',
      license: { name: 'Proprietary', identifier: 'LicenseRef-Proprietary' },
    },
    servers: [{ url: '/' }],
  });
  completeOperations(document.paths as Record<string, Record<string, unknown>>);
  return {
    ...document,
    'x-problem-types': problemTypeIds.map((id) => ({ type: problemTypeUri(id), ...PROBLEM_TYPES[id] })),
  };
}
