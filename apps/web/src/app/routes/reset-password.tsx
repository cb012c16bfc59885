import { useLocation } from 'react-router-dom';
import { AuthLayout } from '../../components/layouts/auth-layout.tsx';
import { paths } from '../../config/paths.ts';
import {
  SetPasswordForm,
  tokenFromHash,
} from '../../features/account/components/password-link-forms.tsx';

export function ResetPasswordRoute() {
  const { hash } = useLocation();
  return (
    <AuthLayout>
      <title>Reset password · Turnstone</title>
      <SetPasswordForm
        kind="reset"
        token={tokenFromHash(hash)}
        signInHref={paths.auth.signIn.getHref()}
      />
    </AuthLayout>
  );
}
