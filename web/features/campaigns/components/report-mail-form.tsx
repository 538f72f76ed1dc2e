import { useForm } from 'react-hook-form';
import { Button, FormAlert } from '../../../components/ui/form';
import { FormErrorAlert } from '../../../components/ui/form-fields';
import { applyServerErrors } from '../../../lib/form';
import { useMembers } from '../../../lib/members';
import { useSendReport } from '../api/report';

/** Send the workbook and the summary PDF to chosen members of the project (any member may send). */
export function ReportMailForm({ campaignId, projectId }: { campaignId: string; projectId: string }) {
  const members = useMembers(projectId);
  const send = useSendReport(campaignId);
  const form = useForm({ defaultValues: { recipients: [] as string[], message: '' } });
  const chosen = form.watch('recipients');
  const reachable = (members.data?.members ?? []).filter((m) => m.email);
  const toggle = (id: string) => form.setValue('recipients', chosen.includes(id) ? chosen.filter((c) => c !== id) : [...chosen, id]);

  if (members.isPending) return <p className="text-sm text-ink-500">Loading members…</p>;
  if (members.isError) return <FormAlert>{members.error.message}</FormAlert>;
  return (
    <form
      className="flex flex-col gap-3"
      onSubmit={form.handleSubmit(({ recipients, message }) =>
        send.mutate(
          { recipients, ...(message.trim() ? { message: message.trim() } : {}) },
          // No field here shows its own message: every problem goes to the alert below.
          { onError: (e) => applyServerErrors(form.setError, e, []) },
        ),
      )}
    >
      <fieldset>
        <legend className="mb-1 text-sm font-medium text-ink-800">Send the workbook and the summary PDF to</legend>
        {reachable.length === 0 && <p className="text-sm text-ink-600">No member of this project has an e-mail address on file.</p>}
        <ul className="flex flex-wrap gap-x-4 gap-y-1">
          {reachable.map((m) => (
            <li key={m.userId}>
              <label className="flex items-center gap-1.5 text-sm text-ink-800">
                <input type="checkbox" checked={chosen.includes(m.userId)} onChange={() => toggle(m.userId)} />
                {m.displayName ?? m.login}
              </label>
            </li>
          ))}
        </ul>
      </fieldset>
      <label className="flex flex-col gap-1 text-sm text-ink-800">
        Note for the recipients (optional)
        <textarea className="rounded border border-slate-300 px-2 py-1 text-sm" rows={2} maxLength={2000} {...form.register('message')} />
      </label>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" variant="primary" disabled={chosen.length === 0 || send.isPending}>
          {send.isPending ? 'Sending…' : 'Send the report'}
        </Button>
        {send.isSuccess && (
          <span role="status" className="text-sm text-fjord-700">
            Sent to {send.data.sentTo.map((s) => s.email).join(', ')}.
          </span>
        )}
      </div>
      <FormErrorAlert control={form.control} />
    </form>
  );
}
