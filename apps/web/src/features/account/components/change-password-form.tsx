import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { changePasswordSchema, type ChangePassword } from '@turnstone/contracts/account';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { PasswordField } from '../../../components/ui/field.tsx';
import { formField } from '../../../lib/form-field.ts';
import { fieldErrorsOf } from '../../../lib/api-client.ts';
import { useChangePassword } from '../api/account.ts';

export function ChangePasswordForm() {
  const change = useChangePassword();
  const [done, setDone] = useState(false);
  const form = useForm<ChangePassword>({
    resolver: zodResolver(changePasswordSchema),
    defaultValues: { currentPassword: '', newPassword: '' },
  });
  const onSubmit = form.handleSubmit((values) =>
    change.mutate(values, {
      onSuccess: () => {
        setDone(true);
        form.reset();
      },
      onError: (error) => {
        for (const [k, m] of Object.entries(fieldErrorsOf(error)))
          form.setError(k as keyof ChangePassword, { message: m });
      },
    }),
  );
  return (
    <Card className="p-4">
      <h2 className="text-sm font-semibold">Change password</h2>
      <p className="mt-0.5 text-sm text-ink-muted">
        8 to 64 characters. Your other sessions end; this one continues.
      </p>
      <form onSubmit={onSubmit} noValidate className="mt-3 flex max-w-sm flex-col gap-3">
        <PasswordField label="Current password" {...formField(form, 'currentPassword')} />
        <PasswordField label="New password" fresh {...formField(form, 'newPassword')} />
        <div className="flex items-center gap-3">
          <Button type="submit" variant="primary" busy={change.isPending}>
            Change password
          </Button>
          {done && (
            <p role="status" className="text-sm text-ink-muted">
              Password changed.
            </p>
          )}
        </div>
      </form>
    </Card>
  );
}
