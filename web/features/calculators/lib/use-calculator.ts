import { useState } from 'react';
import { useForm, type DefaultValues, type FieldValues } from 'react-hook-form';
import type { UseQueryResult } from '@tanstack/react-query';
import type { FieldError } from '../../../lib/api-client';
import { apiFieldErrors } from '../../../lib/field-errors';

/**
 * The state every calculator panel shares: the form text (held by react-hook-form, like every
 * form in the app), the last valid request (which keys the query), and the errors to show — the
 * client's own check with the API's schema first, else the server's — keyed by request path.
 */
export function useCalculator<Form extends FieldValues, Request, Response>(options: {
  initial: Form;
  toRequest: (form: Form) => { request: Request | null; errors: FieldError[] };
  useResult: (request: Request | null) => UseQueryResult<Response>;
}) {
  const form = useForm<Form>({ defaultValues: options.initial as DefaultValues<Form> });
  const [request, setRequest] = useState<Request | null>(null);
  const [clientErrors, setClientErrors] = useState<FieldError[]>([]);
  const query = options.useResult(request);
  const serverErrors = apiFieldErrors(query.error);
  const submit = () => {
    const { request: next, errors } = options.toRequest(form.getValues());
    setClientErrors(errors);
    if (next) setRequest(next);
  };
  return {
    form,
    submit,
    request,
    query,
    clientErrors,
    serverErrors,
    errors: clientErrors.length ? clientErrors : serverErrors,
  };
}
