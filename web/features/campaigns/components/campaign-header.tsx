import { useMemo, useState, type ReactNode } from 'react';
import { useForm } from 'react-hook-form';
import { useQueryClient } from '@tanstack/react-query';
import { Button } from '../../../components/ui/form';
import { FormFooter } from '../../../components/ui/form-fields';
import { ApiError } from '../../../lib/api-client';
import { applyServerErrors, checkedResolver } from '../../../lib/form';
import { fixed } from '../../../lib/format';
import { RoleBadge } from '../../../components/ui/role-badge';
import { useUpdateCampaign } from '../api/campaigns';
import { campaignKeys } from '../api/keys';
import type { CampaignWithRole } from '../api/types';
import { CAMPAIGN_FIELDS, fieldErrorList, updateBody, valuesFromCampaign, type CampaignFormValues } from '../lib/campaign-form';
import { ASSAY_LABEL, MEASURE_LABEL, STATUS_MARK, uncertaintyUnit } from '../lib/labels';
import { CampaignFields } from './campaign-fields';

/** What the campaign is, at a glance; editors open an edit form that checks the version it read. */
export function CampaignHeader({ campaign, canEdit }: { campaign: CampaignWithRole; canEdit: boolean }) {
  const [editing, setEditing] = useState(false);
  // Bumped to reopen the form on the current version after a conflict (never on a background refresh).
  const [formKey, setFormKey] = useState(0);
  return (
    <div className="flex flex-col gap-3">
      <dl className="tnum grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-3 lg:grid-cols-6">
        <Item term="Products" detail={`A = ${campaign.productNameA} · B = ${campaign.productNameB}`} />
        <Item term="Reported as" detail={MEASURE_LABEL[campaign.measure]} />
        <Item term="Assay" detail={ASSAY_LABEL[campaign.assayMethod]} />
        <Item
          term="Default uncertainty"
          detail={
            campaign.defaultUncertainty === null
              ? '— (none)'
              : `± ${fixed(campaign.defaultUncertainty, 2)} ${uncertaintyUnit(campaign.measure).replace(/[()]/g, '')}`
          }
        />
        <Item
          term="Next run’s assay SD"
          detail={
            campaign.newRunUncertainty == null
              ? 'median of the runs’'
              : `± ${fixed(campaign.newRunUncertainty, 2)} ${uncertaintyUnit(campaign.measure).replace(/[()]/g, '')}`
          }
        />
        <Item
          term="Quantitation limit"
          detail={campaign.quantitationLimit == null ? '99.8 % ee (default)' : String(campaign.quantitationLimit)}
        />
        <Item
          term="Status"
          detail={
            <>
              <span aria-hidden="true">{STATUS_MARK[campaign.status]} </span>
              {campaign.status}
            </>
          }
        />
        <Item term="Your role" detail={<RoleBadge role={campaign.role} />} />
      </dl>
      {campaign.reactionDescription && <p className="text-sm text-ink-700">{campaign.reactionDescription}</p>}
      {campaign.notes && <p className="text-xs text-ink-600">Notes: {campaign.notes}</p>}
      {canEdit && !editing && (
        <div>
          <Button onClick={() => setEditing(true)}>Edit campaign details</Button>
        </div>
      )}
      {canEdit && editing && (
        <EditCampaignForm key={formKey} campaign={campaign} onDone={() => setEditing(false)} onReloaded={() => setFormKey((k) => k + 1)} />
      )}
    </div>
  );
}

function Item({ term, detail }: { term: string; detail: ReactNode }) {
  return (
    <div>
      <dt className="text-xs uppercase tracking-wide text-ink-500">{term}</dt>
      <dd className="text-ink-900">{detail}</dd>
    </div>
  );
}

function EditCampaignForm({ campaign, onDone, onReloaded }: { campaign: CampaignWithRole; onDone: () => void; onReloaded: () => void }) {
  // The version the form was opened at: a save checks it, so nobody overwrites a change unseen.
  const [base] = useState(campaign);
  const resolver = useMemo(
    () =>
      checkedResolver((values: CampaignFormValues) => {
        const { body, errors } = updateBody(base, values);
        return { value: body, errors: fieldErrorList(errors) };
      }),
    [base],
  );
  const form = useForm({ resolver, defaultValues: valuesFromCampaign(base) });
  const [conflict, setConflict] = useState<number | null>(null);
  const update = useUpdateCampaign(campaign.id, campaign.projectId);
  const client = useQueryClient();
  return (
    <form
      noValidate
      aria-label="Edit campaign"
      className="flex flex-col gap-3 rounded border border-slate-200 bg-slate-50 p-3"
      onSubmit={form.handleSubmit((body) =>
        update.mutate(body, {
          onSuccess: onDone,
          onError: (err) => {
            if (err instanceof ApiError && err.status === 409) {
              setConflict(typeof err.problem.currentVersion === 'number' ? err.problem.currentVersion : -1);
            } else applyServerErrors(form.setError, err, CAMPAIGN_FIELDS);
          },
        }),
      )}
    >
      <CampaignFields control={form.control} />
      {conflict !== null && (
        <div
          role="alert"
          className="flex flex-wrap items-center gap-3 rounded border border-rose-300 bg-rose-50 px-3 py-2 text-sm text-rose-800"
        >
          <span>
            <span aria-hidden="true">✕ </span>Changed by someone else — reload. You edited version {base.version}
            {conflict > 0 ? `; the campaign is now at version ${conflict}` : ''}. Your changes were not saved.
          </span>
          <Button
            onClick={() => {
              void client.refetchQueries({ queryKey: campaignKeys.detail(campaign.id) }).then(onReloaded);
            }}
          >
            Reload the current version
          </Button>
        </div>
      )}
      <FormFooter
        control={form.control}
        pending={update.isPending}
        submit={update.isPending ? 'Saving…' : 'Save details'}
        className="flex items-center gap-2"
      >
        <Button onClick={onDone}>Cancel</Button>
        <span className="text-xs text-ink-500">Editing version {base.version}</span>
      </FormFooter>
    </form>
  );
}
