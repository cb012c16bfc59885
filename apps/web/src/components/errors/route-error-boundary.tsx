import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { paths } from '../../config/paths.ts';
import { Button } from '../ui/button.tsx';
import { Card } from '../ui/card.tsx';
import { ErrorState } from '../ui/error-state.tsx';

/** A code chunk that no longer exists on the server: the app was updated while open. */
function isStaleChunk(error: unknown): boolean {
  return (
    error instanceof TypeError &&
    /dynamically imported module|Importing a module script failed|error loading dynamically/i.test(
      error.message,
    )
  );
}

/** Shown instead of a page that failed to render; keeps the layout around it usable. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  console.error(error);

  let title = 'This page failed to load';
  let shown: unknown = error;
  if (isRouteErrorResponse(error)) {
    title = `${error.status} ${error.statusText}`;
    shown = new Error(typeof error.data === 'string' ? error.data : 'The page could not be shown.');
  } else if (isStaleChunk(error)) {
    title = 'Turnstone was updated';
    shown = new Error('A newer version is available. Reload the page to continue.');
  }

  return (
    <div className="p-4 sm:p-6">
      <Card>
        <ErrorState
          title={title}
          error={shown}
          action={
            <>
              <Button variant="primary" onClick={() => window.location.reload()}>
                Reload page
              </Button>
              <Link
                to={paths.home.getHref()}
                className="inline-flex h-10 items-center rounded-md px-4 text-sm font-medium text-accent hover:bg-sunken"
              >
                Go to Fleet
              </Link>
            </>
          }
        />
      </Card>
    </div>
  );
}
