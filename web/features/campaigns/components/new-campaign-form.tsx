import { useNavigate } from 'react-router-dom';
import { Button, FormAlert } from '../../../components/ui/form';
import { paths } from '../../../config/paths';
import { ApiError } from '../../../lib/api-client';
import { useCreateCampaign } from '../api/campaigns';
import { blankCampaign, createBody, type FormErrors } from '../lib/campaign-form';
import { CampaignFields, useCampaignFormState } from './campaign-fields';

/** A new campaign in the project (editors and owners); opens it when created. */
export function NewCampaignForm({ projectId, onCancel }: { projectId: string; onCancel: () => void }) {
  const { values, errors, setErrors, set } = useCampaignFormState(blankCampaign);
  const create = useCreateCampaign(projectId);
  const navigate = useNavigate();
  return (
    <form
      noValidate
      aria-label="New campaign"
      className="flex flex-col gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        const { body, errors: found } = createBody(values);
        setErrors(found);
        if (!body) return;
        create.mutate(body, {
          onSuccess: (c) => navigate(paths.campaign.getHref(c.id)),
          onError: (err) => {
            if (err instanceof ApiError && err.fieldErrors.length) {
              const next: FormErrors = {};
              for (const f of err.fieldErrors) next[(f.path.split('.')[0] || '(form)') as keyof FormErrors] ??= f.message;
              setErrors(next);
            } else setErrors({ '(form)': err.message });
          },
        });
      }}
    >
      <CampaignFields values={values} errors={errors} set={set} />
      <FormAlert>{errors['(form)']}</FormAlert>
      <div className="flex gap-2">
        <Button type="submit" variant="primary" disabled={create.isPending}>
          {create.isPending ? 'Creating…' : 'Create campaign'}
        </Button>
        <Button onClick={onCancel}>Cancel</Button>
      </div>
    </form>
  );
}
