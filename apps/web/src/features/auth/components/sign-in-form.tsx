import { zodResolver } from '@hookform/resolvers/zod';
import { signInRequestSchema } from '@turnstone/contracts/auth';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { paths } from '../../../config/paths.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { InputField } from '../../../components/ui/field.tsx';
import { fieldErrorsOf, isApiError } from '../../../lib/api-client.ts';
import { useSignIn } from '../api/sign-in.ts';

function retryText(seconds: number | undefined): string | null {
  if (seconds === undefined) return null;
  if (seconds < 90) return `You can try again in ${Math.max(1, seconds)} seconds.`;
  return `You can try again in about ${Math.ceil(seconds / 60)} minutes.`;
}

export function SignInForm({ onSuccess }: { onSuccess: () => void }) {
  const signIn = useSignIn({ onSuccess });
  const form = useForm({
    resolver: zodResolver(signInRequestSchema),
    defaultValues: { email: '', password: '' },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    signIn.mutate(values, {
      onError: (error) => {
        const fields = fieldErrorsOf(error);
        if (fields.email) form.setError('email', { message: fields.email });
        if (fields.password) form.setError('password', { message: fields.password });
        if (isApiError(error) && error.code === 'invalid_credentials') {
          form.resetField('password', { keepError: false });
          form.setFocus('password');
        }
      },
    });
  });

  const serverError = signIn.error;
  const retry = isApiError(serverError) ? retryText(serverError.retryAfterSeconds) : null;

  return (
    <Card className="p-6">
      <h1 className="text-base font-semibold">Sign in</h1>
      <form onSubmit={onSubmit} noValidate className="mt-4 flex flex-col gap-4">
        {serverError && (
          <div
            role="alert"
            className="flex gap-2.5 rounded-md border border-status-danger/30 bg-danger-soft px-3 py-2.5 text-sm text-ink"
          >
            <svg
              viewBox="0 0 12 12"
              aria-hidden="true"
              className="mt-1 size-3 shrink-0 text-status-danger"
            >
              <path d="M6 .6 11.4 6 6 11.4.6 6Z" fill="currentColor" />
            </svg>
            <div>
              <p>{serverError.message}</p>
              {retry && <p className="mt-0.5 text-ink-muted">{retry}</p>}
            </div>
          </div>
        )}
        <InputField
          label="E-mail"
          error={errors.email?.message}
          {...form.register('email')}
          type="email"
          autoComplete="username"
          inputMode="email"
          spellCheck={false}
          autoFocus
        />
        <InputField
          label="Password"
          error={errors.password?.message}
          {...form.register('password')}
          type="password"
          autoComplete="current-password"
        />
        <Button type="submit" variant="primary" busy={signIn.isPending} className="mt-1 w-full">
          Sign in
        </Button>
        <Link
          to={paths.auth.forgotPassword.getHref()}
          className="self-center text-sm text-accent underline underline-offset-2"
        >
          Forgot password?
        </Link>
      </form>
      <p className="mt-5 border-t border-line pt-3 text-xs leading-relaxed text-ink-faint">
        Demo accounts: admin@, engineer@, planner@, operator@turnstone.local
      </p>
    </Card>
  );
}
