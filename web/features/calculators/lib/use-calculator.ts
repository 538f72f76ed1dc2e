import { useState } from 'react';
import type { UseQueryResult } from '@tanstack/react-query';
import type { FieldError } from '../../../lib/api-client';
import { apiFieldErrors } from '../../../lib/field-errors';

/**
 * The state every calculator panel shares: the form text, the last valid request (which keys
 * the query), and the errors to show — the client's own checks first, else the server's.
 */
export function useCalculator<Form, Request, Response>(options: {
  initial: Form;
  toRequest: (form: Form) => { request: Request | null; errors: FieldError[] };
  useResult: (request: Request | null) => UseQueryResult<Response>;
}) {
  const [form, setForm] = useState<Form>(options.initial);
  const [request, setRequest] = useState<Request | null>(null);
  const [clientErrors, setClientErrors] = useState<FieldError[]>([]);
  const query = options.useResult(request);
  const serverErrors = apiFieldErrors(query.error);
  const submit = () => {
    const { request: next, errors } = options.toRequest(form);
    setClientErrors(errors);
    if (next) setRequest(next);
  };
  const patch = (change: Partial<Form>) => setForm((f) => ({ ...f, ...change }));
  return {
    form,
    setForm,
    patch,
    submit,
    request,
    query,
    clientErrors,
    serverErrors,
    errors: clientErrors.length ? clientErrors : serverErrors,
  };
}
