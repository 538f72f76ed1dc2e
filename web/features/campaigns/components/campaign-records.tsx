import { useId, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Button, LabelAbove } from '../../../components/ui/form';
import { FormErrorAlert } from '../../../components/ui/form-fields';
import { applyServerErrors } from '../../../lib/form';
import { dateFormatter } from '../../../lib/format';
import { recordLinks, useHistoryEntries, useKeptFiles, useReopen, useSignOff } from '../api/records';
import type { CampaignWithRole } from '../api/types';
import { ListHead } from '../../../components/ui/table-head';

const timeFormat = dateFormatter({ dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' });
const when = (iso: string) => `${timeFormat(new Date(iso))} UTC`;

function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} kB`;
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}

/**
 * Whether the campaign is signed off, and the one action that fits: sign off (any owner or
 * editor but the last one to change it) or reopen (with a reason).
 */
export function SignOffBar({ campaign, canEdit }: { campaign: CampaignWithRole; canEdit: boolean }) {
  const [open, setOpen] = useState(false);
  const s = campaign.signOff;

  return (
    <div
      className={`flex flex-col gap-2 rounded border px-3 py-2 text-sm ${s ? 'border-emerald-300 bg-emerald-50' : 'border-slate-200 bg-white'}`}
    >
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        {s ? (
          <p>
            <span aria-hidden="true">✓ </span>
            <strong>Signed off</strong> by {s.by}, {when(s.at)}
            {s.note && <span className="text-ink-700"> — “{s.note}”</span>}. The measurements are locked.
          </p>
        ) : (
          <p className="text-ink-700">
            Open: measurements can be changed. Another owner or editor than the last one to change it can sign it off.
          </p>
        )}
        {canEdit && !open && <Button onClick={() => setOpen(true)}>{s ? 'Reopen…' : 'Sign off…'}</Button>}
      </div>
      {canEdit && open && <SignOffForm campaign={campaign} onClose={() => setOpen(false)} />}
    </div>
  );
}

/**
 * One field: the sign-off note or the reason for reopening. Made only once opened, so the campaign
 * page's first build does not set up a form nobody has asked for.
 */
function SignOffForm({ campaign, onClose }: { campaign: CampaignWithRole; onClose: () => void }) {
  const id = useId();
  const form = useForm({ defaultValues: { text: '' } });
  const text = form.watch('text');
  const signOff = useSignOff(campaign.id);
  const reopen = useReopen(campaign.id);
  const s = campaign.signOff;
  const pending = signOff.isPending || reopen.isPending;

  return (
    <>
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={form.handleSubmit(({ text: typed }) => {
          const done = { onSuccess: onClose, onError: (err: Error) => applyServerErrors(form.setError, err, []) };
          if (s) reopen.mutate(typed.trim(), done);
          else signOff.mutate(typed, done);
        })}
      >
        <LabelAbove id={id} label={s ? 'Why reopen it? (kept in the history)' : 'Note beside the sign-off (optional)'}>
          <input
            id={id}
            autoFocus
            {...form.register('text')}
            onKeyDown={(e) => e.key === 'Escape' && onClose()}
            className="w-80 max-w-full rounded border border-slate-300 px-2 py-1"
          />
        </LabelAbove>
        <Button type="submit" variant="primary" disabled={pending || (!!s && text.trim().length < 3)}>
          {s ? 'Reopen' : 'Sign off'}
        </Button>
        <Button onClick={onClose}>Cancel</Button>
      </form>
      <FormErrorAlert control={form.control} />
    </>
  );
}

/** The campaign's history as sentences, newest first, with a CSV export. */
export function CampaignHistory({ campaignId }: { campaignId: string }) {
  const history = useHistoryEntries({ campaignId });
  return (
    <HistoryList
      history={history}
      csvHref={recordLinks.campaignHistoryCsv(campaignId)}
      empty="Nothing has been recorded for this campaign yet."
    />
  );
}

export function HistoryList({
  history,
  csvHref,
  empty,
}: {
  history: ReturnType<typeof useHistoryEntries>;
  csvHref: string;
  empty: string;
}) {
  if (history.isPending) return <p className="text-sm text-ink-500">Loading the history…</p>;
  if (history.isError) {
    return (
      <div role="alert" className="flex items-center gap-2 text-sm text-rose-700">
        The history could not be loaded: {history.error.message}
        <Button onClick={() => void history.refetch()}>Try again</Button>
      </div>
    );
  }
  const entries = history.data.pages.flatMap((p) => p.entries);
  return (
    <div className="flex flex-col gap-2">
      <p>
        <a className="text-sm text-fjord-700 underline" href={csvHref} download>
          <span aria-hidden="true">⤓ </span>Download the history as CSV
        </a>
      </p>
      {entries.length === 0 ? (
        <p className="text-sm text-ink-600">{empty}</p>
      ) : (
        <ol className="flex flex-col divide-y divide-slate-100 text-sm">
          {entries.map((e) => (
            <li key={e.id} className="flex flex-col gap-0.5 py-1.5 sm:flex-row sm:gap-3">
              <time dateTime={e.at} className="tnum shrink-0 text-xs text-ink-600 sm:w-44 sm:pt-0.5">
                {when(e.at)}
              </time>
              <span className="break-words">{e.sentence}</span>
            </li>
          ))}
        </ol>
      )}
      {history.hasNextPage && (
        <Button className="self-start" onClick={() => void history.fetchNextPage()} disabled={history.isFetchingNextPage}>
          Show older changes
        </Button>
      )}
    </div>
  );
}

/** Files uploaded into the campaign, kept as they arrived, each downloadable. */
export function KeptFiles({ campaignId }: { campaignId: string }) {
  const files = useKeptFiles(campaignId);
  if (files.isPending) return <p className="text-sm text-ink-500">Loading the uploaded files…</p>;
  if (files.isError) {
    return (
      <div role="alert" className="flex items-center gap-2 text-sm text-rose-700">
        The list of files could not be loaded: {files.error.message}
        <Button onClick={() => void files.refetch()}>Try again</Button>
      </div>
    );
  }
  if (files.data.length === 0) return <p className="text-sm text-ink-600">No file has been uploaded into this campaign.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="tnum w-full text-left text-sm">
        <caption className="sr-only">Uploaded files, newest first</caption>
        <ListHead
          density="compact"
          columns={[
            { label: 'File' },
            { label: 'Size', align: 'right' },
            { label: 'Rows', align: 'right' },
            { label: 'Uploaded' },
            { label: 'SHA-256' },
          ]}
        />
        <tbody>
          {files.data.map((f) => (
            <tr key={f.id} className="border-b border-slate-100 align-top">
              <td className="py-1.5 pr-3">
                <a className="text-fjord-700 underline" href={recordLinks.keptFile(f.id)} download={f.fileName}>
                  {f.fileName}
                </a>
              </td>
              <td className="whitespace-nowrap py-1.5 pr-3 text-right">{formatBytes(f.sizeBytes)}</td>
              <td className="whitespace-nowrap py-1.5 pr-3 text-right">
                {f.rowCount}
                {f.storedRowCount !== f.rowCount && <span className="block text-xs text-ink-600">{f.storedRowCount} still stored</span>}
              </td>
              <td className="py-1.5 pr-3">
                {f.uploadedBy}
                <span className="block text-xs text-ink-600">{when(f.uploadedAt)}</span>
              </td>
              <td className="py-1.5 font-mono text-xs text-ink-700" title={f.sha256}>
                {f.sha256.slice(0, 12)}…
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
