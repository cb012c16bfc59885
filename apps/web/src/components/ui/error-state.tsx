import type { ReactNode } from 'react';
import { isApiError } from '../../lib/api-client.ts';
import { Button } from './button.tsx';

/** Shows what went wrong in the server's own words, with its error code for support. */
export function ErrorState({
  title = 'Something went wrong',
  error,
  onRetry,
  retrying = false,
  action,
}: {
  title?: string;
  error: unknown;
  onRetry?: () => void;
  retrying?: boolean;
  action?: ReactNode;
}) {
  const message =
    error instanceof Error && error.message ? error.message : 'An unexpected error occurred.';
  const code = isApiError(error) ? error.code : undefined;
  return (
    <div
      role="alert"
      className="flex flex-col items-center justify-center gap-2 px-6 py-12 text-center"
    >
      <svg viewBox="0 0 40 40" aria-hidden="true" className="mb-1 size-10 text-status-danger">
        <path
          d="M20 4 36 20 20 36 4 20Z"
          fill="none"
          stroke="currentColor"
          strokeWidth="2"
          strokeLinejoin="round"
        />
        <path d="M20 13v9" stroke="currentColor" strokeWidth="2.5" strokeLinecap="round" />
        <circle cx="20" cy="27" r="1.6" fill="currentColor" />
      </svg>
      <p className="text-sm font-semibold text-ink">{title}</p>
      <p className="max-w-lg text-sm text-ink-muted">{message}</p>
      {code && (
        <p className="font-mono text-xs text-ink-faint">
          code <span className="text-ink-muted">{code}</span>
        </p>
      )}
      {(onRetry || action) && (
        <div className="mt-2 flex gap-2">
          {onRetry && (
            <Button onClick={onRetry} busy={retrying}>
              Try again
            </Button>
          )}
          {action}
        </div>
      )}
    </div>
  );
}
