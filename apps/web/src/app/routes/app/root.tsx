import { Suspense } from 'react';
import { Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { AuthLayout } from '../../../components/layouts/auth-layout.tsx';
import { DashboardLayout } from '../../../components/layouts/dashboard-layout.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { navigationFor } from '../../../config/navigation.ts';
import { paths } from '../../../config/paths.ts';
import { useMe } from '../../../features/auth/api/get-me.ts';
import { UserMenu } from '../../../features/auth/components/user-menu.tsx';
import { setDisplayTimeZone } from '../../../lib/format.ts';

/** Every signed-in page: checks the session, then the layout with the role's navigation. */
export function AppRoot() {
  const me = useMe();
  const location = useLocation();
  const navigate = useNavigate();

  if (me.isPending) {
    return (
      <div className="flex h-dvh">
        <LoadingPanel label="Checking your session…" />
      </div>
    );
  }
  if (me.isError) {
    return (
      <AuthLayout>
        <Card>
          <ErrorState
            title="Could not check your session"
            error={me.error}
            onRetry={() => void me.refetch()}
            retrying={me.isFetching}
          />
        </Card>
      </AuthLayout>
    );
  }
  if (!me.data) {
    const here = `${location.pathname}${location.search}${location.hash}`;
    return <Navigate to={paths.auth.signIn.getHref(here)} replace />;
  }

  // Before any page renders: the zone of every time on screens not tied to one site.
  setDisplayTimeZone(me.data.timeZone);
  return (
    <DashboardLayout
      navigation={navigationFor(me.data.role)}
      timeZone={me.data.timeZone}
      user={
        <UserMenu
          user={me.data}
          onSignedOut={() => navigate(paths.auth.signIn.getHref(), { replace: true })}
        />
      }
    >
      <Suspense fallback={<LoadingPanel />}>
        <Outlet />
      </Suspense>
    </DashboardLayout>
  );
}
