import { useState } from 'react';
import { createTokenSchema, TOKEN_MAX_DAYS } from '../../../../api/features/tokens/schemas';
import { Button } from '../../../components/ui/form';
import { FormFooter, FormTextField } from '../../../components/ui/form-fields';
import { Panel } from '../../../components/ui/page';
import { submitThrough, useZodForm } from '../../../lib/form';
import { useCreateToken, useRevokeToken, useTokens, type ApiTokenInfo } from '../api/tokens';
import { ListHead } from '../../../components/ui/table-head';

const dateFormat = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium' });
const statusText: Record<ApiTokenInfo['status'], string> = { active: '● active', expired: '⌛ expired', revoked: '✕ revoked' };

function NewSecret({ name, secret, onDone }: { name: string; secret: string; onDone: () => void }) {
  const [copied, setCopied] = useState(false);
  return (
    <div role="status" className="rounded-md border border-fjord-600 bg-fjord-50 p-3 text-sm">
      <p className="font-semibold text-fjord-800">Token “{name}” created. Copy it now: it will not be shown again.</p>
      <code
        data-testid="new-token-secret"
        className="mt-2 block break-all rounded border border-slate-300 bg-white px-2 py-1.5 font-mono text-xs"
      >
        {secret}
      </code>
      <div className="mt-2 flex gap-2">
        <Button
          onClick={() =>
            navigator.clipboard?.writeText(secret).then(
              () => setCopied(true),
              () => setCopied(false),
            )
          }
        >
          {copied ? '✓ Copied' : 'Copy'}
        </Button>
        <Button onClick={onDone}>I have stored it</Button>
      </div>
      <p className="mt-2 text-xs text-ink-600">
        Use it as <code className="font-mono">Authorization: Bearer …</code>. It can do what you can do in your projects, nothing more.
      </p>
    </div>
  );
}

export function TokenManager() {
  const tokens = useTokens();
  const create = useCreateToken();
  const revoke = useRevokeToken();
  const form = useZodForm(createTokenSchema, { name: '', expiresInDays: '30' });
  const [created, setCreated] = useState<{ name: string; secret: string } | null>(null);
  return (
    <div className="grid gap-4 lg:grid-cols-[1fr_340px]">
      <Panel title="Your tokens">
        {created && <NewSecret {...created} onDone={() => setCreated(null)} />}
        {tokens.isPending ? (
          <p className="text-sm text-ink-500">Loading…</p>
        ) : tokens.isError ? (
          <p role="alert" className="text-sm text-rose-700">
            {tokens.error.message}
          </p>
        ) : tokens.data.length === 0 ? (
          <p className="text-sm text-ink-600">No tokens yet.</p>
        ) : (
          <table className="mt-2 w-full text-left text-sm">
            <caption className="sr-only">Your API tokens</caption>
            <ListHead
              columns={[
                { label: 'Name' },
                { label: 'Starts with' },
                { label: 'Status' },
                { label: 'Expires' },
                { label: 'Last used' },
                { label: 'Actions', hidden: true },
              ]}
            />
            <tbody>
              {tokens.data.map((t) => (
                <tr key={t.id} className="border-b border-slate-100">
                  <td className="py-2 pr-3 font-medium">{t.name}</td>
                  <td className="py-2 pr-3 font-mono text-xs">{t.prefix}…</td>
                  <td className="py-2 pr-3">{statusText[t.status]}</td>
                  <td className="tnum py-2 pr-3">{dateFormat.format(new Date(t.expiresAt))}</td>
                  <td className="tnum py-2 pr-3 text-ink-600">{t.lastUsedAt ? dateFormat.format(new Date(t.lastUsedAt)) : 'never'}</td>
                  <td className="py-2 text-right">
                    {t.status === 'active' && (
                      <Button
                        variant="danger"
                        aria-label={`Revoke ${t.name}`}
                        onClick={() => revoke.mutate(t.id)}
                        disabled={revoke.isPending}
                      >
                        Revoke
                      </Button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Panel>
      <Panel title="New token">
        <form
          noValidate
          aria-label="New API token"
          className="grid gap-3"
          onSubmit={submitThrough(form, create, ['name', 'expiresInDays'], {
            onSuccess: (r) => {
              setCreated({ name: r.token.name, secret: r.secret });
              form.reset();
            },
          })}
        >
          <FormTextField control={form.control} name="name" label="Name" hint="What will use it, e.g. “nightly export script”." />
          <FormTextField
            control={form.control}
            name="expiresInDays"
            label="Expires after (days)"
            inputMode="numeric"
            hint={`1 to ${TOKEN_MAX_DAYS} days.`}
          />
          <FormFooter control={form.control} pending={create.isPending} submit="Create token" />
        </form>
      </Panel>
    </div>
  );
}
