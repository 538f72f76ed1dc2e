import { useNavigate } from 'react-router-dom';
import { projectFieldsSchema } from '../../../../api/features/projects/schemas';
import { Button, FormAlert, TextField } from '../../../components/ui/form';
import { paths } from '../../../config/paths';
import { useSchemaForm } from '../../../lib/use-schema-form';
import { useCreateProject } from '../api/projects';

export function CreateProjectForm() {
  const form = useSchemaForm(projectFieldsSchema, { name: '', description: '' });
  const create = useCreateProject();
  const navigate = useNavigate();
  return (
    <form
      noValidate
      aria-label="New project"
      className="grid gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        const input = form.check();
        if (!input) return;
        create.mutate(input, { onSuccess: (p) => navigate(paths.project.getHref(p.id)), onError: form.fromServer });
      }}
    >
      <TextField name="name" label="Name" value={form.values.name} onChange={form.set('name')} error={form.errors.name} />
      <TextField
        name="description"
        label="Description"
        value={form.values.description ?? ''}
        onChange={form.set('description')}
        error={form.errors.description}
        hint="Optional: the step, the specification, the team."
      />
      <FormAlert>{form.formError}</FormAlert>
      <div>
        <Button type="submit" variant="primary" disabled={create.isPending}>
          Create project
        </Button>
      </div>
    </form>
  );
}
