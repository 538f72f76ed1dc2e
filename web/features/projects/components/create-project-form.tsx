import { useNavigate } from 'react-router-dom';
import { projectFieldsSchema } from '../../../../api/features/projects/schemas';
import { FormFooter, FormTextField } from '../../../components/ui/form-fields';
import { paths } from '../../../config/paths';
import { submitThrough, useZodForm } from '../../../lib/form';
import { useCreateProject } from '../api/projects';

export function CreateProjectForm() {
  const form = useZodForm(projectFieldsSchema, { name: '', description: '' });
  const create = useCreateProject();
  const navigate = useNavigate();
  return (
    <form
      noValidate
      aria-label="New project"
      className="grid gap-3"
      onSubmit={submitThrough(form, create, ['name', 'description'], { onSuccess: (p) => navigate(paths.project.getHref(p.id)) })}
    >
      <FormTextField control={form.control} name="name" label="Name" />
      <FormTextField
        control={form.control}
        name="description"
        label="Description"
        hint="Optional: the step, the specification, the team."
      />
      <FormFooter control={form.control} pending={create.isPending} submit="Create project" />
    </form>
  );
}
