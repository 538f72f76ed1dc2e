import { useId } from 'react';
import { useForm } from 'react-hook-form';
import { measurementExclusionSchema } from '../../../../api/features/campaigns/schemas';
import { Button, errorAria, FieldErrorLine, LabelAbove } from '../../../components/ui/form';
import { applyServerErrors, checkedResolver, errorAt, FORM_ERROR } from '../../../lib/form';

const resolver = checkedResolver(({ reason }: { reason: string }) => {
  const parsed = measurementExclusionSchema.safeParse({ version: 1, excluded: true, reason });
  if (parsed.success) return { value: reason.trim(), errors: [] };
  const issue = parsed.error.issues.find((i) => i.path[0] === 'reason') ?? parsed.error.issues[0];
  return { value: null, errors: [{ path: 'reason', message: issue.message }] };
});

/** Ask why a point is excluded; it stays listed and is drawn hollow, never silently dropped. */
export function ExclusionForm({
  rowLabel,
  pending,
  onSubmit,
  onCancel,
}: {
  rowLabel: string;
  pending: boolean;
  onSubmit: (reason: string) => Promise<unknown>;
  onCancel: () => void;
}) {
  const id = useId();
  const form = useForm({ resolver, defaultValues: { reason: '' } });
  const errors = form.formState.errors;
  // A refused save shows beside the reason: the form has that one field.
  const error = errorAt(errors, 'reason') ?? errorAt(errors, FORM_ERROR);
  const reason = form.register('reason', { onChange: () => form.clearErrors() });
  return (
    <form
      className="flex flex-wrap items-start gap-2"
      onSubmit={form.handleSubmit((text) => onSubmit(text).catch((err: unknown) => applyServerErrors(form.setError, err, ['reason'])))}
    >
      <LabelAbove id={id} label={`Why exclude ${rowLabel}? (kept, shown hollow, left out of the fit)`}>
        <input
          id={id}
          autoFocus
          {...reason}
          onKeyDown={(e) => e.key === 'Escape' && onCancel()}
          {...errorAria(id, !!error)}
          placeholder="e.g. internal probe failed; bath drifted 4 K"
          className={`w-96 rounded border px-2 py-1 text-sm ${error ? 'border-rose-600 bg-rose-50' : 'border-slate-300 bg-white'}`}
        />
        {error && <FieldErrorLine id={`${id}-err`} message={error} className="text-xs text-rose-700" />}
      </LabelAbove>
      <div className="flex gap-2 pt-4">
        <Button type="submit" variant="primary" disabled={pending}>
          Exclude
        </Button>
        <Button onClick={onCancel}>Cancel</Button>
      </div>
    </form>
  );
}
