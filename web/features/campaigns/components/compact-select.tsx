import { errorAria, FieldErrorLine, LabelAbove } from '../../../components/ui/form';

/** A small labelled select of the upload steps, its error (if any) below it. */
export function CompactSelect<T extends string>({
  id,
  label,
  value,
  options,
  error,
  blank,
  onChange,
}: {
  id: string;
  label: string;
  value: T | null;
  options: (readonly [T, string])[];
  error?: string;
  /** The text of an empty first option (choosing it gives null); none when unset. */
  blank?: string;
  onChange: (v: T | null) => void;
}) {
  return (
    <LabelAbove id={id} label={label}>
      <select
        id={id}
        value={value ?? ''}
        onChange={(e) => onChange(e.target.value === '' ? null : (e.target.value as T))}
        {...errorAria(id, !!error)}
        className={`rounded border bg-white px-1.5 py-1 text-sm ${error ? 'border-rose-600' : 'border-slate-300'}`}
      >
        {blank !== undefined && <option value="">{blank}</option>}
        {options.map(([v, text]) => (
          <option key={v} value={v}>
            {text}
          </option>
        ))}
      </select>
      {error && <FieldErrorLine id={`${id}-err`} message={error} className="text-xs text-rose-700" />}
    </LabelAbove>
  );
}
