/**
 * The one way Eyrie builds a form: react-hook-form holds the values, a schema (the API's own zod
 * schema, or a function that builds the request from the typed text) checks them before sending,
 * and the server's problem details land on the same fields through `applyServerErrors`.
 */
import { zodResolver } from '@hookform/resolvers/zod';
import {
  useForm,
  type DefaultValues,
  type FieldErrors,
  type FieldValues,
  type Path,
  type Resolver,
  type UseFormHandleSubmit,
  type UseFormSetError,
} from 'react-hook-form';
import type { z } from 'zod';
import { ApiError, type FieldError } from './api-client';

/** Where messages that belong to no field go (shown by `FormAlert` under the fields). */
export const FORM_ERROR = 'root.server' as const;

/** "measurements[3].selectivity" and "measurements.3.selectivity" are the same path. */
export function normalisePath(path: string): string {
  return path.replace(/\[(\d+)\]/g, '.$1').replace(/^\./, '');
}

/** A form whose values are checked with a zod schema; the submit handler receives the parsed output. */
export function useZodForm<S extends z.ZodType<FieldValues, FieldValues>>(schema: S, defaultValues: z.input<S>) {
  return useForm<z.input<S>, unknown, z.output<S>>({
    resolver: zodResolver(schema),
    defaultValues: defaultValues as DefaultValues<z.input<S>>,
    mode: 'onSubmit',
  });
}

/** Nested field errors in react-hook-form's shape from flat `{ path, message }` pairs (first message per path wins). */
function nestErrors(errors: FieldError[]): Record<string, unknown> {
  const root: Record<string, unknown> = {};
  for (const { path, message } of errors) {
    const parts = normalisePath(path).split('.').filter(Boolean);
    if (!parts.length) parts.push('root', 'server');
    let node = root;
    for (const part of parts.slice(0, -1)) node = (node[part] ??= {}) as Record<string, unknown>;
    node[parts.at(-1)!] ??= { type: 'validate', message };
  }
  return root;
}

/**
 * A resolver from a function that turns the typed text into a request: either the request or
 * field errors with paths into the form's values (the same paths the API answers with).
 */
export function checkedResolver<V extends FieldValues, Out>(
  check: (values: V) => { value: Out | null; errors: FieldError[] },
): Resolver<V, unknown, Out> {
  return (values) => {
    const { value, errors } = check(values);
    if (value !== null && errors.length === 0) return { values: value, errors: {} };
    return { values: {}, errors: nestErrors(errors) as FieldErrors<V> };
  };
}

/**
 * Put a failed request's problem details onto the form: each `errors[]` entry whose path is one of
 * `fields` (or lies below one) onto that field, everything else (a 409, a 502, a path the form does
 * not show) into `FORM_ERROR`. Returns true when at least one field got a message.
 */
export function applyServerErrors<V extends FieldValues>(setError: UseFormSetError<V>, error: unknown, fields: readonly string[]): boolean {
  const fieldErrors = error instanceof ApiError ? error.fieldErrors : [];
  const stray: string[] = [];
  const seen = new Set<string>();
  for (const e of fieldErrors) {
    const p = normalisePath(e.path);
    const field = fields.find((f) => p === f || p.startsWith(`${f}.`));
    if (field === undefined) stray.push(e.message);
    else if (!seen.has(field)) {
      seen.add(field);
      setError(field as Path<V>, { type: 'server', message: e.message });
    }
  }
  if (!fieldErrors.length) stray.push(error instanceof Error ? error.message : 'The request failed.');
  if (stray.length) setError(FORM_ERROR, { type: 'server', message: stray.join(' ') });
  return seen.size > 0;
}

/** The message for one field (or the form's own, with `FORM_ERROR`), for components that show errors themselves. */
export function errorAt(errors: FieldErrors, path: string): string | undefined {
  let node: unknown = errors;
  for (const part of normalisePath(path).split('.'))
    node = node && typeof node === 'object' ? (node as Record<string, unknown>)[part] : undefined;
  const message = node && typeof node === 'object' ? (node as { message?: unknown }).message : undefined;
  return typeof message === 'string' ? message : undefined;
}

/**
 * A form's submit handler: the checked values go through `mutation` (shaped by `toBody` when the
 * request needs more than the form holds); a failure's problem details land on `fields` as in
 * `applyServerErrors`.
 */
export function submitThrough<V extends FieldValues, Out, Data, Body = Out>(
  form: { handleSubmit: UseFormHandleSubmit<V, Out>; setError: UseFormSetError<V> },
  mutation: { mutate: (body: Body, options: { onSuccess?: (data: Data) => void; onError: (error: Error) => void }) => void },
  fields: readonly string[],
  { toBody, onSuccess }: { toBody?: (values: Out) => Body; onSuccess?: (data: Data) => void } = {},
) {
  return form.handleSubmit((values) =>
    mutation.mutate(toBody ? toBody(values) : (values as unknown as Body), {
      onSuccess,
      onError: (error) => applyServerErrors(form.setError, error, fields),
    }),
  );
}
