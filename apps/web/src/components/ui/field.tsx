import { useId, type ComponentProps, type ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

const control =
  'block w-full rounded-md border bg-surface px-3 text-sm text-ink placeholder:text-ink-faint transition-colors focus-visible:border-accent disabled:bg-sunken';

/** Text input; pass `invalid` to mark it for assistive technology and with a red border. */
const heights = { sm: 'h-9', md: 'h-10' } as const;

export function Input({
  className,
  invalid,
  controlSize = 'md',
  ...props
}: ComponentProps<'input'> & { invalid?: boolean; controlSize?: keyof typeof heights }) {
  return (
    <input
      aria-invalid={invalid || undefined}
      className={cn(
        control,
        heights[controlSize],
        invalid ? 'border-status-danger' : 'border-line-strong',
        className,
      )}
      {...props}
    />
  );
}

export function Select({ className, ...props }: ComponentProps<'select'>) {
  return <select className={cn(control, 'h-9 border-line-strong pr-8', className)} {...props} />;
}

/**
 * A label, the control, and its hint or error right below it. The control is passed as a
 * render function so it receives the ids that tie label, hint and error together.
 */
export function Field({
  label,
  hint,
  error,
  className,
  children,
}: {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  children: (control: { id: string; 'aria-describedby'?: string; invalid: boolean }) => ReactNode;
}) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ');
  return (
    <div className={cn('flex flex-col gap-1.5', className)}>
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
      </label>
      {children({ id, 'aria-describedby': describedBy || undefined, invalid: Boolean(error) })}
      {hint && !error && (
        <p id={hintId} className="text-xs text-ink-muted">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="flex items-start gap-1.5 text-xs font-medium text-status-danger">
          <svg viewBox="0 0 12 12" aria-hidden="true" className="mt-px size-3 shrink-0">
            <path d="M6 1 11 10H1Z" fill="currentColor" />
          </svg>
          {error}
        </p>
      )}
    </div>
  );
}

/**
 * A `Field` holding one `Input`: the usual pair in forms (e-mail, password, name). Pass the
 * form library's registration and any input attributes (`type`, `autoComplete`, …);
 * `inputClassName` styles the input, `className` the field around it.
 */
export function InputField({
  label,
  hint,
  error,
  className,
  inputClassName,
  ...input
}: {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  inputClassName?: string;
} & Omit<ComponentProps<typeof Input>, 'invalid' | 'id' | 'aria-describedby' | 'className'>) {
  return (
    <Field label={label} hint={hint} error={error} className={className}>
      {({ invalid, ...ids }) => (
        <Input {...ids} {...input} className={inputClassName} invalid={invalid} />
      )}
    </Field>
  );
}

/** One choice of a `SelectField`: the value and what the option shows. */
export type SelectOption = readonly [value: string | number, label: ReactNode];

function Options({ options }: { options: readonly SelectOption[] }) {
  return options.map(([value, text]) => (
    <option key={value} value={value}>
      {text}
    </option>
  ));
}

/**
 * A select of a filter bar: its label above it in small muted type (the select inherits the
 * label's weight), the choices as [value, label] pairs; `className` styles the select.
 */
export function FilterSelect({
  label,
  options,
  ...select
}: { label: string; options: readonly SelectOption[] } & ComponentProps<typeof Select>) {
  return (
    <label className="flex flex-col gap-1 text-xs font-medium text-ink-muted">
      {label}
      <Select {...select}>
        <Options options={options} />
      </Select>
    </label>
  );
}

/**
 * A `Field` holding one `Select`. Give the choices as `options` ([value, label] pairs) or as
 * `<option>` children; pass the form library's registration or `value`/`onChange` as to a
 * plain select.
 */
export function SelectField({
  label,
  hint,
  error,
  className,
  options,
  children,
  ...select
}: {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  options?: readonly SelectOption[];
} & Omit<ComponentProps<typeof Select>, 'id' | 'aria-describedby' | 'className'>) {
  return (
    <Field label={label} hint={hint} error={error} className={className}>
      {({ invalid: _invalid, ...ids }) => (
        <Select {...ids} {...select}>
          {options && <Options options={options} />}
          {children}
        </Select>
      )}
    </Field>
  );
}

/**
 * An `InputField` for a password. `fresh` marks one where a new password is chosen, so the
 * browser offers to generate and save it instead of filling in the stored one.
 */
export function PasswordField({
  fresh = false,
  ...field
}: { fresh?: boolean } & Omit<ComponentProps<typeof InputField>, 'type' | 'autoComplete'>) {
  return (
    <InputField
      {...field}
      type="password"
      autoComplete={fresh ? 'new-password' : 'current-password'}
    />
  );
}

/** Unit shown inside the right end of a number input. */
function Unit({ children }: { children: ReactNode }) {
  return (
    <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center font-mono text-xs text-ink-faint">
      {children}
    </span>
  );
}

/**
 * A labelled number field, monospaced, with its unit inside the right end. Pass the form
 * library's registration (`formField` gives it with the error) or `value`/`onChange`, and any
 * further input attributes (`controlSize`, `min`, …).
 */
export function NumberField({
  label,
  unit,
  error,
  hint,
  step = 'any',
  className,
  ...input
}: {
  label: ReactNode;
  unit?: string;
  error?: string;
  hint?: ReactNode;
  step?: string;
  className?: string;
} & Omit<ComponentProps<typeof Input>, 'invalid' | 'id' | 'aria-describedby' | 'className'>) {
  return (
    <Field label={label} error={error} hint={hint} className={className}>
      {({ invalid, ...ids }) => (
        <div className="relative">
          <Input
            {...ids}
            invalid={invalid}
            type="number"
            inputMode="decimal"
            step={step}
            className={unit ? 'pr-14 font-mono' : 'font-mono'}
            {...input}
          />
          {unit && <Unit>{unit}</Unit>}
        </div>
      )}
    </Field>
  );
}
