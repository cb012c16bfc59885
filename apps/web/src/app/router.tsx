import { lazy, Suspense } from 'react';
import { createBrowserRouter, Navigate, Outlet, RouterProvider } from 'react-router-dom';
import { RouteErrorBoundary } from '../components/errors/route-error-boundary.tsx';
import { LoadingPanel } from '../components/ui/spinner.tsx';
import { paths } from '../config/paths.ts';

// Pages load on demand so the first download stays small.
const SignInRoute = lazy(() =>
  import('./routes/sign-in.tsx').then((m) => ({ default: m.SignInRoute })),
);
const AppRoot = lazy(() => import('./routes/app/root.tsx').then((m) => ({ default: m.AppRoot })));
const FleetRoute = lazy(() =>
  import('./routes/app/fleet.tsx').then((m) => ({ default: m.FleetRoute })),
);
const AlertsRoute = lazy(() =>
  import('./routes/app/alerts.tsx').then((m) => ({ default: m.AlertsRoute })),
);
const LimitsRoute = lazy(() =>
  import('./routes/app/limits.tsx').then((m) => ({ default: m.LimitsRoute })),
);
const ReviewRoute = lazy(() =>
  import('./routes/app/review.tsx').then((m) => ({ default: m.ReviewRoute })),
);
const SetupRoute = lazy(() =>
  import('./routes/app/setup.tsx').then((m) => ({ default: m.SetupRoute })),
);
const GatewaysRoute = lazy(() =>
  import('./routes/app/gateways.tsx').then((m) => ({ default: m.GatewaysRoute })),
);
const AuditRoute = lazy(() =>
  import('./routes/app/audit.tsx').then((m) => ({ default: m.AuditRoute })),
);
const UploadsRoute = lazy(() =>
  import('./routes/app/uploads.tsx').then((m) => ({ default: m.UploadsRoute })),
);
const ForgotPasswordRoute = lazy(() =>
  import('./routes/forgot-password.tsx').then((m) => ({ default: m.ForgotPasswordRoute })),
);
const ResetPasswordRoute = lazy(() =>
  import('./routes/reset-password.tsx').then((m) => ({ default: m.ResetPasswordRoute })),
);
const AcceptInviteRoute = lazy(() =>
  import('./routes/accept-invite.tsx').then((m) => ({ default: m.AcceptInviteRoute })),
);
const UsersRoute = lazy(() =>
  import('./routes/app/users.tsx').then((m) => ({ default: m.UsersRoute })),
);
const MailboxRoute = lazy(() =>
  import('./routes/app/mailbox.tsx').then((m) => ({ default: m.MailboxRoute })),
);
const AccountRoute = lazy(() =>
  import('./routes/app/account.tsx').then((m) => ({ default: m.AccountRoute })),
);
const MachineRoute = lazy(() =>
  import('./routes/app/machine.tsx').then((m) => ({ default: m.MachineRoute })),
);
const PointRoute = lazy(() =>
  import('./routes/app/point.tsx').then((m) => ({ default: m.PointRoute })),
);
const NotFoundRoute = lazy(() =>
  import('./routes/not-found.tsx').then((m) => ({ default: m.NotFoundRoute })),
);

function RootLayout() {
  return (
    <Suspense
      fallback={
        <div className="flex h-dvh">
          <LoadingPanel />
        </div>
      }
    >
      <Outlet />
    </Suspense>
  );
}

const router = createBrowserRouter([
  {
    element: <RootLayout />,
    errorElement: <RouteErrorBoundary />,
    children: [
      { path: paths.auth.signIn.path, element: <SignInRoute /> },
      { path: paths.auth.forgotPassword.path, element: <ForgotPasswordRoute /> },
      { path: paths.auth.resetPassword.path, element: <ResetPasswordRoute /> },
      { path: paths.auth.acceptInvite.path, element: <AcceptInviteRoute /> },
      {
        path: paths.home.path,
        element: <AppRoot />,
        children: [
          {
            // Errors in a page show inside the layout, so navigation stays usable.
            errorElement: <RouteErrorBoundary />,
            children: [
              { index: true, element: <Navigate to={paths.app.fleet.getHref()} replace /> },
              { path: paths.app.fleet.path, element: <FleetRoute /> },
              { path: paths.app.alerts.path, element: <AlertsRoute /> },
              { path: paths.app.limits.path, element: <LimitsRoute /> },
              { path: paths.app.review.path, element: <ReviewRoute /> },
              { path: paths.app.setup.path, element: <SetupRoute /> },
              { path: paths.app.gateways.path, element: <GatewaysRoute /> },
              { path: paths.app.audit.path, element: <AuditRoute /> },
              { path: paths.app.uploads.path, element: <UploadsRoute /> },
              { path: paths.app.users.path, element: <UsersRoute /> },
              { path: paths.app.mailbox.path, element: <MailboxRoute /> },
              { path: paths.app.account.path, element: <AccountRoute /> },
              { path: paths.app.machine.path, element: <MachineRoute /> },
              { path: paths.app.point.path, element: <PointRoute /> },
              { path: '*', element: <NotFoundRoute /> },
            ],
          },
        ],
      },
    ],
  },
]);

export function AppRouter() {
  return <RouterProvider router={router} />;
}
