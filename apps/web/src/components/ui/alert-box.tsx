import type { ReactNode } from 'react';
import { cn } from '../../lib/cn.ts';

const tones = {
  /** Something failed (a save the server refused, a sign-in). */
  danger: {
    box: 'border-status-danger/30 bg-danger-soft text-ink',
    icon: 'text-status-danger',
    shape: 'M6 .6 11.4 6 6 11.4.6 6Z',
  },
  /** Something to act on now (a secret shown only once). */
  caution: {
    box: 'border-status-alert/40 bg-status-alert/10',
    icon: 'text-status-alert',
    shape: 'M6 1.2 11 10.3H1Z',
  },
} as const;

/** A boxed message with its tone's mark, announced at once (role="alert"). */
export function AlertBox({
  tone = 'danger',
  children,
}: {
  tone?: keyof typeof tones;
  children: ReactNode;
}) {
  const { box, icon, shape } = tones[tone];
  return (
    <div role="alert" className={cn('flex gap-2.5 rounded-md border px-3 py-2.5 text-sm', box)}>
      <svg viewBox="0 0 12 12" aria-hidden="true" className={cn('mt-1 size-3 shrink-0', icon)}>
        <path d={shape} fill="currentColor" />
      </svg>
      <div>{children}</div>
    </div>
  );
}

/**
 * A form's own error: the server's message when it named no field of the form (or could not
 * be reached); `children` add lines below it. Nothing when there is no message.
 */
export function FormAlert({ message, children }: { message: string | null; children?: ReactNode }) {
  if (!message) return null;
  return (
    <AlertBox>
      <p>{message}</p>
      {children}
    </AlertBox>
  );
}
