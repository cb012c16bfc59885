/**
 * The fault-frequency key under the spectrum: one toggle per family (a fault frequency with
 * its harmonics), with its line style, colour, name and fundamental as text.
 */
import { formatValue } from './chart-theme.ts';
import { markColour, markDash, type MarkKind } from './spectrum-option.ts';
import { cn } from '../../lib/cn.ts';
import { LevelLine } from './level-line.tsx';

export interface MarkFamily {
  name: string;
  kind: MarkKind;
  /** The fundamental on the chart's axis. */
  x: number;
}

const dash: Record<'solid' | 'dashed' | 'dotted', string> = {
  solid: '',
  dashed: '4 3',
  dotted: '1.5 2.5',
};

export function MarkerKey({
  families,
  shown,
  onToggle,
  onOnly,
  unit,
  harmonics,
}: {
  families: readonly MarkFamily[];
  shown: ReadonlySet<string>;
  onToggle: (name: string) => void;
  /** Show this family alone (or, when it is already alone, all of them again). */
  onOnly: (name: string) => void;
  unit: string;
  harmonics: number;
}) {
  if (families.length === 0) return null;
  return (
    <div className="flex flex-col gap-1 px-2">
      <p className="text-xs text-ink-muted">
        Fault frequencies with {harmonics > 1 ? `harmonics up to ${harmonics}×` : 'no harmonics'}:
        switch a family on or off; hover a line for its name.
      </p>
      <ul aria-label="Frequency markers" className="flex flex-wrap gap-x-2 gap-y-1 text-xs">
        {families.map((f) => {
          const on = shown.has(f.name);
          return (
            <li key={f.name} className="inline-flex items-center">
              <button
                type="button"
                aria-pressed={on}
                onClick={() => onToggle(f.name)}
                className={cn(
                  'inline-flex items-center gap-1.5 rounded-l border border-line px-1.5 py-0.5',
                  on ? 'bg-surface text-ink' : 'bg-paper text-ink-muted line-through',
                )}
              >
                <svg viewBox="0 0 18 6" aria-hidden="true" className="h-1.5 w-[18px]">
                  <LevelLine
                    y={3}
                    width={18}
                    colour={markColour[f.kind]}
                    dash={dash[markDash[f.kind]]}
                    thickness={2}
                  />
                </svg>
                <span>{f.name}</span>
                <span className="font-mono">
                  {formatValue(f.x, 4)} {unit}
                </span>
              </button>
              <button
                type="button"
                onClick={() => onOnly(f.name)}
                aria-label={`Show only ${f.name}`}
                className="rounded-r border border-l-0 border-line px-1.5 py-0.5 text-ink-muted hover:text-ink"
              >
                only
              </button>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
