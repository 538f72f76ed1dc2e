import { Button } from '../../../components/ui/form';
import { useHistory, type AuditEvent } from '../api/history';

const timeFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'medium', timeZone: 'UTC' });
const actionMark: Record<AuditEvent['action'], string> = { create: '+', update: '~', delete: '×' };
const entityWords: Record<string, string> = { project: 'Project', project_member: 'Member', invitation: 'Invitation' };

const show = (v: unknown) => (v === null || v === undefined ? '—' : v === '' ? '(empty)' : typeof v === 'object' ? JSON.stringify(v) : String(v));

/** Only the fields that changed, as before → after. */
function Changes({ before, after }: { before: unknown; after: unknown }) {
  const b = (before ?? {}) as Record<string, unknown>;
  const a = (after ?? {}) as Record<string, unknown>;
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])].filter((k) => JSON.stringify(b[k]) !== JSON.stringify(a[k]));
  if (!keys.length) return <span className="text-ink-500">no field changed</span>;
  return (
    <dl className="grid grid-cols-[max-content_1fr] gap-x-3 gap-y-0.5">
      {keys.map((k) => (
        <div key={k} className="contents">
          <dt className="font-mono text-xs text-ink-500">{k}</dt>
          <dd className="break-all font-mono text-xs">
            {before !== null && <span className="text-rose-800 line-through decoration-rose-400">{show(b[k])}</span>}
            {before !== null && after !== null && <span aria-label="changed to"> → </span>}
            {after !== null && <span className="text-ink-950">{show(a[k])}</span>}
          </dd>
        </div>
      ))}
    </dl>
  );
}

export function HistoryView({ projectId }: { projectId: string }) {
  const history = useHistory(projectId);
  if (history.isPending) return <p className="text-sm text-ink-500">Loading history…</p>;
  if (history.isError) return <p role="alert" className="text-sm text-rose-700">{history.error.message}</p>;
  const events = history.data.pages.flatMap((p) => p.events);
  if (!events.length) return <p className="text-sm text-ink-600">Nothing has been recorded yet.</p>;
  return (
    <>
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Changes to this project, newest first</caption>
        <thead className="border-b border-slate-200 text-xs uppercase tracking-wide text-ink-500">
          <tr>
            <th scope="col" className="py-2 pr-3 font-semibold">When (UTC)</th>
            <th scope="col" className="py-2 pr-3 font-semibold">Who</th>
            <th scope="col" className="py-2 pr-3 font-semibold">What</th>
            <th scope="col" className="py-2 font-semibold">Change</th>
          </tr>
        </thead>
        <tbody>
          {events.map((e) => (
            <tr key={e.id} className="border-b border-slate-100 align-top">
              <td className="tnum whitespace-nowrap py-2 pr-3 text-ink-600">{timeFormat.format(new Date(e.at))}</td>
              <td className="py-2 pr-3">{e.actor ? e.actor.displayName ?? e.actor.login : <span className="text-ink-500">a removed account</span>}</td>
              <td className="whitespace-nowrap py-2 pr-3">
                <span aria-hidden="true" className="mr-1 font-mono">{actionMark[e.action]}</span>
                {entityWords[e.entityType] ?? e.entityType} {e.action === 'create' ? 'created' : e.action === 'update' ? 'changed' : 'deleted'}
                <span className="block font-mono text-xs text-ink-500" title={e.entityId}>{e.entityId.slice(0, 8)}</span>
              </td>
              <td className="py-2"><Changes before={e.before} after={e.after} /></td>
            </tr>
          ))}
        </tbody>
      </table>
      {history.hasNextPage && (
        <Button className="mt-3" onClick={() => history.fetchNextPage()} disabled={history.isFetchingNextPage}>
          Show older changes
        </Button>
      )}
    </>
  );
}
