import type { ProblemTypeEntry } from '../api/get-openapi';

/** The registry of problem types: what each error `type` means, in the order of their status codes. */
export function ProblemTypes({ types }: { types: ProblemTypeEntry[] }) {
  return (
    <table className="w-full text-left text-sm">
      <caption className="sr-only">Problem types</caption>
      <thead className="text-xs uppercase text-ink-500">
        <tr>
          <th scope="col" className="py-1 pr-3 font-semibold">
            Status
          </th>
          <th scope="col" className="py-1 pr-3 font-semibold">
            Type and title
          </th>
          <th scope="col" className="py-1 font-semibold">
            When
          </th>
        </tr>
      </thead>
      <tbody>
        {types.map((t) => (
          <tr key={t.type} id={`problem-${t.type.split('/').pop()}`} className="border-t border-slate-100 align-top">
            <td className="py-1.5 pr-3 font-mono tnum">{t.status}</td>
            <td className="py-1.5 pr-3">
              <code className="break-all font-mono text-xs text-ink-950">{t.type}</code>
              <div className="text-ink-700">{t.title}</div>
            </td>
            <td className="py-1.5 text-ink-700">{t.description}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
