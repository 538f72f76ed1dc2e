import { Page, Panel } from '../../components/ui/page';
import { useOpenApi } from '../../features/api-docs/api/get-openapi';
import { SchemaView } from '../../features/api-docs/components/schema-view';

const methodColour: Record<string, string> = {
  get: 'bg-slate-200 text-ink-900',
  post: 'bg-fjord-100 text-fjord-800',
  put: 'bg-amber-100 text-amber-900',
  patch: 'bg-amber-100 text-amber-900',
  delete: 'bg-rose-100 text-rose-900',
};

/** Human-readable view of /api/v1/openapi.json, generated from the server's zod schemas. */
export function ApiDocsRoute() {
  const { data, error, isPending } = useOpenApi();
  return (
    <Page
      title="API reference"
      lead={
        <>
          JSON in and out; errors are RFC 9457 problem details. The machine-readable description is at{' '}
          <a className="font-mono text-fjord-700 underline" href="/api/v1/openapi.json">
            /api/v1/openapi.json
          </a>
          .
        </>
      }
    >
      {isPending && <p className="text-sm text-ink-600">Loading the API description…</p>}
      {error && (
        <p role="alert" className="text-sm text-rose-800">
          The API description could not be loaded: {error.message}
        </p>
      )}
      {data && (
        <div className="space-y-3">
          {data.info.description && <p className="max-w-4xl text-sm text-ink-700">{data.info.description}</p>}
          {Object.entries(data.paths).flatMap(([path, ops]) =>
            Object.entries(ops).map(([method, op]) => {
              const body = op.requestBody?.content['application/json']?.schema;
              return (
                <Panel key={`${method} ${path}`}>
                  <h2 className="flex flex-wrap items-baseline gap-2">
                    <span className={`rounded px-1.5 py-0.5 font-mono text-xs uppercase ${methodColour[method] ?? 'bg-slate-100'}`}>
                      {method}
                    </span>
                    <code className="font-mono text-sm text-ink-950">{path}</code>
                    {op.summary && <span className="text-sm text-ink-700">— {op.summary}</span>}
                  </h2>
                  {op.description && <p className="mt-1 max-w-4xl text-sm text-ink-600">{op.description}</p>}
                  <div className="mt-2 grid gap-4 lg:grid-cols-2">
                    {body && (
                      <div>
                        <h3 className="text-xs font-semibold uppercase text-ink-500">Request body</h3>
                        <SchemaView schema={body} components={data.components?.schemas ?? {}} />
                      </div>
                    )}
                    <div>
                      <h3 className="text-xs font-semibold uppercase text-ink-500">Responses</h3>
                      <ul className="text-xs">
                        {Object.entries(op.responses).map(([status, r]) => (
                          <li key={status}>
                            <span className="font-mono tnum">{status}</span> {r.description}
                          </li>
                        ))}
                      </ul>
                    </div>
                  </div>
                </Panel>
              );
            }),
          )}
        </div>
      )}
    </Page>
  );
}
