import { useId, type ReactNode } from 'react';
import { ApiError, type FieldError } from '../../lib/api-client';
import { messagesFor } from '../../lib/field-errors';
import { SignConvention } from './sign-convention';
import { LabelAbove } from './form';

export const inputClass =
  'tnum rounded border border-slate-300 bg-white px-2 py-1 text-sm text-ink-950 aria-[invalid=true]:border-red-600 aria-[invalid=true]:bg-red-50';
export const selectClass = 'rounded border border-slate-300 bg-white px-1.5 py-1 text-sm text-ink-950';
export const buttonClass = 'rounded bg-fjord-700 px-3 py-1.5 text-sm font-medium text-white hover:bg-fjord-800 disabled:opacity-60';
export const secondaryButtonClass = 'rounded border border-slate-300 bg-white px-3 py-1.5 text-sm text-ink-800 hover:bg-slate-50';

export interface Option<T extends string> {
  value: T;
  label: string;
}

/**
 * A number input labelled with its quantity; `path` is the API field path, so server and
 * client errors for it appear under it. An optional unit select sits beside it.
 */
export function NumberField({
  label,
  path,
  value,
  onChange,
  errors,
  hint,
  unit,
  placeholder,
  width = 'w-28',
}: {
  label: ReactNode;
  path: string;
  value: string;
  onChange: (value: string) => void;
  errors: FieldError[];
  hint?: ReactNode;
  unit?: ReactNode;
  placeholder?: string;
  width?: string;
}) {
  const id = useId();
  const messages = messagesFor(errors, path);
  const describedBy = [messages.length ? `${id}-err` : null, hint ? `${id}-hint` : null].filter(Boolean).join(' ') || undefined;
  return (
    <LabelAbove id={id} label={label} roomy>
      <div className="flex items-center gap-1.5">
        <input
          id={id}
          name={path}
          inputMode="decimal"
          autoComplete="off"
          className={`${inputClass} ${width}`}
          value={value}
          placeholder={placeholder}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={messages.length > 0}
          aria-describedby={describedBy}
        />
        {unit}
      </div>
      {hint && (
        <p id={`${id}-hint`} className="text-xs text-ink-500">
          {hint}
        </p>
      )}
      {messages.length > 0 && (
        <p id={`${id}-err`} className="text-xs text-red-700" role="alert">
          {messages.join('; ')}
        </p>
      )}
    </LabelAbove>
  );
}

export function SelectField<T extends string>({
  label,
  value,
  options,
  onChange,
  name,
}: {
  label: string;
  value: T;
  options: Option<T>[];
  onChange: (value: T) => void;
  name?: string;
}) {
  return (
    <select aria-label={label} name={name} className={selectClass} value={value} onChange={(e) => onChange(e.target.value as T)}>
      {options.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ))}
    </select>
  );
}

/** A row of radio buttons styled as a segmented control (keyboard: arrow keys within the group). */
export function Segmented<T extends string>({
  legend,
  value,
  options,
  onChange,
  name,
}: {
  legend: string;
  value: T;
  options: Option<T>[];
  onChange: (v: T) => void;
  name: string;
}) {
  return (
    <fieldset className="flex flex-col gap-1">
      <legend className="mb-1 text-xs font-medium text-ink-700">{legend}</legend>
      <div className="inline-flex flex-wrap rounded border border-slate-300 bg-slate-50 p-0.5">
        {options.map((o) => (
          <label
            key={o.value}
            className={`cursor-pointer rounded px-2.5 py-1 text-sm has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-fjord-600 ${
              value === o.value ? 'bg-white font-medium text-ink-950 shadow-sm' : 'text-ink-600 hover:text-ink-900'
            }`}
          >
            <input
              type="radio"
              className="sr-only"
              name={name}
              value={o.value}
              checked={value === o.value}
              onChange={() => onChange(o.value)}
            />
            {o.label}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

export const temperatureUnitOptions: Option<'K' | 'C' | 'F'>[] = [
  { value: 'C', label: '°C' },
  { value: 'K', label: 'K' },
  { value: 'F', label: '°F' },
];
export const energyUnitOptions: Option<'kJ/mol' | 'kcal/mol'>[] = [
  { value: 'kJ/mol', label: 'kJ/mol' },
  { value: 'kcal/mol', label: 'kcal/mol' },
];
export const entropyUnitOptions: Option<'J/(mol*K)' | 'cal/(mol*K)'>[] = [
  { value: 'J/(mol*K)', label: 'J/(mol·K)' },
  { value: 'cal/(mol*K)', label: 'cal/(mol·K)' },
];
export const measureOptions: Option<'ee' | 'er' | 'dr' | 'percentA' | 'ratio'>[] = [
  { value: 'ee', label: 'ee (%)' },
  { value: 'er', label: 'er (A:B)' },
  { value: 'dr', label: 'dr (A:B)' },
  { value: 'percentA', label: '% A' },
  { value: 'ratio', label: 'ratio r = A/B' },
];

/** General problem text (detail and any errors that match no field). */
export function ProblemAlert({ title, detail, errors = [] }: { title: string; detail?: string; errors?: FieldError[] }) {
  return (
    <div role="alert" className="rounded-md border border-red-300 bg-red-50 px-3 py-2 text-sm text-red-800">
      <p className="font-medium">{title}</p>
      {detail && <p className="mt-0.5">{detail}</p>}
      {errors.length > 0 && (
        <ul className="mt-1 list-disc pl-5">
          {errors.map((e, i) => (
            <li key={i}>
              {e.path ? <code className="font-mono text-xs">{e.path}</code> : null} {e.message}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** The sign convention: stated once per page, with a help popover (see components/ui/sign-convention). */
export function ConventionNote({ className = '' }: { className?: string }) {
  return <SignConvention className={className} />;
}

/**
 * The alert under a calculator form for errors that belong to no input: the server's problem
 * (title and detail) or the client's own checks. Errors with an input show under that input.
 */
export function UnplacedErrors({
  error,
  clientErrors,
  serverErrors,
  leftover,
}: {
  error: Error | null;
  clientErrors: FieldError[];
  serverErrors: FieldError[];
  leftover: FieldError[];
}) {
  if (clientErrors.length > 0) return leftover.length > 0 ? <ProblemAlert title="Check the inputs" errors={leftover} /> : null;
  if (!error || (serverErrors.length > 0 && leftover.length === 0)) return null;
  return (
    <ProblemAlert
      title={error instanceof ApiError ? error.problem.title : 'The calculation failed'}
      detail={error.message}
      errors={leftover}
    />
  );
}
