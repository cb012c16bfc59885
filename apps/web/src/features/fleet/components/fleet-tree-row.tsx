import { Link } from 'react-router-dom';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { StrokePath } from '../../../components/ui/icon.tsx';
import { paths } from '../../../config/paths.ts';
import { cn } from '../../../lib/cn.ts';
import { formatInteger } from '../../../lib/format.ts';
import { Age } from '../../../components/ui/age.tsx';
import type { FleetRow } from '../utils/build-fleet-rows.ts';
import { directionLabels, machineTypeLabels } from '../../../lib/machine-labels.ts';

/** Grid shared by the column header and every row, so columns line up. */
export const fleetGridColumns =
  'grid grid-cols-[minmax(0,1fr)_10.25rem_7.75rem_6.5rem] lg:grid-cols-[minmax(0,1fr)_16rem_9.5rem_8rem] gap-x-3';

export const rowHeights: Record<FleetRow['kind'], number> = {
  site: 44,
  area: 38,
  machine: 38,
  point: 34,
};

function Chevron({ expanded, hidden }: { expanded: boolean; hidden: boolean }) {
  return (
    <svg
      viewBox="0 0 12 12"
      aria-hidden="true"
      className={cn(
        'size-3 shrink-0 text-ink-faint transition-transform motion-reduce:transition-none',
        expanded && 'rotate-90',
        hidden && 'invisible',
      )}
    >
      <StrokePath d="M4.5 2.5 8 6 4.5 9.5" />
    </svg>
  );
}

const ageLook = {
  className: 'font-mono text-[12.5px] text-ink-muted',
  neverClassName: 'text-[12.5px]',
};

function Count({ n, noun, className }: { n: number; noun: string; className?: string }) {
  return (
    <span className={cn('shrink-0 text-xs text-ink-faint', className)}>
      <span className="font-mono">{formatInteger(n)}</span> {noun}
      {n === 1 ? '' : 's'}
    </span>
  );
}

/** How each kind of row shows its name. */
const nameLook: Record<FleetRow['kind'], string> = {
  site: 'truncate text-[14px] font-semibold',
  area: 'truncate text-[13.5px] font-medium',
  machine: 'truncate text-[13.5px] font-medium underline-offset-2 hover:underline',
  point: 'truncate text-[13px] text-ink underline-offset-2 hover:underline',
};

/** A row's name (a link for machines and points), a site's code, and what the row holds. */
function nameParts(row: FleetRow): {
  name: string;
  href?: string;
  code?: string;
  count?: { n: number; noun: string; className?: string };
} {
  switch (row.kind) {
    case 'site':
      return {
        name: row.site.name,
        code: row.site.code,
        count: { n: row.machineCount, noun: 'machine' },
      };
    case 'area':
      return { name: row.area.name, count: { n: row.machineCount, noun: 'machine' } };
    case 'machine':
      return {
        name: row.machine.name,
        href: paths.app.machine.getHref(row.machine.id),
        count: { n: row.machine.points.length, noun: 'point', className: 'hidden lg:inline' },
      };
    case 'point':
      return { name: row.point.name, href: paths.app.point.getHref(row.point.id) };
  }
}

function NameCell({ row }: { row: FleetRow }) {
  const { name, href, code, count } = nameParts(row);
  const className = nameLook[row.kind];
  return (
    <>
      {href ? (
        <Link to={href} className={className}>
          {name}
        </Link>
      ) : (
        <span className={className}>{name}</span>
      )}
      {code && (
        <span className="shrink-0 rounded-sm bg-sunken px-1.5 py-px font-mono text-[11px] text-ink-muted">
          {code}
        </span>
      )}
      {count && <Count {...count} />}
    </>
  );
}

function DetailCell({ row }: { row: FleetRow }) {
  switch (row.kind) {
    case 'site':
    case 'area':
      return null;
    case 'machine':
      return (
        <span className="flex min-w-0 items-baseline gap-2 text-[13px]">
          <span className="truncate text-ink-muted">{machineTypeLabels[row.machine.type]}</span>
          <span className="shrink-0 font-mono text-[12.5px] text-ink">
            {formatInteger(row.machine.nominalRpm)}&nbsp;r/min
          </span>
        </span>
      );
    case 'point':
      return (
        <span className="flex min-w-0 items-baseline gap-2">
          <span className="truncate font-mono text-[12.5px] text-ink">{row.point.tag}</span>
          <span
            className="shrink-0 text-xs text-ink-muted"
            title={directionLabels[row.point.direction]}
          >
            <span aria-hidden="true" className="font-mono">
              {row.point.direction}
            </span>
            <span className="sr-only">{directionLabels[row.point.direction]}</span>
            <span aria-hidden="true" className="hidden lg:inline">
              {' '}
              {directionLabels[row.point.direction].toLowerCase()}
            </span>
          </span>
        </span>
      );
  }
}

const rowTone: Record<FleetRow['kind'], string> = {
  site: 'bg-sunken/70 border-t border-line',
  area: 'border-t border-line/70',
  machine: 'border-t border-line/50',
  point: '',
};

export function FleetTreeRow({
  row,
  id,
  active,
  now,
  style,
  onSelect,
}: {
  row: FleetRow;
  id: string;
  active: boolean;
  now: number;
  style: React.CSSProperties;
  onSelect: () => void;
}) {
  const expandable =
    row.kind === 'site' ||
    row.kind === 'area' ||
    (row.kind === 'machine' && row.machine.points.length > 0);
  const expanded = row.kind === 'point' ? false : row.expanded;
  return (
    <div
      id={id}
      role="treeitem"
      aria-level={row.level}
      aria-posinset={row.posInSet}
      aria-setsize={row.setSize}
      aria-expanded={expandable ? expanded : undefined}
      aria-selected={active}
      onClick={onSelect}
      style={style}
      className={cn(
        fleetGridColumns,
        'absolute inset-x-0 top-0 cursor-default items-center pr-3 text-ink select-none',
        rowTone[row.kind],
        active
          ? 'bg-accent-soft group-focus-visible:shadow-[inset_0_0_0_2px_var(--color-accent)]'
          : 'hover:bg-sunken/60',
      )}
    >
      <span
        className={cn(
          'flex min-w-0 items-center gap-2',
          (row.kind === 'site' || row.kind === 'area') && 'col-span-2',
        )}
        style={{ paddingLeft: `${0.75 + (row.level - 1) * 1.25}rem` }}
      >
        <Chevron expanded={expanded} hidden={!expandable} />
        <NameCell row={row} />
      </span>
      {/* Sites and areas have no details: their name may use that column too. */}
      {row.kind !== 'site' && row.kind !== 'area' && (
        <span className="min-w-0">
          <DetailCell row={row} />
        </span>
      )}
      <StatusMark status={row.status} />
      <span className="text-right">
        {row.kind === 'machine' && <Age at={row.lastTakenAt} now={now} {...ageLook} />}
        {row.kind === 'point' && <Age at={row.point.lastTakenAt} now={now} {...ageLook} />}
      </span>
    </div>
  );
}
