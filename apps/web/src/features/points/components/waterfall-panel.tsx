import { useMemo, useState } from 'react';
import { WaterfallChart } from '../../../components/charts/waterfall-chart.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Field, Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { formatDateTime, formatShortDateTime } from '../../../lib/format.ts';
import { useUnits } from '../../account/api/use-units.ts';
import { useWaterfall } from '../api/get-waterfall.ts';

type Kind = 'acceleration' | 'velocity' | 'envelope' | 'order';
const kindLabels: Record<Kind, string> = {
  acceleration: 'Acceleration (Hz)',
  velocity: 'Velocity (Hz)',
  envelope: 'Envelope (Hz)',
  order: 'Acceleration (orders)',
};

export function WaterfallPanel({ pointId }: { pointId: number }) {
  const [kind, setKind] = useState<Kind>('acceleration');
  const [limit, setLimit] = useState(20);
  const q = useWaterfall(pointId, kind, limit);
  // Lines in the reader's unit system: velocity in in/s for imperial (stored mm/s); g stays g.
  const units = useUnits();
  const traces = useMemo(() => {
    const f = q.data ? units.value(1, q.data.unit) : 1;
    return (q.data?.items ?? []).map((i) => ({
      label: formatDateTime(i.takenAt),
      short: formatShortDateTime(i.takenAt),
      values: f === 1 ? i.decoded : i.decoded.map((v) => v * f),
      step: i.step,
      shaftHz: i.shaftHz,
    }));
  }, [q.data, units]);
  return (
    <Card className="flex flex-col gap-4 p-4">
      <div className="flex flex-wrap items-end gap-4">
        <Field label="Spectrum">
          {(c) => (
            <Select id={c.id} value={kind} onChange={(e) => setKind(e.target.value as Kind)}>
              {(Object.keys(kindLabels) as Kind[]).map((k) => (
                <option key={k} value={k}>
                  {kindLabels[k]}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Spectra">
          {(c) => (
            <Select id={c.id} value={limit} onChange={(e) => setLimit(Number(e.target.value))}>
              {[10, 20, 40].map((n) => (
                <option key={n} value={n}>
                  Last {n}
                </option>
              ))}
            </Select>
          )}
        </Field>
        {traces.length > 0 && (
          <p className="text-xs text-ink-muted">
            Front (accent): <span className="font-mono">{traces[0]!.label}</span>; back:{' '}
            <span className="font-mono">{traces[traces.length - 1]!.label}</span>
          </p>
        )}
      </div>
      {q.isPending ? (
        <LoadingPanel label="Loading spectra…" />
      ) : q.isError ? (
        <ErrorState
          title="Could not load the waterfall"
          error={q.error}
          onRetry={() => void q.refetch()}
        />
      ) : traces.length === 0 ? (
        <EmptyState title="No spectra of this kind yet" />
      ) : (
        <WaterfallChart
          traces={traces}
          axis={q.data.axis}
          unit={units.unit(q.data.unit)}
          scale={q.data.scale === 'rms' ? 'RMS' : 'peak'}
          ariaLabel={`Waterfall of the last ${traces.length} ${kindLabels[kind]} spectra, newest in front`}
        />
      )}
    </Card>
  );
}
