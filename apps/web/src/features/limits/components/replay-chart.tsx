/** The replay drawn on the band's stored trend (loaded lazily: it pulls in ECharts). */
import type { ReplayResponse } from '@turnstone/contracts/limits';
import { displayUnit } from '@turnstone/contracts/units';
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
  // Values and levels in the user's unit system (stored metric).
  const units = useUnits();
  const k = (v: number) => units.value(v, band.unit);
  const f = (v: number) => formatValue(k(v));
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
  return (
    <TrendChart
      ariaLabel={`${band.bandName}: stored values with the proposed levels and the alerts they would have raised`}
      name={band.bandName}
      unit={displayUnit(band.unit, units.system)}
      points={band.values.map((x) => ({ ...x, v: k(x.v) }))}
      height={300}
      limits={[
        {
          value: k(band.alertLevel),
          level: 'alert',
          label: `Proposed alert ${f(band.alertLevel)}`,
        },
        {
          value: k(band.dangerLevel),
          level: 'danger',
          label: `Proposed danger ${f(band.dangerLevel)}`,
        },
        ...(current && current.alertLevel !== band.alertLevel
          ? [
              {
                value: k(current.alertLevel),
                level: 'alert' as const,
                label: `Current alert ${f(current.alertLevel)}`,
                muted: true,
              },
            ]
          : []),
        ...(current && current.dangerLevel !== band.dangerLevel
          ? [
              {
                value: k(current.dangerLevel),
                level: 'danger' as const,
                label: `Current danger ${f(current.dangerLevel)}`,
                muted: true,
              },
            ]
          : []),
      ]}
      markerSeries={[
        {
          name: 'Would raise alert',
          shape: 'triangle',
          tone: 'alert',
          points: raisedAlert.map((a) => ({
            t: a.raisedAt,
            v: k(a.raisedValue),
            label: 'would raise alert',
          })),
        },
        { name: 'Would reach danger', shape: 'diamond', tone: 'danger', points: dangerPoints },
      ]}
    />
  );
}
