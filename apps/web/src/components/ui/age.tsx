import { formatAge, formatDateTime } from '../../lib/format.ts';
import { cn } from '../../lib/cn.ts';

/**
 * How long ago an instant was ("5 min ago") against the clock `now`, with the exact date and
 * time on hover; "never" (styled by `neverClassName`) when there is no instant.
 */
export function Age({
  at,
  now,
  className,
  neverClassName,
  prefix,
}: {
  at: string | null;
  now: number;
  className?: string;
  neverClassName?: string;
  /** Words before the age, inside the time element ("last "). */
  prefix?: string;
}) {
  if (!at) return <span className={cn('text-ink-faint', neverClassName)}>never</span>;
  return (
    <time dateTime={at} title={formatDateTime(at)} className={className}>
      {prefix}
      {formatAge(at, now)}
    </time>
  );
}
