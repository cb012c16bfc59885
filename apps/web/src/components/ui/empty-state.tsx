import type { ReactNode } from 'react';
import { Ring, StrokePath } from './icon.tsx';

/** The centred mark, title and text of an empty or failed panel (EmptyState, ErrorState). */
export function StatePanel({
  mark,
  title,
  role,
  children,
}: {
  mark: ReactNode;
  title: string;
  role?: 'alert';
  children?: ReactNode;
}) {
  return (
    <div
      role={role}
      className="flex flex-col items-center justify-center gap-2 px-6 py-12 text-center"
    >
      {mark}
      <p className="text-sm font-semibold text-ink">{title}</p>
      {children}
    </div>
  );
}

export function EmptyState({
  title,
  description,
  action,
}: {
  title: string;
  description?: ReactNode;
  action?: ReactNode;
}) {
  return (
    <StatePanel
      title={title}
      mark={
        <svg viewBox="0 0 40 40" aria-hidden="true" className="mb-1 size-10 text-line-strong">
          <Ring cx={20} r={15} width={2} dash="4 4" />
          <StrokePath d="M13 20h14" width={2} />
        </svg>
      }
    >
      {description && <div className="max-w-md text-sm text-ink-muted">{description}</div>}
      {action && <div className="mt-2">{action}</div>}
    </StatePanel>
  );
}
