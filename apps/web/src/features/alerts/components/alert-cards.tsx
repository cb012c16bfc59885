import type { Row } from '@tanstack/react-table';
import type { Alert } from '@turnstone/contracts/alerts';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { cn } from '../../../lib/cn.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { Age } from '../../../components/ui/age.tsx';
import { AlertStateMark } from './alert-labels.tsx';
import { AlertSelectBox } from './alert-select-box.tsx';
import { useUnits } from '../../account/api/use-units.ts';

/**
 * The alert list as cards, for tablets and phones: one card per alert, every fact wrapped
 * inside the width (no sideways scroll, no cut level). The same rows, selection and opening
 * as the table.
 */
export function AlertCards({
  rows,
  now,
  selectable,
  openId,
  onOpen,
}: {
  rows: Row<Alert>[];
  now: number;
  selectable: boolean;
  openId: number | null;
  onOpen: (id: number) => void;
}) {
  const units = useUnits();
  return (
    <ul className="flex flex-col divide-y divide-line" aria-label="Alerts">
      {rows.map((row) => {
        const a = row.original;
        return (
          <li
            key={row.id}
            data-alert-id={a.id}
            className={cn('flex gap-3 px-3 py-3', openId === a.id && 'bg-accent-soft')}
          >
            {selectable && (
              <AlertSelectBox
                row={row}
                className="mt-1 size-5 shrink-0 accent-accent disabled:opacity-30"
              />
            )}
            <div className="flex min-w-0 flex-1 flex-col gap-1.5">
              <div className="flex flex-wrap items-center gap-x-4 gap-y-1">
                <StatusMark status={a.level} />
                <AlertStateMark state={a.state} />
                <Age
                  at={a.lastAt}
                  now={now}
                  prefix="last "
                  className="text-[13px] text-ink-muted"
                />
              </div>
              <button
                type="button"
                data-alert-open={a.id}
                className="flex flex-col items-start text-left"
                onClick={() => onOpen(a.id)}
              >
                <span className="text-sm font-medium text-ink">
                  {a.machineName}{' '}
                  <span className="font-mono text-xs text-ink-muted">{a.pointTag}</span>
                </span>
                <span className="text-sm text-ink">{a.bandName}</span>
                <span className="sr-only">
                  : history of the alert on {a.pointTag}, {a.bandName}
                </span>
              </button>
              <p className="font-mono text-[13px] break-words">
                <span className="text-ink">{units.format(a.value, a.unit)}</span>
                <span className="text-ink-muted"> / level {units.format(a.limit, a.unit)}</span>
                {a.peakValue > a.value && (
                  <span className="text-xs text-ink-faint">
                    {' '}
                    · highest while open {units.format(a.peakValue, a.unit)}
                  </span>
                )}
                {a.suspect && <span className="text-xs text-status-quality"> · suspect data</span>}
              </p>
              <p className="text-xs text-ink-muted">
                First {formatDateTime(a.firstAt)}
                {a.acknowledgedBy && (
                  <>
                    {' '}
                    · acknowledged by {a.acknowledgedBy}
                    {a.acknowledgeNote && <> “{a.acknowledgeNote}”</>}
                  </>
                )}
              </p>
            </div>
          </li>
        );
      })}
    </ul>
  );
}
