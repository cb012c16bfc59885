import type { NodeStatus } from '@turnstone/contracts/fleet';
import { StatusShape, statusTextColour } from '../../../components/ui/status-mark.tsx';
import { cn } from '../../../lib/cn.ts';
import { formatInteger } from '../../../lib/format.ts';
import { statusLabels, statusOrder } from '../../../lib/node-status.ts';
import type { FleetSummary } from '../utils/build-fleet-rows.ts';

/** Machines per status; each count is also a toggle for the status filter. */
export function FleetStatusCounts({
  summary,
  selected,
  onSelect,
}: {
  summary: FleetSummary;
  selected: NodeStatus | null;
  onSelect: (status: NodeStatus | null) => void;
}) {
  return (
    <section aria-label="Machines by status">
      <ul className="grid grid-cols-3 gap-2 lg:grid-cols-6">
        {statusOrder.map((status) => {
          const count = summary.machines[status];
          const pressed = selected === status;
          return (
            <li key={status}>
              <button
                type="button"
                aria-pressed={pressed}
                onClick={() => onSelect(pressed ? null : status)}
                className={cn(
                  'flex w-full items-center justify-between gap-2 rounded-lg border px-3 py-2 text-left transition-colors',
                  pressed
                    ? 'border-accent bg-accent-soft shadow-[inset_0_0_0_1px_var(--color-accent)]'
                    : count === 0
                      ? 'border-line bg-paper hover:border-line-strong'
                      : 'border-line bg-surface hover:border-line-strong',
                )}
              >
                <span className="flex min-w-0 items-center gap-1.5 text-[13px] whitespace-nowrap text-ink-muted">
                  <StatusShape status={status} className={cn('size-3', statusTextColour[status])} />
                  {statusLabels[status]}
                </span>
                <span className="font-mono text-lg leading-6 font-medium text-ink">
                  {formatInteger(count)}
                  <span className="sr-only">{count === 1 ? ' machine' : ' machines'}</span>
                </span>
              </button>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
