/** The replay drawn on the band's stored trend (loaded lazily: it pulls in ECharts). */
import type { ReplayResponse } from '@turnstone/contracts/limits';
import { TrendChart } from '../../../components/charts/trend-chart.tsx';

export function ReplayChart({
  band,
  current,
}: {
  band: ReplayResponse['bands'][number];
  /** The levels in force now, drawn lighter behind the proposed ones. */
  current?: { alertLevel: number; dangerLevel: number } | undefined;
}) {
  const raisedAlert = band.alerts.filter((a) => a.raisedLevel === 'alert');
  const dangerPoints = band.alerts.flatMap((a) => {
    if (a.raisedLevel === 'danger')
      return [{ t: a.raisedAt, v: a.raisedValue, label: 'would raise danger' }];
    if (a.escalatedAt) {
      const v = band.values.find((x) => x.t === a.escalatedAt)?.v ?? a.peakValue;
      return [{ t: a.escalatedAt, v, label: 'would escalate to danger' }];
    }
    return [];
  });
  return (
    <TrendChart
      ariaLabel={`${band.bandName}: stored values with the proposed levels and the alerts they would have raised`}
      name={band.bandName}
      unit={band.unit}
      points={band.values}
      height={300}
      limits={[
        { value: band.alertLevel, level: 'alert', label: `Proposed alert ${band.alertLevel}` },
        { value: band.dangerLevel, level: 'danger', label: `Proposed danger ${band.dangerLevel}` },
        ...(current && current.alertLevel !== band.alertLevel
          ? [
              {
                value: current.alertLevel,
                level: 'alert' as const,
                label: `Current alert ${current.alertLevel}`,
                muted: true,
              },
            ]
          : []),
        ...(current && current.dangerLevel !== band.dangerLevel
          ? [
              {
                value: current.dangerLevel,
                level: 'danger' as const,
                label: `Current danger ${current.dangerLevel}`,
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
            v: a.raisedValue,
            label: 'would raise alert',
          })),
        },
        { name: 'Would reach danger', shape: 'diamond', tone: 'danger', points: dangerPoints },
      ]}
    />
  );
}
