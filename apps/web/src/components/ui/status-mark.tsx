import type { NodeStatus } from '@turnstone/contracts/fleet';
import { cn } from '../../lib/cn.ts';
import { statusLabels } from '../../lib/node-status.ts';
import { Ring } from './icon.tsx';

/** Each status's colour, for its shape. */
export const statusTextColour: Record<NodeStatus, string> = {
  ok: 'text-status-ok',
  alert: 'text-status-alert',
  danger: 'text-status-danger',
  quality: 'text-status-quality',
  stale: 'text-status-stale',
  none: 'text-status-none',
};

/** One distinct shape per status, so status reads without colour. */
export function StatusShape({ status, className }: { status: NodeStatus; className?: string }) {
  const common = { viewBox: '0 0 12 12', 'aria-hidden': true, className } as const;
  switch (status) {
    case 'ok':
      return (
        <svg {...common}>
          <circle cx="6" cy="6" r="4.5" fill="currentColor" />
        </svg>
      );
    case 'alert':
      return (
        <svg {...common}>
          <path d="M6 1.2 11 10.3H1Z" fill="currentColor" strokeLinejoin="round" />
        </svg>
      );
    case 'danger':
      return (
        <svg {...common}>
          <path d="M6 .6 11.4 6 6 11.4.6 6Z" fill="currentColor" />
          <path d="M6 3.4v3.2" stroke="white" strokeWidth="1.4" strokeLinecap="round" />
          <circle cx="6" cy="8.3" r=".8" fill="white" />
        </svg>
      );
    case 'quality':
      return (
        <svg {...common}>
          <rect
            x="1.75"
            y="1.75"
            width="8.5"
            height="8.5"
            rx="1"
            fill="none"
            stroke="currentColor"
            strokeWidth="1.5"
          />
        </svg>
      );
    case 'stale':
      return (
        <svg {...common}>
          <Ring r={4.4} width={1.5} dash="2.2 1.6" />
        </svg>
      );
    case 'none':
      return (
        <svg {...common}>
          <rect
            x="1.5"
            y="4.5"
            width="9"
            height="3"
            rx="1.5"
            fill="none"
            stroke="currentColor"
            strokeWidth="1.2"
          />
        </svg>
      );
  }
}

/**
 * A status as shape + colour + text. `labelHidden` keeps the text for screen readers only;
 * use it only where the text is visible nearby (e.g. a legend row).
 */
export function StatusMark({
  status,
  labelHidden = false,
  className,
}: {
  status: NodeStatus;
  labelHidden?: boolean;
  className?: string;
}) {
  return (
    <span className={cn('inline-flex items-center gap-1.5 whitespace-nowrap', className)}>
      <StatusShape status={status} className={cn('size-3 shrink-0', statusTextColour[status])} />
      <span className={labelHidden ? 'sr-only' : 'text-[13px] text-ink'}>
        {statusLabels[status]}
      </span>
    </span>
  );
}
