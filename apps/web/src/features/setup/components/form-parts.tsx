import type { ComponentProps, ReactNode } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Field, Input } from '../../../components/ui/field.tsx';

export function FormSection({ title, children }: { title: string; children: ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-3 border-t border-line pt-4">
      <legend className="pr-2 text-xs font-semibold tracking-wide text-ink-muted uppercase">
        {title}
      </legend>
      {children}
    </fieldset>
  );
}

export function FormActions({
  busy,
  saveLabel,
  onCancel,
  onDelete,
  deleteBusy,
  saved,
}: {
  busy: boolean;
  saveLabel: string;
  onCancel?: () => void;
  onDelete?: () => void;
  deleteBusy?: boolean;
  saved?: boolean;
}) {
  return (
    <div className="flex flex-wrap items-center gap-2 border-t border-line pt-4">
      <Button type="submit" variant="primary" busy={busy}>
        {saveLabel}
      </Button>
      {onCancel && (
        <Button variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      )}
      {saved && (
        <span role="status" className="text-sm text-status-ok">
          Saved.
        </span>
      )}
      {onDelete && (
        <Button
          variant="ghost"
          className="ml-auto text-status-danger"
          onClick={onDelete}
          busy={deleteBusy}
        >
          Delete…
        </Button>
      )}
    </div>
  );
}

/** Unit shown inside the right end of a number input. */
export function Unit({ children }: { children: ReactNode }) {
  return (
    <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center font-mono text-xs text-ink-faint">
      {children}
    </span>
  );
}

/**
 * A labelled number field with its unit. Pass the form library's registration (`formField`
 * gives it with the error) and any further input attributes.
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
