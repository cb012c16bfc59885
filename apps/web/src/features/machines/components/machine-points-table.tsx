import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { cn } from '../../../lib/cn.ts';
import type { MachineDetail } from '@turnstone/contracts/points';
import { Sparkline } from '../../../components/charts/sparkline.tsx';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import { StatusMark } from '../../../components/ui/status-mark.tsx';
import { PointLabel } from '../../../components/ui/text-link.tsx';
import { TableHead, type TableColumn } from '../../../components/ui/table-head.tsx';
import { useUnits } from '../../account/api/use-units.ts';
import { paths } from '../../../config/paths.ts';
import { formatBandHz } from '../../../lib/format.ts';
import { Age } from '../../../components/ui/age.tsx';
import { isoZoneRange } from '../lib/iso-zone-range.ts';

const verdictText = { ok: 'OK', suspect: 'Suspect', unusable: 'Unusable' } as const;
const speedSourceText = {
  tach: 'tach',
  rpm: 'gateway',
  estimated: 'estimated',
  none: 'unknown',
} as const;

const num = (v: number | undefined | null, unit: string, digits = 3) =>
  v === undefined || v === null || !Number.isFinite(v)
    ? '—'
    : `${formatValue(v, digits)}\u00a0${unit}`;

/** Columns a tablet (below 1024 px) leaves out; the point page has them all. */
const wide = 'hidden lg:table-cell';

const columns: TableColumn[] = [
  'Point',
  'Status',
  { label: 'Velocity RMS', numeric: true },
  { label: 'Accel RMS', numeric: true },
  { label: 'Displ. pk-pk', numeric: true, className: wide },
  'ISO 20816',
  { label: 'Speed', numeric: true, className: wide },
  { label: 'Quality', className: wide },
  'Governing band, last 50',
  { label: 'Last snapshot', numeric: true },
];

/** An overall value's cell, with the frequency band it was measured over below it. */
function OverallCell({
  band,
  className,
  children,
}: {
  band: Parameters<typeof formatBandHz>[0] | undefined;
  className?: string;
  children: ReactNode;
}) {
  return (
    <td className={cn(className, 'px-3 py-2 text-right font-mono text-[13px]')}>
      {children}
      {band ? <div className="font-sans text-xs text-ink-faint">{formatBandHz(band)}</div> : null}
    </td>
  );
}

/**
 * The machine's points with their latest overall values, ISO zone (with its range for the
 * machine's class), speed, quality and a small trend of the band that governs the point.
 */
export function MachinePointsTable({ machine, now }: { machine: MachineDetail; now: number }) {
  // Velocity and displacement in the user's unit system (stored mm/s and µm).
  const units = useUnits();
  const shown = (v: number | undefined, unit: string) =>
    v === undefined ? undefined : units.value(v, unit);
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[46rem] text-left text-sm lg:min-w-[68rem]">
        <TableHead look="lined" columns={columns} />
        <tbody>
          {machine.points.map((p) => {
            const l = p.latest;
            return (
              <tr key={p.id} className="border-b border-line/60 align-middle hover:bg-sunken/40">
                <td className="px-3 py-2">
                  <PointLabel
                    pointId={p.id}
                    title={p.name}
                    titleIs="name"
                    detail={`${p.tag} · ${p.direction}`}
                  />
                </td>
                <td className="px-3 py-2">
                  <StatusMark status={p.status} />
                </td>
                <OverallCell band={l?.overall.velocityBandHz}>
                  {num(shown(l?.overall.velocityRmsMmS, 'mm/s'), units.unit('mm/s'))}
                </OverallCell>
                <OverallCell band={l?.overall.accelBandHz}>
                  {num(l?.overall.accelRmsG, 'g')}
                </OverallCell>
                <OverallCell band={l?.overall.velocityBandHz} className={wide}>
                  {num(shown(l?.overall.displacementPkPkUm, 'um'), units.unit('um'))}
                </OverallCell>
                <td className="px-3 py-2 text-[13px]">
                  {l?.isoZone ? `Zone ${l.isoZone}` : '—'}
                  {l?.isoZone && machine.isoBoundaries ? (
                    <div className="font-mono text-xs text-ink-faint">
                      {isoZoneRange(l.isoZone, machine.isoBoundaries, units)}
                    </div>
                  ) : null}
                </td>
                <td className={`${wide} px-3 py-2 text-right font-mono text-[13px]`}>
                  {l?.speedRpm ? (
                    <>
                      {formatValue(l.speedRpm, 4)}&nbsp;r/min
                      <div className="font-sans text-xs text-ink-faint">
                        {speedSourceText[l.speedSource]}
                      </div>
                    </>
                  ) : (
                    '—'
                  )}
                </td>
                <td className={`${wide} px-3 py-2 text-[13px]`}>
                  {l ? verdictText[l.verdict] : '—'}
                </td>
                <td className="px-3 py-2">
                  <Link
                    to={paths.app.point.getHref(p.id, p.governing.key)}
                    className="flex flex-col gap-0.5 underline-offset-2 hover:underline"
                  >
                    <Sparkline
                      values={p.governing.values.map((r) => r.v)}
                      label={`${p.governing.name} of ${p.name}, last ${p.governing.values.length} values in ${units.unit(p.governing.unit)}`}
                    />
                    <span className="text-xs text-ink-muted">
                      {p.governing.name}
                      {p.governing.level ? ` · in ${p.governing.level}` : ''}
                    </span>
                  </Link>
                </td>
                <td className="px-3 py-2 text-right">
                  <Age
                    at={l?.takenAt ?? null}
                    now={now}
                    className="font-mono text-[12.5px] text-ink-muted"
                    neverClassName="text-xs"
                  />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
