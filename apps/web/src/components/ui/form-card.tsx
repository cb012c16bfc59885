import type { FormEvent, ReactNode } from 'react';
import { Card } from './card.tsx';

/**
 * A form on its own card (a new gateway, API token or webhook receiver): its title, which also
 * names the form, an optional description, the fields, and the error of a failed save that
 * belongs to no field.
 */
export function FormCard({
  title,
  description,
  onSubmit,
  className,
  error,
  children,
}: {
  title: string;
  description?: ReactNode;
  onSubmit: (e: FormEvent<HTMLFormElement>) => void;
  /** The form's layout classes. */
  className: string;
  error: string | null;
  children: ReactNode;
}) {
  return (
    <Card className="p-4">
      <h2 className="text-sm font-semibold">{title}</h2>
      {description && <p className="mt-1 text-sm text-ink-muted">{description}</p>}
      <form onSubmit={onSubmit} noValidate aria-label={title} className={className}>
        {children}
      </form>
      {error && (
        <p role="alert" className="mt-2 text-sm text-status-danger">
          {error}
        </p>
      )}
    </Card>
  );
}
