import {
  get,
  type FieldError,
  type FieldPath,
  type FieldValues,
  type FormState,
  type RegisterOptions,
  type UseFormRegister,
} from 'react-hook-form';

/**
 * What a field component (`InputField`, `SelectField`, a number field) takes for one value of a
 * react-hook-form form: the value's registration and its error message, both found by its name.
 */
export function formField<T extends FieldValues, N extends FieldPath<T>>(
  form: { register: UseFormRegister<T>; formState: FormState<NoInfer<T>> },
  name: N,
  options?: RegisterOptions<T, N>,
) {
  const error = get(form.formState.errors, name) as FieldError | undefined;
  return { ...form.register(name, options), error: error?.message };
}

/** For number inputs: empty → undefined (the schema says "required"), else a number. */
export const asNumber = (v: unknown) =>
  v === '' || v === null || v === undefined ? undefined : Number(v);
/** For optional number inputs: empty → null. */
export const asNullableNumber = (v: unknown) =>
  v === '' || v === null || v === undefined ? null : Number(v);
