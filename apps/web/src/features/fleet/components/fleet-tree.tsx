import { useId, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { useNow } from '../../../hooks/use-now.ts';
import { cn } from '../../../lib/cn.ts';
import type { FleetRow } from '../utils/build-fleet-rows.ts';
import { useRowWindow } from '../utils/use-row-window.ts';
import { FleetTreeRow, fleetGridColumns, rowHeights } from './fleet-tree-row.tsx';

function rowName(row: FleetRow): string {
  switch (row.kind) {
    case 'site':
      return row.site.name;
    case 'area':
      return row.area.name;
    case 'machine':
      return row.machine.name;
    case 'point':
      return row.point.name;
  }
}

function isExpandable(row: FleetRow): boolean {
  if (row.kind === 'point') return false;
  if (row.kind === 'machine') return row.machine.points.length > 0;
  return true;
}

/**
 * The site → area → machine → point tree as one windowed list (utils/use-row-window.ts):
 * only the rows in view are in the DOM, so thousands of machines stay fast. Keyboard follows the WAI-ARIA tree
 * pattern (arrows, Home/End, Page Up/Down, Enter/Space) with `aria-activedescendant`,
 * which keeps working when the active row scrolls out of the rendered range.
 */
export function FleetTree({
  rows,
  onToggle,
  label,
}: {
  rows: FleetRow[];
  onToggle: (key: string) => void;
  label: string;
}) {
  const treeId = useId();
  const scrollRef = useRef<HTMLDivElement>(null);
  const [activeKey, setActiveKey] = useState<string | null>(null);
  const now = useNow();

  const found = activeKey === null ? -1 : rows.findIndex((r) => r.key === activeKey);
  const activeIndex = found === -1 ? 0 : found;

  const sizes = useMemo(() => rows.map((r) => rowHeights[r.kind]), [rows]);
  const view = useRowWindow(sizes, scrollRef, 12);
  const items = view.slots;

  // Where the first visible row sits (site › area › machine), so a scrolled list keeps its place.
  const indexByKey = useMemo(() => new Map(rows.map((r, i) => [r.key, i])), [rows]);
  const trail: string[] = [];
  let parent = rows[view.firstVisible]?.parentKey ?? null;
  while (parent !== null) {
    const row = rows[indexByKey.get(parent) ?? -1];
    if (!row) break;
    trail.unshift(rowName(row));
    parent = row.parentKey;
  }

  const rowId = (key: string) => `${treeId}-${key.replace(':', '-')}`;
  const activeRendered = items.some((item) => item.index === activeIndex);
  const activeRow = rows[activeIndex];

  function moveTo(index: number) {
    const clamped = Math.max(0, Math.min(rows.length - 1, index));
    const row = rows[clamped];
    if (!row) return;
    setActiveKey(row.key);
    view.scrollToIndex(clamped);
  }

  function onKeyDown(event: KeyboardEvent<HTMLDivElement>) {
    const row = rows[activeIndex];
    if (!row) return;
    const page = Math.max(1, Math.floor((scrollRef.current?.clientHeight ?? 400) / 38) - 1);
    let handled = true;
    switch (event.key) {
      case 'ArrowDown':
        moveTo(activeIndex + 1);
        break;
      case 'ArrowUp':
        moveTo(activeIndex - 1);
        break;
      case 'Home':
        moveTo(0);
        break;
      case 'End':
        moveTo(rows.length - 1);
        break;
      case 'PageDown':
        moveTo(activeIndex + page);
        break;
      case 'PageUp':
        moveTo(activeIndex - page);
        break;
      case 'ArrowRight':
        if (isExpandable(row) && row.kind !== 'point' && !row.expanded) onToggle(row.key);
        else if (rows[activeIndex + 1]?.parentKey === row.key) moveTo(activeIndex + 1);
        break;
      case 'ArrowLeft':
        if (isExpandable(row) && row.kind !== 'point' && row.expanded) onToggle(row.key);
        else if (row.parentKey) moveTo(rows.findIndex((r) => r.key === row.parentKey));
        break;
      case 'Enter':
      case ' ':
        if (isExpandable(row)) onToggle(row.key);
        break;
      default:
        handled = false;
    }
    if (handled) event.preventDefault();
  }

  return (
    <div className="flex min-h-0 flex-1 flex-col">
      <div
        aria-hidden="true"
        className={cn(
          fleetGridColumns,
          'overflow-hidden border-b border-line-strong py-2 pr-3 text-[11px] font-semibold tracking-wide text-ink-faint uppercase [scrollbar-gutter:stable]',
        )}
      >
        {trail.length > 0 ? (
          <span className="truncate pl-3 tracking-normal text-ink-muted normal-case">
            {trail.join(' › ')}
          </span>
        ) : (
          <span className="truncate pl-3">Site / area / machine / point</span>
        )}
        <span className="truncate">
          <span className="lg:hidden">Type · tag</span>
          <span className="hidden lg:inline">Type, speed · tag, direction</span>
        </span>
        <span>Status</span>
        <span className="text-right whitespace-nowrap">Last snapshot</span>
      </div>
      <div
        ref={scrollRef}
        role="tree"
        aria-label={label}
        tabIndex={0}
        aria-activedescendant={activeRendered && activeRow ? rowId(activeRow.key) : undefined}
        onKeyDown={onKeyDown}
        onFocus={(event) => {
          if (event.target === event.currentTarget && !activeRendered) moveTo(activeIndex);
        }}
        className="group relative min-h-64 flex-1 overflow-y-auto [scrollbar-gutter:stable] focus-visible:outline-none"
      >
        <div role="none" className="relative w-full" style={{ height: view.totalSize }}>
          {items.map((item) => {
            const row = rows[item.index];
            if (!row) return null;
            return (
              <FleetTreeRow
                key={row.key}
                id={rowId(row.key)}
                row={row}
                active={item.index === activeIndex}
                now={now}
                style={{ height: item.size, transform: `translateY(${item.start}px)` }}
                onSelect={() => {
                  setActiveKey(row.key);
                  if (isExpandable(row)) onToggle(row.key);
                }}
              />
            );
          })}
        </div>
      </div>
    </div>
  );
}
