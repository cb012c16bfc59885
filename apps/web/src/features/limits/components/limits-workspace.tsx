import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { useLimits } from '../api/get-limits.ts';
import { LimitsEditor } from './limits-editor.tsx';
import { PointPicker } from './point-picker.tsx';

/** Point picker (kept in the URL as ?point=) and the chosen point's band editor. */
export function LimitsWorkspace() {
  const [params, setParams] = useSearchParams();
  const pointId = Number(params.get('point')) || null;
  const limits = useLimits(pointId);
  const [saved, setSaved] = useState<string | null>(null);
  return (
    <div className="flex flex-col gap-4">
      <PointPicker
        value={pointId}
        onChange={(id) => {
          setSaved(null);
          setParams(id ? { point: String(id) } : {}, { replace: true });
        }}
      />
      {pointId === null ? (
        <Card>
          <EmptyState
            title="Choose a point"
            description="Pick a measurement point to see and edit its alarm bands."
          />
        </Card>
      ) : limits.isPending ? (
        <LoadingPanel label="Loading the limit set…" />
      ) : limits.isError ? (
        <Card>
          <ErrorState
            title="Could not load the limits"
            error={limits.error}
            onRetry={() => void limits.refetch()}
          />
        </Card>
      ) : (
        <>
          <p className="text-sm text-ink-muted">
            {limits.data.machine.name} · <span className="font-mono">{limits.data.point.tag}</span>{' '}
            · ISO 20816-3 group {limits.data.machine.isoGroup}, {limits.data.machine.foundation}{' '}
            foundation, <span className="font-mono">{limits.data.machine.nominalRpm} r/min</span>
            {limits.data.version === 0 && ' · not measured yet: these are the template’s bands'}
          </p>
          {/* Remount on point or version change so the form starts from the stored set. */}
          {saved && (
            <p
              role="status"
              className="rounded-md border border-line bg-accent-soft px-3 py-2 text-sm text-ink"
            >
              {saved} The change and its reason are in the audit log.
            </p>
          )}
          <LimitsEditor
            key={`${pointId}-${limits.data.version}`}
            limits={limits.data}
            onSaved={setSaved}
          />
        </>
      )}
    </div>
  );
}
