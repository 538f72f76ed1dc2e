import { useId, useState } from 'react';
import { measurementExclusionSchema } from '../../../../api/features/campaigns/schemas';
import { Button } from '../../../components/ui/form';

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
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const submit = () => {
    const parsed = measurementExclusionSchema.safeParse({ version: 1, excluded: true, reason });
    if (!parsed.success) {
      setError(parsed.error.issues.find((i) => i.path[0] === 'reason')?.message ?? parsed.error.issues[0].message);
      return;
    }
    onSubmit(reason.trim()).catch((err: unknown) => setError(err instanceof Error ? err.message : 'Not saved.'));
  };
  return (
    <form
      className="flex flex-wrap items-start gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <div className="flex flex-col gap-0.5">
        <label htmlFor={id} className="text-xs font-medium text-ink-700">
          Why exclude {rowLabel}? (kept, shown hollow, left out of the fit)
        </label>
        <input
          id={id}
          autoFocus
          value={reason}
          onChange={(e) => {
            setReason(e.target.value);
            setError(null);
          }}
          onKeyDown={(e) => e.key === 'Escape' && onCancel()}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-err` : undefined}
          placeholder="e.g. internal probe failed; bath drifted 4 K"
          className={`w-96 rounded border px-2 py-1 text-sm ${error ? 'border-rose-600 bg-rose-50' : 'border-slate-300 bg-white'}`}
        />
        {error && (
          <p id={`${id}-err`} className="text-xs text-rose-700">
            <span aria-hidden="true">✕ </span>
            {error}
          </p>
        )}
      </div>
      <div className="flex gap-2 pt-4">
        <Button type="submit" variant="primary" disabled={pending}>
          Exclude
        </Button>
        <Button onClick={onCancel}>Cancel</Button>
      </div>
    </form>
  );
}
