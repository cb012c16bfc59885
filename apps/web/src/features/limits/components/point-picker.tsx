import { useRef, useState } from 'react';
import { Field, Select } from '../../../components/ui/field.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { useFleetPoints } from '../api/get-fleet-points.ts';

/**
 * Choose a point from the fleet, grouped by site and machine. Arrow keys on the closed list
 * only move the choice; Enter or leaving the list opens it (WCAG 3.2.2: no change of context
 * on input). A pick with the mouse opens at once.
 */
export function PointPicker({
  value,
  onChange,
}: {
  value: number | null;
  onChange: (pointId: number | null) => void;
}) {
  const points = useFleetPoints();
  const [pending, setPending] = useState<number | null | undefined>(undefined);
  const keyed = useRef(false);
  const commit = (id: number | null | undefined) => {
    setPending(undefined);
    if (id !== undefined && id !== value) onChange(id);
  };
  if (points.isPending) return <Spinner label="Loading points…" />;
  if (points.isError)
    return <ErrorState error={points.error} onRetry={() => void points.refetch()} />;
  const groups = new Map<string, typeof points.data>();
  for (const p of points.data) {
    const key = `${p.siteName} · ${p.machineName}`;
    groups.set(key, [...(groups.get(key) ?? []), p]);
  }
  return (
    <Field
      label="Point"
      className="max-w-xl"
      hint="With the keyboard: arrow keys choose, Enter opens the point."
    >
      {(c) => (
        <Select
          id={c.id}
          aria-describedby={c['aria-describedby']}
          value={(pending === undefined ? value : pending) ?? ''}
          onKeyDown={(e) => {
            if (e.key === 'Enter') {
              e.preventDefault();
              commit(pending);
            } else keyed.current = e.key !== 'Tab';
          }}
          onChange={(e) => {
            const id = Number(e.target.value) || null;
            if (keyed.current) setPending(id);
            else commit(id);
            keyed.current = false;
          }}
          onBlur={() => commit(pending)}
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
