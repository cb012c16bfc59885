import { Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { AuthLayout } from '../../components/layouts/auth-layout.tsx';
import { paths } from '../../config/paths.ts';
import { useMe } from '../../features/auth/api/get-me.ts';
import { SignInForm } from '../../features/auth/components/sign-in-form.tsx';
import { safeRedirect } from '../../features/auth/utils/redirect.ts';

export function SignInRoute() {
  const [searchParams] = useSearchParams();
  const navigate = useNavigate();
  const me = useMe();
  const redirectTo = safeRedirect(searchParams.get('redirectTo')) ?? paths.app.fleet.getHref();

  // Already signed in (e.g. opened /sign-in from a bookmark): go on.
  if (me.data) return <Navigate to={redirectTo} replace />;

  return (
    <AuthLayout>
      <title>Sign in · Turnstone</title>
      <SignInForm onSuccess={() => navigate(redirectTo, { replace: true })} />
    </AuthLayout>
  );
}
