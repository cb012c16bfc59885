import type { ReactNode } from 'react';
import { Button } from '../../../components/ui/button.tsx';

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
