import { useId, type ButtonHTMLAttributes, type ReactNode } from 'react';

export function TextField(props: {
  label: string;
  value: string | number;
  onChange: (value: string) => void;
  error?: string;
  hint?: ReactNode;
  type?: string;
  name: string;
  autoComplete?: string;
  className?: string;
  inputMode?: 'numeric' | 'email' | 'text';
}) {
  const id = useId();
  const describedBy = [props.hint ? `${id}-hint` : '', props.error ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined;
  return (
    <div className={props.className}>
      <label htmlFor={id} className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
        {props.label}
      </label>
      <input
        id={id}
        name={props.name}
        type={props.type ?? 'text'}
        inputMode={props.inputMode}
        autoComplete={props.autoComplete}
        value={props.value}
        onChange={(e) => props.onChange(e.target.value)}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={describedBy}
        className={`mt-1 w-full rounded border px-2 py-1.5 text-sm ${props.error ? 'border-rose-600 bg-rose-50' : 'border-slate-300 bg-white'}`}
      />
      {props.hint && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-500">
          {props.hint}
        </p>
      )}
      {props.error && <FieldErrorLine id={`${id}-error`} message={props.error} />}
    </div>
  );
}

/** A field's error line; the cross is decorative, the text is what the field's aria-describedby points at. */
export function FieldErrorLine(props: { id: string; message: string; className?: string }) {
  return (
    <p id={props.id} className={props.className ?? 'mt-1 text-xs font-medium text-rose-700'}>
      <span aria-hidden="true">✕ </span>
      {props.message}
    </p>
  );
}

/** A small label above its control (and whatever follows the control); `roomy` leaves a wider gap. */
export function LabelAbove({ id, label, roomy = false, children }: { id: string; label: ReactNode; roomy?: boolean; children: ReactNode }) {
  return (
    <div className={`flex flex-col ${roomy ? 'gap-1' : 'gap-0.5'}`}>
      <label htmlFor={id} className="text-xs font-medium text-ink-700">
        {label}
      </label>
      {children}
    </div>
  );
}

/** The ARIA that ties a control to its error line (id `${id}-err`) while the control is invalid. */
export function errorAria(id: string, invalid: boolean): { 'aria-invalid'?: true; 'aria-describedby'?: string } {
  return invalid ? { 'aria-invalid': true, 'aria-describedby': `${id}-err` } : {};
}

export function SelectField<T extends string>(props: {
  label: string;
  value: T;
  options: { value: T; label: string }[];
  onChange: (value: T) => void;
  error?: string;
  name: string;
  className?: string;
  hideLabel?: boolean;
  disabled?: boolean;
}) {
  const id = useId();
  return (
    <div className={props.className}>
      <label htmlFor={id} className={props.hideLabel ? 'sr-only' : 'block text-xs font-semibold uppercase tracking-wide text-ink-600'}>
        {props.label}
      </label>
      <select
        id={id}
        name={props.name}
        value={props.value}
        disabled={props.disabled}
        onChange={(e) => props.onChange(e.target.value as T)}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={props.error ? `${id}-error` : undefined}
        className={`${props.hideLabel ? '' : 'mt-1'} w-full rounded border bg-white px-2 py-1.5 text-sm ${props.error ? 'border-rose-600' : 'border-slate-300'}`}
      >
        {props.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {props.error && <FieldErrorLine id={`${id}-error`} message={props.error} />}
    </div>
  );
}

const variants = {
  primary: 'border-fjord-700 bg-fjord-600 text-white hover:bg-fjord-700',
  plain: 'border-slate-300 bg-white text-ink-800 hover:bg-slate-50',
  danger: 'border-rose-700 bg-white text-rose-700 hover:bg-rose-50',
};

export function Button({
  variant = 'plain',
  className = '',
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: keyof typeof variants }) {
  return (
    <button
      type="button"
      {...rest}
      className={`rounded border px-3 py-1.5 text-sm font-medium disabled:cursor-not-allowed disabled:opacity-50 ${variants[variant]} ${className}`}
    />
  );
}

export function FormAlert({ children }: { children: ReactNode }) {
  if (!children) return null;
  return (
    <p role="alert" className="rounded border border-rose-300 bg-rose-50 px-3 py-2 text-sm text-rose-800">
      {children}
    </p>
  );
}
