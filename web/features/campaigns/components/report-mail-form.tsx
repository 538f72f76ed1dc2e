import { useState } from 'react';
import { Button, FormAlert } from '../../../components/ui/form';
import { ApiError } from '../../../lib/api-client';
import { useMembers } from '../../../lib/members';
import { useSendReport } from '../api/report';

/** Send the workbook and the summary PDF to chosen members of the project (any member may send). */
export function ReportMailForm({ campaignId, projectId }: { campaignId: string; projectId: string }) {
  const members = useMembers(projectId);
  const send = useSendReport(campaignId);
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const [message, setMessage] = useState('');
  const reachable = (members.data?.members ?? []).filter((m) => m.email);
  const toggle = (id: string) =>
    setChosen((prev) => {
      const next = new Set(prev);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  const error =
    send.error instanceof ApiError ? [send.error.message, ...send.error.fieldErrors.map((e) => e.message)].join(' ') : send.error?.message;

  if (members.isPending) return <p className="text-sm text-ink-500">Loading members…</p>;
  if (members.isError) return <FormAlert>{members.error.message}</FormAlert>;
  return (
    <form
      className="flex flex-col gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        send.mutate({ recipients: [...chosen], ...(message.trim() ? { message: message.trim() } : {}) });
      }}
    >
      <fieldset>
        <legend className="mb-1 text-sm font-medium text-ink-800">Send the workbook and the summary PDF to</legend>
        {reachable.length === 0 && <p className="text-sm text-ink-600">No member of this project has an e-mail address on file.</p>}
        <ul className="flex flex-wrap gap-x-4 gap-y-1">
          {reachable.map((m) => (
            <li key={m.userId}>
              <label className="flex items-center gap-1.5 text-sm text-ink-800">
                <input type="checkbox" checked={chosen.has(m.userId)} onChange={() => toggle(m.userId)} />
                {m.displayName ?? m.login}
              </label>
            </li>
          ))}
        </ul>
      </fieldset>
      <label className="flex flex-col gap-1 text-sm text-ink-800">
        Note for the recipients (optional)
        <textarea
          className="rounded border border-slate-300 px-2 py-1 text-sm"
          rows={2}
          maxLength={2000}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
        />
      </label>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" variant="primary" disabled={chosen.size === 0 || send.isPending}>
          {send.isPending ? 'Sending…' : 'Send the report'}
        </Button>
        {send.isSuccess && (
          <span role="status" className="text-sm text-fjord-700">
            Sent to {send.data.sentTo.map((s) => s.email).join(', ')}.
          </span>
        )}
      </div>
      <FormAlert>{error}</FormAlert>
    </form>
  );
}
