import { Page, Panel } from '../../components/ui/page';
import { useOpenApi, type OpenApiDocument, type OpenApiOperation } from '../../features/api-docs/api/get-openapi';
import { OperationView } from '../../features/api-docs/components/operation-view';
import { ProblemTypes } from '../../features/api-docs/components/problem-types';

const METHODS = ['get', 'post', 'put', 'patch', 'delete'];

interface Entry {
  method: string;
  path: string;
  op: OpenApiOperation;
}

/** Operations grouped by their first tag, in the order the document lists them. */
function byTag(doc: OpenApiDocument): [string, Entry[]][] {
  const groups = new Map<string, Entry[]>();
  for (const [path, ops] of Object.entries(doc.paths)) {
    for (const method of METHODS) {
      const op = ops[method];
      if (!op) continue;
      const tag = op.tags?.[0] ?? 'Other';
      groups.set(tag, [...(groups.get(tag) ?? []), { method, path, op }]);
    }
  }
  return [...groups];
}

const anchor = (tag: string) => `tag-${tag.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`;

/** Human-readable view of /api/v1/openapi.json, generated from the server's zod schemas. */
export function ApiDocsRoute() {
  const { data, error, isPending } = useOpenApi();
  const components = data?.components?.schemas ?? {};
  const schemes = data?.components?.securitySchemes ?? {};
  const groups = data ? byTag(data) : [];
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
        <div className="space-y-6">
          <Panel title="Calling the API">
            {data.info.description && <p className="max-w-4xl text-sm text-ink-700">{data.info.description}</p>}
            <ul className="mt-2 max-w-4xl list-disc space-y-1 pl-5 text-sm text-ink-700">
              {Object.entries(schemes).map(([name, s]) => (
                <li key={name}>
                  <span className="font-mono text-xs text-ink-900">{name}</span>: {s.description}
                </li>
              ))}
            </ul>
            <nav aria-label="API sections" className="mt-3 text-sm">
              <ul className="flex flex-wrap gap-x-4 gap-y-1">
                {groups.map(([tag, entries]) => (
                  <li key={tag}>
                    <a className="text-fjord-700 underline" href={`#${anchor(tag)}`}>
                      {tag}
                    </a>{' '}
                    <span className="text-ink-500 tnum">({entries.length})</span>
                  </li>
                ))}
                <li>
                  <a className="text-fjord-700 underline" href="#problem-types">
                    Problem types
                  </a>
                </li>
              </ul>
            </nav>
          </Panel>
          {groups.map(([tag, entries]) => (
            <section key={tag} aria-labelledby={anchor(tag)} className="space-y-3">
              <h2 id={anchor(tag)} className="text-lg font-semibold text-ink-950">
                {tag}
              </h2>
              {entries.map(({ method, path, op }) => (
                <Panel key={`${method} ${path}`}>
                  <OperationView method={method} path={path} op={op} components={components} schemes={schemes} />
                </Panel>
              ))}
            </section>
          ))}
          <section aria-labelledby="problem-types" className="space-y-3">
            <h2 id="problem-types" className="text-lg font-semibold text-ink-950">
              Problem types
            </h2>
            <p className="max-w-4xl text-sm text-ink-700">
              Every error answer is <code className="font-mono">application/problem+json</code> with one of these types. Branch on{' '}
              <code className="font-mono">type</code>, not on the title; <code className="font-mono">errors[]</code> names each offending
              field by its path in the request.
            </p>
            <Panel>
              <ProblemTypes types={data['x-problem-types'] ?? []} />
            </Panel>
          </section>
        </div>
      )}
    </Page>
  );
}
