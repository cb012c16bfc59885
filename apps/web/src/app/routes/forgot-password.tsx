import { AuthLayout } from '../../components/layouts/auth-layout.tsx';
import { paths } from '../../config/paths.ts';
import { ForgotPasswordForm } from '../../features/account/components/password-link-forms.tsx';

export function ForgotPasswordRoute() {
  return (
    <AuthLayout>
      <title>Forgot password · Turnstone</title>
      <ForgotPasswordForm signInHref={paths.auth.signIn.getHref()} />
    </AuthLayout>
  );
}
