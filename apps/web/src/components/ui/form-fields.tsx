import type { FieldPath, FieldValues, FormState, UseFormRegister } from 'react-hook-form';
import { asNullableNumber, asNumber, formField } from '../../lib/form-field.ts';
import { InputField, NumberField, SelectField, type SelectOption } from './field.tsx';

/**
 * One field of a react-hook-form form, described as data. `value` says how the typed text
 * becomes the stored value: a number (empty is missing, so the schema says "required") or a
 * number or null (empty is none); without it the text is kept as it is.
 */
export type FieldSpec<T extends FieldValues> = {
  name: FieldPath<T>;
  label: string;
  hint?: string;
  className?: string;
  value?: 'number' | 'number-or-null';
} & (
  | {
      kind: 'text';
      type?: 'text' | 'date';
      inputMode?: 'decimal';
      placeholder?: string;
      inputClassName?: string;
      spellCheck?: boolean;
      list?: string;
      controlSize?: 'sm' | 'md';
    }
  | { kind: 'number'; unit?: string; step?: string }
  | { kind: 'select'; options: readonly SelectOption[] }
);

const readers = { number: asNumber, 'number-or-null': asNullableNumber } as const;

/** Renders each field of `fields` for `form`: its label, control, hint and error. */
export function FormFields<T extends FieldValues>({
  form,
  fields,
}: {
  form: { register: UseFormRegister<T>; formState: FormState<NoInfer<T>> };
  fields: readonly FieldSpec<NoInfer<T>>[];
}) {
  return fields.map((spec) => {
    const reader = spec.value && readers[spec.value];
    const registered = formField(form, spec.name, reader && { setValueAs: reader });
    switch (spec.kind) {
      case 'text': {
        const { kind: _kind, name: _name, value: _value, ...shown } = spec;
        return <InputField key={spec.name} {...shown} {...registered} />;
      }
      case 'number': {
        const { kind: _kind, name: _name, value: _value, ...shown } = spec;
        return <NumberField key={spec.name} {...shown} {...registered} />;
      }
      case 'select': {
        const { kind: _kind, name: _name, value: _value, ...shown } = spec;
        return <SelectField key={spec.name} {...shown} {...registered} />;
      }
    }
  });
}
