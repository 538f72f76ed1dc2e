import { useForm } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../../components/ui/form';
import { FormFooter } from '../../../components/ui/form-fields';
import { paths } from '../../../config/paths';
import { checkedResolver, submitThrough } from '../../../lib/form';
import { useCreateCampaign } from '../api/campaigns';
import { blankCampaign, CAMPAIGN_FIELDS, createBody, fieldErrorList, type CampaignFormValues } from '../lib/campaign-form';
import { CampaignFields } from './campaign-fields';

const resolver = checkedResolver((values: CampaignFormValues) => {
  const { body, errors } = createBody(values);
  return { value: body, errors: fieldErrorList(errors) };
});

/** A new campaign in the project (editors and owners); opens it when created. */
export function NewCampaignForm({ projectId, onCancel }: { projectId: string; onCancel: () => void }) {
  const form = useForm({ resolver, defaultValues: blankCampaign });
  const create = useCreateCampaign(projectId);
  const navigate = useNavigate();
  return (
    <form
      noValidate
      aria-label="New campaign"
      className="flex flex-col gap-3"
      onSubmit={submitThrough(form, create, CAMPAIGN_FIELDS, { onSuccess: (c) => navigate(paths.campaign.getHref(c.id)) })}
    >
      <CampaignFields control={form.control} />
      <FormFooter
        control={form.control}
        pending={create.isPending}
        submit={create.isPending ? 'Creating…' : 'Create campaign'}
        className="flex gap-2"
      >
        <Button onClick={onCancel}>Cancel</Button>
      </FormFooter>
    </form>
  );
}
