import { createContext, useContext, type FormEvent, type ReactNode } from 'react';
import { FormProvider, useController, useFormContext, type FieldValues, type UseFormReturn } from 'react-hook-form';
import type { FieldError } from '../../../lib/api-client';
import { NumberField, Segmented, SelectField, type Option } from '../../../components/ui/fields';

/** The request-path errors of the calculator around a field (the client's checks, else the server's). */
const RequestErrors = createContext<FieldError[]>([]);

/**
 * A calculator's form: react-hook-form holds the typed text (the panel's `useCalculator`), the
 * fields below bind to it by name, and errors arrive keyed by the API request's paths, so the
 * client's check (the API's own schema) and the server's answer land on the same input.
 */
export function CalculatorForm<F extends FieldValues>({
  form,
  errors,
  onSubmit,
  label,
  className = 'flex flex-col gap-4',
  children,
}: {
  form: UseFormReturn<F>;
  errors: FieldError[];
  onSubmit: () => void;
  label: string;
  className?: string;
  children: ReactNode;
}) {
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSubmit();
  };
  return (
    <FormProvider {...form}>
      <RequestErrors.Provider value={errors}>
        <form onSubmit={submit} noValidate aria-label={label} className={className}>
          {children}
        </form>
      </RequestErrors.Provider>
    </FormProvider>
  );
}

/** The value of one form field and its setter, from the surrounding `CalculatorForm`. */
function useBound<T>(name: string): [T, (value: T) => void] {
  const { control } = useFormContext();
  const { field } = useController({ control, name });
  return [field.value as T, field.onChange];
}

/** A typed-number input bound to form field `name`; `path` is where the request carries it (for errors). */
export function FormNumber({ name, ...rest }: { name: string } & Omit<Parameters<typeof NumberField>[0], 'value' | 'onChange' | 'errors'>) {
  const [value, onChange] = useBound<string>(name);
  const errors = useContext(RequestErrors);
  return <NumberField {...rest} value={value} onChange={onChange} errors={errors} />;
}

/** A unit (or other choice) select bound to form field `name`. */
export function FormSelect<T extends string>({ name, label, options }: { name: string; label: string; options: Option<T>[] }) {
  const [value, onChange] = useBound<T>(name);
  return <SelectField label={label} value={value} options={options} onChange={onChange} />;
}

/** A segmented choice bound to form field `name`; `radioName` groups its radio buttons. */
export function FormSegmented<T extends string>({
  name,
  radioName,
  legend,
  options,
}: {
  name: string;
  radioName: string;
  legend: string;
  options: Option<T>[];
}) {
  const [value, onChange] = useBound<T>(name);
  return <Segmented legend={legend} name={radioName} value={value} onChange={onChange} options={options} />;
}
