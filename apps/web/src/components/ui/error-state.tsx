import type { ReactNode } from 'react';
import { isApiError } from '../../lib/api-client.ts';
import { Button } from './button.tsx';
import { StatePanel } from './empty-state.tsx';
import { StrokePath } from './icon.tsx';

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
    <StatePanel
      role="alert"
      title={title}
      mark={
        <svg viewBox="0 0 40 40" aria-hidden="true" className="mb-1 size-10 text-status-danger">
          <StrokePath d="M20 4 36 20 20 36 4 20Z" width={2} />
          <StrokePath d="M20 13v9" width={2.5} />
          <circle cx="20" cy="27" r="1.6" fill="currentColor" />
        </svg>
      }
    >
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
    </StatePanel>
  );
}
