import { zodResolver } from '@hookform/resolvers/zod';
import { signInRequestSchema } from '@turnstone/contracts/auth';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { paths } from '../../../config/paths.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { FormAlert } from '../../../components/ui/alert-box.tsx';
import { InputField, PasswordField } from '../../../components/ui/field.tsx';
import { formField } from '../../../lib/form-field.ts';
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
        <FormAlert message={serverError?.message ?? null}>
          {retry && <p className="mt-0.5 text-ink-muted">{retry}</p>}
        </FormAlert>
        <InputField
          label="E-mail"
          {...formField(form, 'email')}
          type="email"
          autoComplete="username"
          inputMode="email"
          spellCheck={false}
          autoFocus
        />
        <PasswordField label="Password" {...formField(form, 'password')} />
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
