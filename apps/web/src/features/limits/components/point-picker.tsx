import { Field, Select } from '../../../components/ui/field.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { useFleetPoints } from '../api/get-fleet-points.ts';

/** Choose a point from the fleet, grouped by site and machine. */
export function PointPicker({
  value,
  onChange,
}: {
  value: number | null;
  onChange: (pointId: number | null) => void;
}) {
  const points = useFleetPoints();
  if (points.isPending) return <Spinner label="Loading points…" />;
  if (points.isError)
    return <ErrorState error={points.error} onRetry={() => void points.refetch()} />;
  const groups = new Map<string, typeof points.data>();
  for (const p of points.data) {
    const key = `${p.siteName} · ${p.machineName}`;
    groups.set(key, [...(groups.get(key) ?? []), p]);
  }
  return (
    <Field label="Point" className="max-w-xl">
      {(c) => (
        <Select
          id={c.id}
          value={value ?? ''}
          onChange={(e) => onChange(Number(e.target.value) || null)}
        >
          <option value="">Choose a point…</option>
          {[...groups].map(([label, list]) => (
            <optgroup key={label} label={label}>
              {list.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.tag} — {p.name}
                </option>
              ))}
            </optgroup>
          ))}
        </Select>
      )}
    </Field>
  );
}
