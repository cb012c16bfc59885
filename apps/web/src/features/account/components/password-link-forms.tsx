import { Link } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { passwordSchema } from '@turnstone/contracts/auth';
import { forgotPasswordSchema } from '@turnstone/contracts/users';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { InputField, PasswordField } from '../../../components/ui/field.tsx';
import { formField } from '../../../lib/form-field.ts';
import { fieldErrorsOf } from '../../../lib/api-client.ts';
import {
  useForgotPassword,
  useForgotPasswordSentTo,
  useSetPasswordFromLink,
} from '../api/password-links.ts';

const setPasswordForm = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, {
    path: ['confirm'],
    message: 'The two passwords are not the same.',
  });

/** The token from `#token=…`: kept out of the URL that reaches servers and logs. */
export function tokenFromHash(hash: string): string | null {
  const m = /(?:^#|&)token=([A-Za-z0-9_-]+)/.exec(hash);
  return m?.[1] ?? null;
}

export function SetPasswordForm({
  kind,
  token,
  signInHref,
}: {
  kind: 'invite' | 'reset';
  token: string | null;
  signInHref: string;
}) {
  const setPassword = useSetPasswordFromLink(kind);
  const form = useForm<z.infer<typeof setPasswordForm>>({
    resolver: zodResolver(setPasswordForm),
    defaultValues: { password: '', confirm: '' },
  });
  const title = kind === 'invite' ? 'Choose your password' : 'Choose a new password';
  if (setPassword.isSuccess)
    return (
      <Card className="p-6">
        <h1 className="text-base font-semibold">Password set</h1>
        <p role="status" className="mt-2 text-sm text-ink-muted">
          You can sign in with your e-mail address and the new password.
        </p>
        <Link
          to={signInHref}
          className="mt-4 inline-block text-sm font-medium text-accent underline"
        >
          Go to sign-in
        </Link>
      </Card>
    );
  if (!token)
    return (
      <Card className="p-6">
        <h1 className="text-base font-semibold">{title}</h1>
        <p role="alert" className="mt-2 text-sm text-ink-muted">
          This page needs the link from your e-mail. Open the link again, or ask for a new one.
        </p>
      </Card>
    );
  const onSubmit = form.handleSubmit(({ password }) =>
    setPassword.mutate(
      { token, password },
      {
        onError: (error) => {
          const f = fieldErrorsOf(error);
          if (f.password) form.setError('password', { message: f.password });
        },
      },
    ),
  );
  return (
    <Card className="p-6">
      <h1 className="text-base font-semibold">{title}</h1>
      <form onSubmit={onSubmit} noValidate className="mt-4 flex flex-col gap-4">
        {setPassword.isError && Object.keys(fieldErrorsOf(setPassword.error)).length === 0 && (
          <p
            role="alert"
            className="rounded-md border border-status-danger/30 bg-danger-soft px-3 py-2 text-sm"
          >
            {setPassword.error.message}
          </p>
        )}
        <PasswordField
          label="New password"
          hint="8 to 64 characters."
          fresh
          autoFocus
          {...formField(form, 'password')}
        />
        <PasswordField label="Repeat the password" fresh {...formField(form, 'confirm')} />
        <Button type="submit" variant="primary" busy={setPassword.isPending} className="w-full">
          Set password
        </Button>
      </form>
    </Card>
  );
}

export function ForgotPasswordForm({ signInHref }: { signInHref: string }) {
  const forgot = useForgotPassword();
  const sentTo = useForgotPasswordSentTo();
  const form = useForm<z.infer<typeof forgotPasswordSchema>>({
    resolver: zodResolver(forgotPasswordSchema),
    defaultValues: { email: '' },
  });
  const onSubmit = form.handleSubmit((values) => forgot.mutate(values));
  return (
    <Card className="p-6">
      <h1 className="text-base font-semibold">Forgot your password?</h1>
      {sentTo ? (
        <p role="status" className="mt-2 text-sm text-ink-muted">
          If an account exists for <span className="font-mono">{sentTo}</span>, a link to choose a
          new password is on its way. It works once, for one hour.
        </p>
      ) : (
        <form onSubmit={onSubmit} noValidate className="mt-4 flex flex-col gap-4">
          <InputField
            label="E-mail"
            {...formField(form, 'email')}
            type="email"
            autoComplete="username"
            autoFocus
          />
          {forgot.isError && (
            <p role="alert" className="text-sm text-status-danger">
              {forgot.error.message}
            </p>
          )}
          <Button type="submit" variant="primary" busy={forgot.isPending} className="w-full">
            Send me a link
          </Button>
        </form>
      )}
      <Link to={signInHref} className="mt-4 inline-block text-sm text-accent underline">
        Back to sign-in
      </Link>
    </Card>
  );
}
