import { createContext, useContext, useLayoutEffect, useMemo, useRef, useState } from 'react';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type RowSelectionState,
  type SortingState,
} from '@tanstack/react-table';
import type { Alert } from '@turnstone/contracts/alerts';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { cn } from '../../../lib/cn.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { Age } from '../../../components/ui/age.tsx';
import { useMediaQuery } from '../../../hooks/use-media-query.ts';
import { AlertStateMark } from './alert-labels.tsx';
import { AlertCards } from './alert-cards.tsx';
import { AlertSelectBox } from './alert-select-box.tsx';
import { useUnits } from '../../account/api/use-units.ts';

const column = createColumnHelper<Alert>();
const levelRank = { alert: 1, danger: 2 } as const;
const stateRank = { raised: 3, acknowledged: 2, cleared: 1 } as const;

/**
 * The clock the "Last" cells read. A context, not a column dependency: columns built anew
 * every tick would be new cell components, so React would remount every cell and the
 * keyboard focus in the table would drop to the page.
 */
const NowContext = createContext(0);

function LastAt({ at }: { at: string }) {
  const now = useContext(NowContext);
  return <Age at={at} now={now} className="text-[13px] whitespace-nowrap text-ink-muted" />;
}

export function AlertsTable({
  alerts,
  now,
  selectable,
  selection,
  onSelectionChange,
  openId,
  onOpen,
}: {
  alerts: Alert[];
  now: number;
  /** Whether rows can be selected for acknowledgement (operator, engineer). */
  selectable: boolean;
  selection: RowSelectionState;
  onSelectionChange: (next: RowSelectionState) => void;
  openId: number | null;
  onOpen: (id: number) => void;
}) {
  const units = useUnits();
  const [sorting, setSorting] = useState<SortingState>([{ id: 'level', desc: true }]);
  // Below the wide layout (tablets, 820 px) the alerts are cards: nothing scrolls sideways.
  const narrow = useMediaQuery('(max-width: 1023px)');
  // The latest onOpen without rebuilding the columns when it changes (see NowContext).
  const openRef = useRef(onOpen);
  useLayoutEffect(() => {
    openRef.current = onOpen;
  }, [onOpen]);
  const columns = useMemo(
    () => [
      ...(selectable
        ? [
            column.display({
              id: 'select',
              header: ({ table }) => (
                <input
                  type="checkbox"
                  aria-label="Select every raised alert"
                  className="size-4 accent-accent"
                  checked={table.getIsAllRowsSelected()}
                  ref={(el) => {
                    if (el) el.indeterminate = table.getIsSomeRowsSelected();
                  }}
                  onChange={table.getToggleAllRowsSelectedHandler()}
                />
              ),
              cell: ({ row }) => (
                <AlertSelectBox row={row} className="size-4 accent-accent disabled:opacity-30" />
              ),
            }),
          ]
        : []),
      column.accessor('level', {
        header: 'Level',
        sortingFn: (a, b) =>
          levelRank[a.original.level] - levelRank[b.original.level] ||
          stateRank[a.original.state] - stateRank[b.original.state] ||
          Date.parse(a.original.lastAt) - Date.parse(b.original.lastAt),
        cell: (c) => <StatusMark status={c.getValue()} />,
      }),
      column.accessor('state', {
        header: 'State',
        sortingFn: (a, b) => stateRank[a.original.state] - stateRank[b.original.state],
        cell: (c) => <AlertStateMark state={c.getValue()} />,
      }),
      column.accessor((a) => `${a.machineName} ${a.pointTag}`, {
        id: 'point',
        header: 'Machine · point',
        cell: (c) => (
          <button
            type="button"
            data-alert-open={c.row.original.id}
            className="flex flex-col items-start text-left"
            onClick={(e) => {
              e.stopPropagation();
              openRef.current(c.row.original.id);
            }}
          >
            {/* The name starts with what is seen (WCAG 2.5.3 label in name). */}
            <span className="text-sm whitespace-nowrap text-ink">{c.row.original.machineName}</span>
            <span className="font-mono text-xs whitespace-nowrap text-ink-muted">
              {c.row.original.pointTag}
            </span>
            <span className="sr-only">
              : history of the alert on {c.row.original.pointTag}, {c.row.original.bandName}
            </span>
          </button>
        ),
      }),
      column.accessor('bandName', {
        header: 'Band',
        cell: (c) => <span className="block min-w-36 text-sm">{c.getValue()}</span>,
      }),
      column.accessor((a) => a.value / (a.limit || 1), {
        id: 'value',
        header: 'Value vs level',
        cell: ({ row: { original: a } }) => (
          <span className="font-mono text-[13px] whitespace-nowrap">
            <span className="text-ink">{units.format(a.value, a.unit)}</span>
            <span className="text-ink-muted"> / {units.format(a.limit, a.unit)}</span>
            {a.peakValue > a.value && (
              <span className="block text-xs text-ink-faint">
                highest while open {units.format(a.peakValue, a.unit)}
              </span>
            )}
            {a.suspect && <span className="block text-xs text-status-quality">suspect data</span>}
          </span>
        ),
      }),
      column.accessor((a) => Date.parse(a.firstAt), {
        id: 'firstAt',
        header: 'First',
        cell: ({ row: { original: a } }) => (
          <time dateTime={a.firstAt} className="text-[13px] whitespace-nowrap text-ink-muted">
            {formatDateTime(a.firstAt)}
          </time>
        ),
      }),
      column.accessor((a) => Date.parse(a.lastAt), {
        id: 'lastAt',
        header: 'Last',
        cell: ({ row: { original: a } }) => <LastAt at={a.lastAt} />,
      }),
      column.accessor((a) => a.acknowledgedBy ?? '', {
        id: 'ack',
        header: 'Acknowledged by',
        cell: ({ row: { original: a } }) =>
          a.acknowledgedBy ? (
            <span className="text-[13px] text-ink-muted">
              {a.acknowledgedBy}
              {a.acknowledgeNote && (
                <span
                  className="block max-w-56 truncate text-xs text-ink-faint"
                  title={a.acknowledgeNote}
                >
                  “{a.acknowledgeNote}”
                </span>
              )}
            </span>
          ) : (
            <span className="text-ink-faint">—</span>
          ),
      }),
    ],
    [selectable, units],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table is used as documented
  const table = useReactTable({
    data: alerts,
    columns,
    state: { sorting, rowSelection: selection },
    getRowId: (a) => String(a.id),
    enableRowSelection: (row) => row.original.state === 'raised',
    onRowSelectionChange: (updater) =>
      onSelectionChange(typeof updater === 'function' ? updater(selection) : updater),
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  if (narrow)
    return (
      <AlertCards
        rows={table.getRowModel().rows}
        now={now}
        selectable={selectable}
        openId={openId}
        onOpen={onOpen}
      />
    );
  return (
    <NowContext.Provider value={now}>
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left">
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-line">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={
                        sorted === 'asc'
                          ? 'ascending'
                          : sorted === 'desc'
                            ? 'descending'
                            : undefined
                      }
                      className="px-3 py-2 text-xs font-semibold tracking-wide text-ink-muted uppercase"
                    >
                      {header.column.getCanSort() ? (
                        <button
                          type="button"
                          className="inline-flex items-center gap-1 uppercase hover:text-ink"
                          onClick={header.column.getToggleSortingHandler()}
                        >
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true" className="font-mono">
                            {sorted === 'asc' ? '↑' : sorted === 'desc' ? '↓' : '↕'}
                          </span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr
                key={row.id}
                data-alert-id={row.original.id}
                onClick={() => onOpen(row.original.id)}
                className={cn(
                  'cursor-pointer border-b border-line last:border-b-0 hover:bg-sunken/60',
                  openId === row.original.id && 'bg-accent-soft hover:bg-accent-soft',
                )}
              >
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2.5 align-top">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </NowContext.Provider>
  );
}
