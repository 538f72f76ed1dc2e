import type { OpenApiOperation, OpenApiSchema, OpenApiSecurityScheme } from '../api/get-openapi';
import { SchemaView } from './schema-view';

const methodColour: Record<string, string> = {
  get: 'bg-slate-200 text-ink-900',
  post: 'bg-fjord-100 text-fjord-800',
  put: 'bg-amber-100 text-amber-900',
  patch: 'bg-amber-100 text-amber-900',
  delete: 'bg-rose-100 text-rose-900',
};

const schemeWords = (name: string, scheme: OpenApiSecurityScheme | undefined) => {
  if (!scheme) return name;
  if (scheme.type === 'http' && scheme.scheme === 'bearer') return 'API token (Authorization: Bearer)';
  if (scheme.in === 'cookie') return 'browser session';
  if (scheme.in === 'header') return `${scheme.name} header`;
  return name;
};

/** "Who may call" in words: each alternative, with the schemes it needs together. */
export function securityText(security: OpenApiOperation['security'], schemes: Record<string, OpenApiSecurityScheme>): string {
  if (!security || security.length === 0) return 'not stated';
  if (security.every((req) => Object.keys(req).length === 0)) return 'anyone, no sign-in needed';
  return security
    .map((req) =>
      Object.keys(req).length === 0
        ? 'no credentials'
        : Object.keys(req)
            .map((name) => schemeWords(name, schemes[name]))
            .join(' + '),
    )
    .join(', or ');
}

function BodyView({
  content,
  components,
}: {
  content: Record<string, { schema: OpenApiSchema }>;
  components: Record<string, OpenApiSchema>;
}) {
  return (
    <>
      {Object.entries(content).map(([mediaType, { schema }]) => (
        <div key={mediaType} className="mt-1">
          <span className="font-mono text-xs text-ink-500">{mediaType}</span>
          <SchemaView schema={schema} components={components} />
        </div>
      ))}
    </>
  );
}

/** One operation: what it does, who may call it, its parameters, body and answers. */
export function OperationView({
  method,
  path,
  op,
  components,
  schemes,
}: {
  method: string;
  path: string;
  op: OpenApiOperation;
  components: Record<string, OpenApiSchema>;
  schemes: Record<string, OpenApiSecurityScheme>;
}) {
  const params = op.parameters ?? [];
  return (
    <>
      <h3 className="flex flex-wrap items-baseline gap-x-2 gap-y-1">
        <span className={`rounded px-1.5 py-0.5 font-mono text-xs uppercase ${methodColour[method] ?? 'bg-slate-100'}`}>{method}</span>
        <code className="break-all font-mono text-sm text-ink-950">{path}</code>
        {op.summary && <span className="text-sm text-ink-700">— {op.summary}</span>}
      </h3>
      <dl className="mt-1 flex flex-wrap gap-x-4 gap-y-0.5 text-xs text-ink-600">
        <div>
          <dt className="inline">Operation: </dt>
          <dd className="inline font-mono">{op.operationId}</dd>
        </div>
        <div>
          <dt className="inline">Who may call: </dt>
          <dd className="inline">{securityText(op.security, schemes)}</dd>
        </div>
      </dl>
      {op.description && <p className="mt-1 max-w-4xl text-sm text-ink-600">{op.description}</p>}
      <div className="mt-2 grid gap-4 lg:grid-cols-2">
        <div className="min-w-0 space-y-2">
          {params.length > 0 && (
            <div>
              <h4 className="text-xs font-semibold uppercase text-ink-500">Parameters</h4>
              <table className="mt-1 text-xs">
                <tbody>
                  {params.map((p) => (
                    <tr key={`${p.in} ${p.name}`} className="align-top">
                      <td className="py-0.5 pr-3 font-mono text-ink-900">
                        {p.name}
                        {p.required ? '' : '?'}
                      </td>
                      <td className="py-0.5 pr-3 text-ink-500">{p.in}</td>
                      <td className="py-0.5">
                        {p.schema && <SchemaView schema={p.schema} components={components} depth={1} />}
                        {p.description && <p className="text-ink-500">{p.description}</p>}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {op.requestBody && (
            <div>
              <h4 className="text-xs font-semibold uppercase text-ink-500">Request body</h4>
              <BodyView content={op.requestBody.content} components={components} />
            </div>
          )}
        </div>
        <div className="min-w-0">
          <h4 className="text-xs font-semibold uppercase text-ink-500">Responses</h4>
          <ul className="space-y-1 text-xs">
            {Object.entries(op.responses).map(([status, r]) => {
              const isProblem = Number(status) >= 400;
              const content = !isProblem && r.content ? r.content : null;
              return (
                <li key={status}>
                  <span className="font-mono tnum">{status}</span> {r.description}
                  {isProblem && (
                    <>
                      {' '}
                      <a className="text-fjord-700 underline" href="#problem-types">
                        (problem)
                      </a>
                    </>
                  )}
                  {content && (
                    <details className="ml-4">
                      <summary className="cursor-pointer text-fjord-700">Body</summary>
                      <BodyView content={content} components={components} />
                    </details>
                  )}
                </li>
              );
            })}
          </ul>
        </div>
      </div>
    </>
  );
}
