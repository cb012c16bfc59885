import { useEffect, type ComponentType } from 'react';
import {
  createBrowserRouter,
  matchRoutes,
  Outlet,
  redirect,
  RouterProvider,
  type RouteObject,
} from 'react-router-dom';
import { RouteErrorBoundary } from '../components/errors/route-error-boundary.tsx';
import { LoadingPanel } from '../components/ui/spinner.tsx';
import { paths } from '../config/paths.ts';
import { getMeQueryOptions } from '../features/auth/api/get-me.ts';
import { queryClient } from '../lib/query-client.ts';
import {
  preloadLinksOnIntent,
  preloadNavigationCode,
  setRoutePreloader,
} from '../lib/route-preload.ts';
import {
  alertsData,
  fleetData,
  gatewaysData,
  limitsData,
  machineData,
  mailboxData,
  pointData,
  prefetching,
  reviewData,
  setupData,
  usersData,
} from './route-data.ts';

/**
 * A page whose code loads on demand (`route.lazy`): the router loads it together with the
 * layout above it and runs the route's loader meanwhile, instead of one after the other.
 */
function page<K extends string>(load: () => Promise<Record<K, ComponentType>>, name: K) {
  return async () => ({ Component: (await load())[name] });
}

function Loading() {
  return (
    <div className="flex h-dvh">
      <LoadingPanel />
    </div>
  );
}

const appRoutes: RouteObject[] = [
  { index: true, loader: () => redirect(paths.app.fleet.getHref()) },
  {
    path: paths.app.fleet.path,
    loader: prefetching(fleetData),
    lazy: page(() => import('./routes/app/fleet.tsx'), 'FleetRoute'),
  },
  {
    path: paths.app.alerts.path,
    loader: prefetching(alertsData),
    lazy: page(() => import('./routes/app/alerts.tsx'), 'AlertsRoute'),
  },
  {
    path: paths.app.limits.path,
    loader: prefetching(limitsData),
    lazy: page(() => import('./routes/app/limits.tsx'), 'LimitsRoute'),
  },
  {
    path: paths.app.review.path,
    loader: prefetching(reviewData),
    lazy: page(() => import('./routes/app/review.tsx'), 'ReviewRoute'),
  },
  {
    path: paths.app.setup.path,
    loader: prefetching(setupData),
    lazy: page(() => import('./routes/app/setup.tsx'), 'SetupRoute'),
  },
  {
    path: paths.app.gateways.path,
    loader: prefetching(gatewaysData),
    lazy: page(() => import('./routes/app/gateways.tsx'), 'GatewaysRoute'),
  },
  { path: paths.app.audit.path, lazy: page(() => import('./routes/app/audit.tsx'), 'AuditRoute') },
  {
    path: paths.app.uploads.path,
    lazy: page(() => import('./routes/app/uploads.tsx'), 'UploadsRoute'),
  },
  {
    path: paths.app.users.path,
    loader: prefetching(usersData),
    lazy: page(() => import('./routes/app/users.tsx'), 'UsersRoute'),
  },
  {
    path: paths.app.integrations.path,
    lazy: page(() => import('./routes/app/integrations.tsx'), 'IntegrationsRoute'),
  },
  {
    path: paths.app.mailbox.path,
    loader: prefetching(mailboxData),
    lazy: page(() => import('./routes/app/mailbox.tsx'), 'MailboxRoute'),
  },
  {
    path: paths.app.account.path,
    lazy: page(() => import('./routes/app/account.tsx'), 'AccountRoute'),
  },
  {
    path: paths.app.machine.path,
    loader: prefetching(machineData),
    lazy: page(() => import('./routes/app/machine.tsx'), 'MachineRoute'),
  },
  {
    path: paths.app.point.path,
    loader: prefetching(pointData),
    lazy: page(() => import('./routes/app/point.tsx'), 'PointRoute'),
  },
  { path: '*', lazy: page(() => import('./routes/not-found.tsx'), 'NotFoundRoute') },
];

const routes: RouteObject[] = [
  {
    element: <Outlet />,
    errorElement: <RouteErrorBoundary />,
    hydrateFallbackElement: <Loading />,
    children: [
      {
        path: paths.auth.signIn.path,
        lazy: page(() => import('./routes/sign-in.tsx'), 'SignInRoute'),
      },
      {
        path: paths.auth.forgotPassword.path,
        lazy: page(() => import('./routes/forgot-password.tsx'), 'ForgotPasswordRoute'),
      },
      {
        path: paths.auth.resetPassword.path,
        lazy: page(() => import('./routes/reset-password.tsx'), 'ResetPasswordRoute'),
      },
      {
        path: paths.auth.acceptInvite.path,
        lazy: page(() => import('./routes/accept-invite.tsx'), 'AcceptInviteRoute'),
      },
      {
        path: paths.home.path,
        // The session check starts with the layout's code and the page's code and data.
        loader: () => {
          queryClient.prefetchQuery(getMeQueryOptions()).catch(() => undefined);
          return null;
        },
        lazy: page(() => import('./routes/app/root.tsx'), 'AppRoot'),
        // Errors in a page show inside the layout, so navigation stays usable.
        children: [{ errorElement: <RouteErrorBoundary />, children: appRoutes }],
      },
    ],
  },
];

/** Loads the code, and unless told otherwise the data, of the screen at `href` without opening it. */
function preloadScreen(href: string, data = true) {
  const url = new URL(href, window.location.origin);
  for (const match of matchRoutes(routes, url.pathname) ?? []) {
    const { route, params } = match;
    if (typeof route.lazy === 'function') route.lazy().catch(() => undefined);
    if (data && typeof route.loader === 'function')
      Promise.resolve(
        route.loader({
          params,
          request: new Request(url),
          context: undefined,
        } as Parameters<typeof route.loader>[0]),
      ).catch(() => undefined);
  }
}

setRoutePreloader(preloadScreen);

const router = createBrowserRouter(routes);

export function AppRouter() {
  useEffect(() => preloadLinksOnIntent(), []);
  useEffect(
    () =>
      preloadNavigationCode(
        () => router.state.navigation.state !== 'idle' || queryClient.isFetching() > 0,
      ),
    [],
  );
  return <RouterProvider router={router} />;
}
