import { cn } from '../../lib/cn.ts';

const sizes = { sm: 'size-3.5', md: 'size-5', lg: 'size-8' } as const;

/** A turning ring. Decorative: pair it with text, or give it a `label`. */
export function Spinner({
  size = 'md',
  label,
  className,
}: {
  size?: keyof typeof sizes;
  label?: string;
  className?: string;
}) {
  return (
    <span role={label ? 'status' : undefined} className="inline-flex items-center gap-2">
      <svg
        viewBox="0 0 24 24"
        aria-hidden="true"
        className={cn(
          'animate-spin text-accent motion-reduce:animate-none',
          sizes[size],
          className,
        )}
      >
        <circle
          cx="12"
          cy="12"
          r="9"
          fill="none"
          stroke="currentColor"
          strokeOpacity="0.2"
          strokeWidth="3"
        />
        <path
          d="M21 12a9 9 0 0 0-9-9"
          fill="none"
          stroke="currentColor"
          strokeWidth="3"
          strokeLinecap="round"
        />
      </svg>
      {label && <span className="text-sm text-ink-muted">{label}</span>}
    </span>
  );
}

/** Centred spinner for a page or panel that is loading. */
export function LoadingPanel({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex min-h-40 flex-1 items-center justify-center p-8">
      <Spinner size="md" label={label} />
    </div>
  );
}
