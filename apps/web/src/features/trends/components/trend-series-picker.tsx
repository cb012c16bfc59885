import { useState } from 'react';
import type { MachinePoint } from '@turnstone/contracts/points';
import { Button } from '../../../components/ui/button.tsx';
import { Field, Select } from '../../../components/ui/field.tsx';
import { useUnits } from '../../account/api/use-units.ts';
import { usePoint } from '../../points/api/get-point.ts';
import { MAX_EXTRA_SERIES, seriesKey, type SeriesRef } from '../utils/trend-selection.ts';

const directionWords = { H: 'horizontal', V: 'vertical', A: 'axial' } as const;

/**
 * Adds a series to the trend: a band of this point or of another point of the machine, and
 * in one step the same band at the other directions (H/V/A) of this point's location.
 */
export function TrendSeriesPicker({
  pointId,
  band,
  points,
  taken,
  onAdd,
}: {
  pointId: number;
  /** The chart's band (the one the other directions are added in). */
  band: string;
  /** The machine's points. */
  points: readonly MachinePoint[];
  /** Series already on the chart, the band included. */
  taken: readonly SeriesRef[];
  onAdd: (list: SeriesRef[]) => void;
}) {
  const units = useUnits();
  const [picked, setPicked] = useState(pointId);
  const other = usePoint(picked);
  const [bandKey, setBandKey] = useState('');
  const takenKeys = new Set(taken.map(seriesKey));
  const room = MAX_EXTRA_SERIES + 1 - taken.length;
  const free = (other.data?.bands ?? []).filter(
    (b) => !takenKeys.has(seriesKey({ pointId: picked, band: b.key })),
  );
  const chosen = free.some((b) => b.key === bandKey) ? bandKey : (free[0]?.key ?? '');
  const here = points.find((p) => p.id === pointId);
  const siblings = here
    ? points.filter(
        (p) =>
          p.id !== pointId &&
          p.location === here.location &&
          !takenKeys.has(seriesKey({ pointId: p.id, band })),
      )
    : [];

  return (
    <div className="flex flex-wrap items-end gap-3" role="group" aria-label="Add a series">
      <Field label="Add from point" className="min-w-56">
        {(c) => (
          <Select
            id={c.id}
            value={picked}
            onChange={(e) => {
              setPicked(Number(e.target.value));
              setBandKey('');
            }}
          >
            {points.map((p) => (
              <option key={p.id} value={p.id}>
                {p.id === pointId ? 'This point' : p.tag} — {p.location},{' '}
                {directionWords[p.direction]}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <Field label="Series band" className="min-w-56">
        {(c) => (
          <Select
            id={c.id}
            value={chosen}
            disabled={free.length === 0}
            onChange={(e) => setBandKey(e.target.value)}
          >
            {free.length === 0 && (
              <option value="">{other.isPending ? 'Loading bands…' : 'No other band'}</option>
            )}
            {free.map((b) => (
              <option key={b.key} value={b.key}>
                {b.name} ({units.unit(b.unit)})
              </option>
            ))}
          </Select>
        )}
      </Field>
      <Button
        size="sm"
        className="h-9"
        disabled={!chosen || room <= 0}
        onClick={() => onAdd([{ pointId: picked, band: chosen }])}
      >
        Add series
      </Button>
      {siblings.length > 0 && (
        <Button
          size="sm"
          variant="ghost"
          className="h-9"
          disabled={room <= 0}
          onClick={() => onAdd(siblings.slice(0, room).map((p) => ({ pointId: p.id, band })))}
        >
          Add {siblings.map((p) => p.direction).join(' and ')} at {here!.location}
        </Button>
      )}
      {room <= 0 && (
        <p className="text-xs text-ink-muted">
          {MAX_EXTRA_SERIES + 1} series at most: remove one to add another.
        </p>
      )}
    </div>
  );
}
