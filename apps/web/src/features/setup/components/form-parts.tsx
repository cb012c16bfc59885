import type { ReactNode } from 'react';
import type { UseFormRegisterReturn } from 'react-hook-form';
import { Button } from '../../../components/ui/button.tsx';
import { Field, Input } from '../../../components/ui/field.tsx';

/** The server's message when it named no field of the form (or could not be reached). */
export function FormAlert({ message }: { message: string | null }) {
  if (!message) return null;
  return (
    <div
      role="alert"
      className="flex gap-2.5 rounded-md border border-status-danger/30 bg-danger-soft px-3 py-2.5 text-sm text-ink"
    >
      <svg
        viewBox="0 0 12 12"
        aria-hidden="true"
        className="mt-1 size-3 shrink-0 text-status-danger"
      >
        <path d="M6 .6 11.4 6 6 11.4.6 6Z" fill="currentColor" />
      </svg>
      <p>{message}</p>
    </div>
  );
}

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

/** A labelled number field with its unit; `registration` comes from `form.register`. */
export function NumberField({
  label,
  unit,
  error,
  hint,
  registration,
  step = 'any',
  className,
}: {
  label: ReactNode;
  unit?: string;
  error?: string;
  hint?: ReactNode;
  registration: UseFormRegisterReturn;
  step?: string;
  className?: string;
}) {
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
            {...registration}
          />
          {unit && <Unit>{unit}</Unit>}
        </div>
      )}
    </Field>
  );
}
