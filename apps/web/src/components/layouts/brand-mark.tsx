import { cn } from '../../lib/cn.ts';

/** Turnstone's mark: a ring with an off-centre mass, i.e. a rotor slightly out of balance. */
export function BrandMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" className={cn('size-7', className)}>
      <rect width="32" height="32" rx="7" fill="var(--color-accent)" />
      <circle cx="16" cy="16" r="9" fill="none" stroke="var(--color-paper)" strokeWidth="2.5" />
      <circle cx="19.5" cy="12.5" r="3" fill="var(--color-paper)" />
    </svg>
  );
}
