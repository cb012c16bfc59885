import { zodResolver } from '@hookform/resolvers/zod';
import { siteInputSchema, type SetupSite } from '@turnstone/contracts/setup';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Field, Input } from '../../../components/ui/field.tsx';
import { saveSite, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors } from '../utils/server-errors.ts';
import { FormActions, FormAlert } from './form-parts.tsx';

const FIELDS = ['name', 'code', 'timeZone'] as const;

export function SiteForm({
  site,
  onSaved,
  onCancel,
}: {
  site?: SetupSite;
  onSaved: (id: number) => void;
  onCancel: () => void;
}) {
  const save = useSetupMutation(saveSite);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm({
    resolver: zodResolver(siteInputSchema),
    defaultValues: {
      name: site?.name ?? '',
      code: site?.code ?? '',
      timeZone: site?.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone,
    },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit((values) => {
    setFormError(null);
    save.mutateAsync({ ...values, id: site?.id }).then(
      (r) => onSaved(r?.id ?? site?.id ?? 0),
      (e: unknown) => setFormError(applyServerErrors(e, form.setError, FIELDS)),
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Site">
      <FormAlert message={formError} />
      <Field label="Name" error={errors.name?.message}>
        {({ invalid, ...ids }) => <Input {...ids} invalid={invalid} {...form.register('name')} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field
          label="Code"
          hint="Capital letters, digits, hyphens; used in point tags."
          error={errors.code?.message}
        >
          {({ invalid, ...ids }) => (
            <Input
              {...ids}
              invalid={invalid}
              className="font-mono uppercase"
              {...form.register('code')}
            />
          )}
        </Field>
        <Field
          label="Time zone"
          hint="IANA name, e.g. Europe/London."
          error={errors.timeZone?.message}
        >
          {({ invalid, ...ids }) => (
            <Input
              {...ids}
              invalid={invalid}
              className="font-mono"
              list="iana-zones"
              {...form.register('timeZone')}
            />
          )}
        </Field>
      </div>
      <datalist id="iana-zones">
        {(Intl as unknown as { supportedValuesOf?: (k: string) => string[] })
          .supportedValuesOf?.('timeZone')
          .map((z) => (
            <option key={z} value={z} />
          ))}
      </datalist>
      <FormActions
        busy={save.isPending}
        saveLabel={site ? 'Save site' : 'Create site'}
        onCancel={onCancel}
      />
    </form>
  );
}
