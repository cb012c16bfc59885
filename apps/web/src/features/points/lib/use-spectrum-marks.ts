/**
 * The spectrum's fault-frequency marks: one family per fault frequency (running speed once,
 * as 1×), each drawn with its harmonics, and which families are switched on — by default
 * running speed, gears, blades and the bearing the point sits on (only the alerting defect
 * frequency of it when the view was opened on a bearing band).
 */
import { useMemo, useState } from 'react';
import type { FaultFrequencyItem, PointBand } from '@turnstone/contracts/points';
import type { ChartMark } from '../../../components/charts/spectrum-chart.tsx';
import type { MarkFamily } from '../../../components/charts/spectrum-marker-key.tsx';
import { harmonicMarks } from '../../../components/charts/spectrum-math.ts';
import type { Axis } from './spectrum-view.ts';

/** Harmonics drawn of each fault frequency (1× … 5×). Common practice, no source. */
export const MARK_HARMONICS = 5;

const bearingKinds = new Set(['bpfo', 'bpfi', 'bsf', 'ftf']);

export function useSpectrumMarks({
  faults,
  axis,
  bearing,
  band,
  xMax,
}: {
  faults: readonly FaultFrequencyItem[] | undefined;
  axis: Axis;
  bearing: string | null;
  band: PointBand | null;
  xMax: number;
}) {
  const [pick, setPick] = useState<Set<string> | null>(null);
  const families = useMemo((): (MarkFamily & { defaultOn: boolean })[] => {
    if (!faults) return [];
    const faultKind = band?.range?.kind === 'fault' ? band.range.fault : null;
    const onlyKind = faultKind !== null && bearingKinds.has(faultKind) ? faultKind : null;
    return faults
      .filter((f) => f.kind !== 'shaft' || f.order === 1)
      .map((f) => ({
        name: f.name,
        kind: f.kind,
        x: axis === 'order' ? f.order : (f.hz ?? NaN),
        defaultOn:
          !bearingKinds.has(f.kind) ||
          bearing === null ||
          (f.name.startsWith(`${bearing} `) && (onlyKind === null || f.kind === onlyKind)),
      }))
      .filter((f) => Number.isFinite(f.x) && f.x > 0);
  }, [faults, axis, bearing, band]);
  const shown = useMemo(
    () => pick ?? new Set(families.filter((f) => f.defaultOn).map((f) => f.name)),
    [pick, families],
  );
  const allMarks = useMemo(
    (): ChartMark[] =>
      families.flatMap((f) =>
        harmonicMarks([f], MARK_HARMONICS, xMax).map((m) => ({ ...m, kind: f.kind })),
      ),
    [families, xMax],
  );
  const marks = useMemo(() => allMarks.filter((m) => shown.has(m.family)), [allMarks, shown]);
  const toggle = (name: string) => {
    const next = new Set(shown);
    if (next.has(name)) next.delete(name);
    else next.add(name);
    setPick(next);
  };
  /** This family alone; when it already is alone, every family again. */
  const only = (name: string) =>
    setPick(
      shown.size === 1 && shown.has(name) ? new Set(families.map((f) => f.name)) : new Set([name]),
    );
  return { families, shown, allMarks, marks, toggle, only };
}
