import type { ReactNode } from 'react';
import type { AnalysisSummary } from '@turnstone/contracts/points';
import { ViewCard } from './view-card.tsx';
import { Field, Select } from '../../../components/ui/field.tsx';
import { formatQuantity } from '@turnstone/contracts/number-format';
import type { UnitSystem } from '@turnstone/contracts/units';
import { formatBandHz, formatDateTime } from '../../../lib/format.ts';
import { useUnits } from '../../account/api/use-units.ts';

const verdictText = { ok: 'OK', suspect: 'suspect', unusable: 'unusable' } as const;

export function snapshotLabel(a: AnalysisSummary, system: UnitSystem = 'metric'): string {
  return `${formatDateTime(a.takenAt)} · ${formatQuantity(a.overall.velocityRmsMmS, 'mm/s', system)} (${formatBandHz(a.overall.velocityBandHz)}) · ${verdictText[a.verdict]}${a.spectraThinned ? ' · values only' : ''}`;
}

/** Picks one capture of the point from its analyses list (newest first). */
export function SnapshotPicker({
  label,
  analyses,
  value,
  onChange,
  allowNone = false,
}: {
  label: string;
  analyses: readonly AnalysisSummary[];
  value: number | null;
  onChange: (id: number | null) => void;
  allowNone?: boolean;
}) {
  const units = useUnits();
  return (
    <Field label={label} className="min-w-72">
      {(c) => (
        <Select
          id={c.id}
          value={value ?? ''}
          onChange={(e) => onChange(e.target.value === '' ? null : Number(e.target.value))}
          className="font-mono text-[13px]"
        >
          {allowNone && <option value="">None</option>}
          {analyses.map((a) => (
            <option key={a.id} value={a.id}>
              {snapshotLabel(a, units.system)}
            </option>
          ))}
        </Select>
      )}
    </Field>
  );
}

/**
 * A view of one capture: a card headed by the picker of its snapshot, with what stands beside
 * the picker (`beside`) and the view itself under it.
 */
export function SnapshotCard({
  analyses,
  selectedId,
  onSelect,
  beside,
  children,
}: {
  analyses: readonly AnalysisSummary[];
  selectedId: number | null;
  onSelect: (id: number | null) => void;
  beside?: ReactNode;
  children: ReactNode;
}) {
  return (
    <ViewCard
      head={
        <>
          <SnapshotPicker
            label="Snapshot"
            analyses={analyses}
            value={selectedId}
            onChange={onSelect}
          />
          {beside}
        </>
      }
    >
      {children}
    </ViewCard>
  );
}
