import { useState } from 'react';
import type { z } from 'zod';
import { ApiError } from './api-client';

/**
 * Form state checked with the same zod schema the API uses. Client errors
 * show before sending; the server's field errors land on the same fields.
 */
export function useSchemaForm<S extends z.ZodType<unknown, Record<string, unknown>>>(schema: S, initial: z.input<S>) {
  const [values, setValues] = useState<z.input<S>>(initial);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | null>(null);

  const set = (field: keyof z.input<S> & string) => (value: string) => {
    setValues((v) => ({ ...v, [field]: value }));
    setErrors(({ [field]: _gone, ...rest }) => rest);
  };

  /** Validate; returns the parsed value or null (with errors set). */
  const check = (): z.output<S> | null => {
    const parsed = schema.safeParse(values);
    if (parsed.success) {
      setErrors({});
      setFormError(null);
      return parsed.data;
    }
    const next: Record<string, string> = {};
    for (const issue of parsed.error.issues) next[issue.path.map(String).join('.') || '(form)'] ??= issue.message;
    setErrors(next);
    setFormError(next['(form)'] ?? null);
    return null;
  };

  /** Put a failed request's problem details onto the fields (or the form, if no field matches). */
  const fromServer = (error: unknown) => {
    if (error instanceof ApiError && error.fieldErrors.length) {
      const next: Record<string, string> = {};
      for (const e of error.fieldErrors) next[e.path] ??= e.message;
      setErrors(next);
      const known = Object.keys(initial as object);
      const stray = error.fieldErrors.filter((e) => !known.includes(e.path));
      setFormError(stray.length ? stray.map((e) => e.message).join(' ') : null);
    } else {
      setFormError(error instanceof Error ? error.message : 'The request failed.');
    }
  };

  const reset = () => {
    setValues(initial);
    setErrors({});
    setFormError(null);
  };

  return { values, errors, formError, set, check, fromServer, reset };
}
