import { Link, useLocation } from 'react-router-dom';
import { Card } from '../../components/ui/card.tsx';
import { EmptyState } from '../../components/ui/empty-state.tsx';
import { paths } from '../../config/paths.ts';

export function NotFoundRoute() {
  const location = useLocation();
  return (
    <div className="p-4 sm:p-6">
      <title>Page not found · Turnstone</title>
      <Card>
        <EmptyState
          title="Page not found"
          description={
            <>
              There is no page at{' '}
              <span className="font-mono break-all text-ink">{location.pathname}</span>. It may have
              moved, or the link may be mistyped.
            </>
          }
          action={
            <Link
              to={paths.app.fleet.getHref()}
              className="inline-flex h-10 items-center rounded-md bg-accent px-4 text-sm font-medium text-white hover:bg-accent-strong"
            >
              Go to Fleet
            </Link>
          }
        />
      </Card>
    </div>
  );
}
