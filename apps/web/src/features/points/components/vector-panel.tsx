import { useMemo, useState } from 'react';
import type { AnalysisSummary } from '@turnstone/contracts/points';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import {
  VectorPolarChart,
  VectorTrendChart,
  type VectorPoint,
} from '../../../components/charts/vector-charts.tsx';
import { ViewCard } from './view-card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { Segmented } from '../../../components/ui/segmented.tsx';
import { useUnits } from '../../account/api/use-units.ts';

/**
 * The 1× (or 2×) vector of every capture with a tach: amplitude and phase over time and as a
 * polar plot — a developing unbalance grows in amplitude at a steady phase; a change in phase
 * at a steady amplitude points elsewhere (a shift of the rotor, a crack, a sensor moved).
 */
export function VectorPanel({ analyses }: { analyses: readonly AnalysisSummary[] }) {
  const [order, setOrder] = useState<'1' | '2'>('1');
  // Amplitudes in the reader's unit system (stored in mm/s; in/s for imperial).
  const units = useUnits();
  const unit = `${units.unit('mm/s')} RMS`;
  const points = useMemo((): (VectorPoint & { id: number; takenAt: string })[] => {
    const out: (VectorPoint & { id: number; takenAt: string })[] = [];
    for (const a of analyses) {
      const v = a.shaftVectors?.find((x) => x.order === Number(order));
      if (v)
        out.push({
          id: a.id,
          takenAt: a.takenAt,
          t: Date.parse(a.takenAt),
          amplitude: units.value(v.velocityRmsMmS, 'mm/s'),
          phaseDeg: v.velocityPhaseDeg,
        });
    }
    return out.sort((x, y) => x.t - y.t);
  }, [analyses, order, units]);
  const name = `${order}×`;
  if (points.length === 0)
    return (
      <EmptyState
        title="No vectors"
        description="Only captures sent with tach pulses carry the shaft vector."
      />
    );
  const recent = points.slice(-8).reverse();
  return (
    <ViewCard
      head={
        <>
          <Segmented
            label="Order"
            value={order}
            onChange={setOrder}
            options={[
              { value: '1', label: '1×' },
              { value: '2', label: '2×' },
            ]}
          />
          <p className="max-w-2xl text-xs text-ink-muted">
            Velocity in {unit}; phase is the lag in degrees of the {name} cycle from the tach pulse
            to the positive velocity peak (0–360°, growing as the peak comes later), drawn clockwise
            from the top on the polar plot. {points.length} captures with a tach.
          </p>
        </>
      }
    >
      <div className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <VectorTrendChart
          points={points}
          unit={unit}
          ariaLabel={`${name} vector over time: amplitude in ${unit} and phase lag in degrees, ${points.length} captures`}
        />
        <VectorPolarChart
          points={points}
          unit={unit}
          ariaLabel={`${name} vector polar plot: phase lag clockwise from the top, amplitude as radius; the newest capture is the large diamond`}
        />
      </div>
      <div className="overflow-x-auto">
        <table className="w-full max-w-xl text-left text-sm">
          <caption className="mb-1 text-left text-sm font-semibold text-ink">
            Latest {name} vectors
          </caption>
          <thead className="text-xs text-ink-muted">
            <tr className="border-b border-line">
              <th className="py-1 pr-4 font-medium">Taken</th>
              <th className="py-1 pr-4 text-right font-medium">Amplitude ({unit})</th>
              <th className="py-1 text-right font-medium">Phase lag (°)</th>
            </tr>
          </thead>
          <tbody className="font-mono text-[13px]">
            {recent.map((p) => (
              <tr key={p.id} className="border-b border-line/60">
                <td className="py-1 pr-4">{formatDateTime(p.takenAt)}</td>
                <td className="py-1 pr-4 text-right">{formatValue(p.amplitude, 3)}</td>
                <td className="py-1 text-right">{p.phaseDeg.toFixed(0)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </ViewCard>
  );
}
