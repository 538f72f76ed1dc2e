import type { OpenApiSchema } from '../api/get-openapi';

const refName = (ref: string) => ref.split('/').pop() ?? ref;

/** A compact, readable rendering of a JSON Schema: one line per property. */
export function SchemaView({
  schema,
  components,
  depth = 0,
}: {
  schema: OpenApiSchema;
  components: Record<string, OpenApiSchema>;
  depth?: number;
}) {
  if (depth > 6) return <span className="text-ink-500">…</span>;
  if (schema.$ref) {
    const name = refName(schema.$ref);
    const target = components[name];
    return (
      <details className="inline-block align-top" open={depth < 1}>
        <summary className="cursor-pointer font-mono text-fjord-700">{name}</summary>
        {target && <SchemaView schema={target} components={components} depth={depth + 1} />}
      </details>
    );
  }
  const alternatives = schema.anyOf ?? schema.oneOf;
  if (alternatives) {
    return (
      <div className="space-y-1">
        <span className="text-xs text-ink-500">one of:</span>
        <ul className="ml-3 list-disc space-y-1">
          {alternatives.map((alt, i) => (
            <li key={i}>
              <SchemaView schema={alt} components={components} depth={depth + 1} />
            </li>
          ))}
        </ul>
      </div>
    );
  }
  if (schema.properties) {
    return (
      <table className="mt-1 text-xs">
        <tbody>
          {Object.entries(schema.properties).map(([key, prop]) => (
            <tr key={key} className="align-top">
              <td className="py-0.5 pr-3 font-mono text-ink-900">
                {key}
                {schema.required?.includes(key) ? '' : '?'}
              </td>
              <td className="py-0.5">
                <SchemaView schema={prop} components={components} depth={depth + 1} />
                {prop.description && <p className="text-ink-500">{prop.description}</p>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    );
  }
  if (schema.items) {
    return (
      <span>
        <span className="font-mono text-ink-600">array of </span>
        <SchemaView schema={schema.items} components={components} depth={depth + 1} />
      </span>
    );
  }
  if (schema.prefixItems) return <span className="font-mono text-ink-600">[{schema.prefixItems.map((s) => s.type).join(', ')}]</span>;
  if (schema.enum) return <span className="font-mono text-ink-600">{schema.enum.map((v) => JSON.stringify(v)).join(' | ')}</span>;
  if (schema.const !== undefined) return <span className="font-mono text-ink-600">{JSON.stringify(schema.const)}</span>;
  const limits = [
    schema.minimum !== undefined && `≥ ${schema.minimum}`,
    schema.exclusiveMinimum !== undefined && `> ${schema.exclusiveMinimum}`,
    schema.maximum !== undefined && `≤ ${schema.maximum}`,
    schema.exclusiveMaximum !== undefined && `< ${schema.exclusiveMaximum}`,
    schema.default !== undefined && `default ${JSON.stringify(schema.default)}`,
  ].filter(Boolean);
  return (
    <span className="font-mono text-ink-600">
      {Array.isArray(schema.type) ? schema.type.join(' | ') : (schema.type ?? 'any')}
      {limits.length > 0 && <span className="text-ink-500"> ({limits.join(', ')})</span>}
    </span>
  );
}
