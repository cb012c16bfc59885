import type { ReactNode } from 'react';
import { Button } from './button.tsx';
import { Modal } from './modal.tsx';

/**
 * Asks before an action that cannot be undone (revoke a key or token, rotate a key): what
 * happens, the error of a failed attempt, Cancel and the action's own button. `onCancel` runs
 * however the dialog closes without the action (Cancel, Escape).
 */
export function ConfirmDialog({
  open,
  title,
  children,
  error,
  confirmLabel,
  busy,
  onConfirm,
  onCancel,
}: {
  open: boolean;
  title: string;
  /** What the action does, in a sentence or two. */
  children: ReactNode;
  error: string | null;
  confirmLabel: string;
  busy: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  return (
    <Modal open={open} title={title} onClose={onCancel}>
      <p className="text-sm text-ink-muted">{children}</p>
      {error && (
        <p role="alert" className="text-sm text-status-danger">
          {error}
        </p>
      )}
      <div className="flex justify-end gap-2">
        <Button onClick={onCancel}>Cancel</Button>
        <Button variant="primary" busy={busy} onClick={onConfirm}>
          {confirmLabel}
        </Button>
      </div>
    </Modal>
  );
}
