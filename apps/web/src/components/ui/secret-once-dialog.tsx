import { useState, type ReactNode } from 'react';
import { AlertBox } from './alert-box.tsx';
import { Button } from './button.tsx';
import { Modal } from './modal.tsx';

/**
 * A secret shown this once (a gateway's API key, an API token, a webhook's signing secret).
 * Closing needs a deliberate click, not a stray Escape. `what` names the secret in the
 * wording ("This key is shown only once.", "Copy key", "I have stored the key"); without it
 * the wording is plain ("This is shown only once.", "Copy", "I have stored it").
 */
export function SecretOnceDialog({
  title,
  label,
  secret,
  advice,
  what,
  onClose,
  children,
}: {
  title: string;
  label: string;
  secret: string | null;
  advice: string;
  what?: string;
  onClose: () => void;
  /** Shown below the secret: how to use it. */
  children?: ReactNode;
}) {
  const [copied, setCopied] = useState<'yes' | 'failed' | null>(null);
  const close = () => {
    setCopied(null);
    onClose();
  };
  const copy = async () => {
    if (!secret) return;
    try {
      await navigator.clipboard.writeText(secret);
      setCopied('yes');
    } catch {
      setCopied('failed');
    }
  };
  return (
    <Modal open={secret !== null} title={title} onClose={close} dismissable={false}>
      <AlertBox tone="caution">
        <p>
          <strong>{what ? `This ${what} is shown only once.` : 'This is shown only once.'}</strong>{' '}
          {advice}
        </p>
      </AlertBox>
      <label className="flex flex-col gap-1.5 text-sm font-medium">
        {label}
        <input
          readOnly
          value={secret ?? ''}
          onFocus={(e) => e.currentTarget.select()}
          className="h-10 w-full rounded-md border border-line-strong bg-sunken px-3 font-mono text-[13px] text-ink"
        />
      </label>
      {children}
      <div className="flex flex-wrap items-center gap-2">
        <Button variant="primary" onClick={() => void copy()}>
          {what ? `Copy ${what}` : 'Copy'}
        </Button>
        {copied === 'yes' && (
          <span role="status" className="text-sm text-status-ok">
            Copied to the clipboard.
          </span>
        )}
        {copied === 'failed' && (
          <span role="status" className="text-sm text-status-danger">
            Could not copy; select the {what ?? 'text'} and copy it by hand.
          </span>
        )}
        <Button className="ml-auto" onClick={close}>
          {what ? `I have stored the ${what}` : 'I have stored it'}
        </Button>
      </div>
    </Modal>
  );
}
