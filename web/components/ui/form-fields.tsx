import type { ComponentProps, ReactNode } from 'react';
import { useController, useFormState, type Control, type FieldPath, type FieldValues } from 'react-hook-form';
import { errorAt, FORM_ERROR } from '../../lib/form';
import { Button, FormAlert, SelectField, TextField } from './form';

type Bound<V extends FieldValues> = { control: Control<V, unknown, unknown>; name: FieldPath<V> };

/** A text field bound to a react-hook-form field: value, change and error come from the form. */
export function FormTextField<V extends FieldValues>({
  control,
  name,
  ...rest
}: Bound<V> & Omit<ComponentProps<typeof TextField>, 'value' | 'onChange' | 'error' | 'name'>) {
  const { field, fieldState } = useController({ control, name });
  return (
    <TextField
      {...rest}
      name={name}
      value={(field.value as string | number | undefined) ?? ''}
      onChange={field.onChange}
      error={fieldState.error?.message}
    />
  );
}

/** A select bound to a react-hook-form field. */
export function FormSelectField<V extends FieldValues, T extends string>({
  control,
  name,
  ...rest
}: Bound<V> & Omit<ComponentProps<typeof SelectField<T>>, 'value' | 'onChange' | 'error' | 'name'>) {
  const { field, fieldState } = useController({ control, name });
  return <SelectField<T> {...rest} name={name} value={field.value as T} onChange={field.onChange} error={fieldState.error?.message} />;
}

/** The form's own message: server problems that name no field shown here. */
export function FormErrorAlert<V extends FieldValues>({ control }: { control: Control<V, unknown, unknown> }) {
  const { errors } = useFormState({ control });
  return <FormAlert>{errorAt(errors, FORM_ERROR)}</FormAlert>;
}

/**
 * The end of a form: its own message (FormErrorAlert), then a row with the primary submit button,
 * disabled while the request is pending, and whatever follows it (Cancel, a saved note).
 */
export function FormFooter<V extends FieldValues>({
  control,
  pending,
  submit,
  className,
  children,
}: {
  control: Control<V, unknown, unknown>;
  pending: boolean;
  submit: ReactNode;
  className?: string;
  children?: ReactNode;
}) {
  return (
    <>
      <FormErrorAlert control={control} />
      <div className={className}>
        <Button type="submit" variant="primary" disabled={pending}>
          {submit}
        </Button>
        {children}
      </div>
    </>
  );
}
