/** The replay drawn on the band's stored trend (loaded lazily: it pulls in ECharts). */
import type { ReplayResponse } from '@turnstone/contracts/limits';
import { displayUnit } from '@turnstone/contracts/units';
import { useMemo } from 'react';
import { TrendChart } from '../../../components/charts/trend-chart.tsx';
import { formatValue } from '../../../components/charts/chart-theme.ts';
import { useUnits } from '../../account/api/use-units.ts';

export function ReplayChart({
  band,
  current,
}: {
  band: ReplayResponse['bands'][number];
  /** The levels in force now, drawn lighter behind the proposed ones. */
  current?: { alertLevel: number; dangerLevel: number } | undefined;
}) {
  // Values and levels in the user's unit system (stored metric). Memoised: the chart keeps its
  // zoom only while its arrays stay the same, and the editor around it re-renders on each key.
  const units = useUnits();
  const chart = useMemo(() => {
    const k = (v: number) => units.value(v, band.unit);
    const levels = ['alert', 'danger'] as const;
    const levelOf = { alert: 'alertLevel', danger: 'dangerLevel' } as const;
    const line = (level: (typeof levels)[number], value: number, which: string, muted = false) => ({
      value: k(value),
      level,
      label: `${which} ${level} ${formatValue(k(value))}`,
      muted,
    });
    const raisedAlert = band.alerts.filter((a) => a.raisedLevel === 'alert');
    const dangerPoints = band.alerts.flatMap((a) => {
      if (a.raisedLevel === 'danger')
        return [{ t: a.raisedAt, v: k(a.raisedValue), label: 'would raise danger' }];
      if (a.escalatedAt) {
        const v = band.values.find((x) => x.t === a.escalatedAt)?.v ?? a.peakValue;
        return [{ t: a.escalatedAt, v: k(v), label: 'would escalate to danger' }];
      }
      return [];
    });
    return {
      points: band.values.map((x) => ({ ...x, v: k(x.v) })),
      limits: [
        ...levels.map((l) => line(l, band[levelOf[l]], 'Proposed')),
        // The levels in force now, where they differ from the proposed ones.
        ...levels
          .filter((l) => current && current[levelOf[l]] !== band[levelOf[l]])
          .map((l) => line(l, current![levelOf[l]], 'Current', true)),
      ],
      markerSeries: [
        {
          name: 'Would raise alert',
          shape: 'triangle' as const,
          tone: 'alert' as const,
          points: raisedAlert.map((a) => ({
            t: a.raisedAt,
            v: k(a.raisedValue),
            label: 'would raise alert',
          })),
        },
        {
          name: 'Would reach danger',
          shape: 'diamond' as const,
          tone: 'danger' as const,
          points: dangerPoints,
        },
      ],
    };
  }, [band, current, units]);
  return (
    <TrendChart
      ariaLabel={`${band.bandName}: stored values with the proposed levels and the alerts they would have raised`}
      name={band.bandName}
      unit={displayUnit(band.unit, units.system)}
      height={300}
      {...chart}
    />
  );
}
