import { cn } from '../../lib/cn.ts';
import { focusItem, rovingTarget } from './roving-keys.ts';

/**
 * A row of toggle buttons with radio semantics, after the WAI-ARIA Authoring Practices radio
 * group pattern: one Tab stop (the checked option), arrow keys move to the next enabled option
 * and choose it, Home and End go to the ends.
 */
export function Segmented<T extends string>({
  label,
  options,
  value,
  onChange,
  disabled,
}: {
  label: string;
  options: readonly { value: T; label: string; disabled?: boolean }[];
  value: T;
  onChange: (v: T) => void;
  disabled?: boolean;
}) {
  const off = (i: number) => Boolean(disabled || options[i]!.disabled);
  const checked = options.findIndex((o) => o.value === value);
  // The Tab stop: the checked option, else the first enabled one.
  const stop = checked >= 0 && !off(checked) ? checked : options.findIndex((_, i) => !off(i));
  return (
    <div
      role="radiogroup"
      aria-label={label}
      className="flex flex-col gap-1.5"
      onKeyDown={(e) => {
        const i = rovingTarget(e, options.length, checked < 0 ? 0 : checked, off);
        if (i === null) return;
        onChange(options[i]!.value);
        focusItem(e, '[role="radio"]', i);
      }}
    >
      <span aria-hidden="true" className="text-sm font-medium text-ink">
        {label}
      </span>
      <div className="inline-flex rounded-md border border-line-strong bg-surface p-0.5">
        {options.map((o, i) => (
          <button
            key={o.value}
            type="button"
            role="radio"
            aria-checked={value === o.value}
            tabIndex={i === stop ? 0 : -1}
            disabled={off(i)}
            onClick={() => onChange(o.value)}
            className={cn(
              'h-8 rounded px-3 text-[13px] font-medium disabled:cursor-not-allowed disabled:text-ink-faint',
              value === o.value ? 'bg-accent text-white' : 'text-ink-muted hover:bg-sunken',
            )}
          >
            {o.label}
          </button>
        ))}
      </div>
    </div>
  );
}
