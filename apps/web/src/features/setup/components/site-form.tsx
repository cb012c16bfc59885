import { zodResolver } from '@hookform/resolvers/zod';
import { siteInputSchema, type SetupSite } from '@turnstone/contracts/setup';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { InputField } from '../../../components/ui/field.tsx';
import { FormFields, type FieldSpec } from '../../../components/ui/form-fields.tsx';
import { formField } from '../../../lib/form-field.ts';
import { saveSite, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors } from '../utils/server-errors.ts';
import { FormAlert } from '../../../components/ui/alert-box.tsx';
import { FormActions } from './form-parts.tsx';

const FIELDS = ['name', 'code', 'timeZone'] as const;

const siteFields: FieldSpec<z.output<typeof siteInputSchema>>[] = [
  {
    kind: 'text',
    name: 'code',
    label: 'Code',
    hint: 'Capital letters, digits, hyphens; used in point tags.',
    inputClassName: 'font-mono uppercase',
  },
  {
    kind: 'text',
    name: 'timeZone',
    label: 'Time zone',
    hint: 'IANA name, e.g. Europe/London.',
    inputClassName: 'font-mono',
    list: 'iana-zones',
  },
];

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
      <InputField label="Name" {...formField(form, 'name')} />
      <div className="grid gap-4 sm:grid-cols-2">
        <FormFields form={form} fields={siteFields} />
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
