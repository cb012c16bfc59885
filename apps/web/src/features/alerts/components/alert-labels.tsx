import type { AlertStateName } from '@turnstone/contracts/alerts';
import { cn } from '../../../lib/cn.ts';

export const alertStateLabels: Record<AlertStateName, string> = {
  raised: 'Raised',
  acknowledged: 'Acknowledged',
  cleared: 'Cleared',
};

export const alertEventLabels = {
  raised: 'Raised',
  escalated: 'Escalated to danger',
  acknowledged: 'Acknowledged',
  cleared: 'Cleared',
} as const;

/** Units as people write them. */
export const unitLabel = (unit: string) => (unit === 'um' ? 'µm' : unit);

/** A value with its unit in the mono font. */
export function formatLevel(value: number, unit: string): string {
  const digits = Math.abs(value) >= 100 ? 0 : Math.abs(value) >= 10 ? 1 : 2;
  return `${value.toFixed(digits)} ${unitLabel(unit)}`;
}

/** The lifecycle state as text and a shape (filled: raised; ring with tick: acknowledged; hollow: cleared). */
export function AlertStateMark({
  state,
  className,
}: {
  state: AlertStateName;
  className?: string;
}) {
  return (
    <span
      className={cn('inline-flex items-center gap-1.5 whitespace-nowrap text-[13px]', className)}
    >
      <svg viewBox="0 0 12 12" aria-hidden="true" className="size-3 shrink-0 text-ink-muted">
        {state === 'raised' && <circle cx="6" cy="6" r="4.5" fill="currentColor" />}
        {state === 'acknowledged' && (
          <>
            <circle cx="6" cy="6" r="4.6" fill="none" stroke="currentColor" strokeWidth="1.4" />
            <path
              d="M3.8 6.1 5.3 7.6 8.3 4.5"
              fill="none"
              stroke="currentColor"
              strokeWidth="1.4"
              strokeLinecap="round"
              strokeLinejoin="round"
            />
          </>
        )}
        {state === 'cleared' && (
          <circle
            cx="6"
            cy="6"
            r="4.4"
            fill="none"
            stroke="currentColor"
            strokeWidth="1.2"
            strokeDasharray="2 1.5"
          />
        )}
      </svg>
      <span className={state === 'cleared' ? 'text-ink-muted' : 'text-ink'}>
        {alertStateLabels[state]}
      </span>
    </span>
  );
}
