import { zodResolver } from '@hookform/resolvers/zod';
import { areaInputSchema, type SetupArea, type SetupSite } from '@turnstone/contracts/setup';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { InputField, SelectField, type SelectOption } from '../../../components/ui/field.tsx';
import { formField } from '../../../lib/form-field.ts';
import { saveArea, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors } from '../utils/server-errors.ts';
import { asNumber } from '../../../lib/form-field.ts';
import { FormAlert } from '../../../components/ui/alert-box.tsx';
import { FormActions } from './form-parts.tsx';

const FIELDS = ['siteId', 'name'] as const;

export function AreaForm({
  area,
  sites,
  siteId,
  onSaved,
  onCancel,
}: {
  area?: SetupArea;
  sites: SetupSite[];
  siteId?: number;
  onSaved: (id: number) => void;
  onCancel: () => void;
}) {
  const save = useSetupMutation(saveArea);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm({
    resolver: zodResolver(areaInputSchema),
    defaultValues: { siteId: area?.siteId ?? siteId ?? sites[0]?.id ?? 0, name: area?.name ?? '' },
  });
  const onSubmit = form.handleSubmit((values) => {
    setFormError(null);
    save.mutateAsync({ ...values, id: area?.id }).then(
      (r) => onSaved(r?.id ?? area?.id ?? 0),
      (e: unknown) => setFormError(applyServerErrors(e, form.setError, FIELDS)),
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Area">
      <FormAlert message={formError} />
      <SelectField
        label="Site"
        options={sites.map((s): SelectOption => [s.id, `${s.name} (${s.code})`])}
        disabled={Boolean(area)}
        {...formField(form, 'siteId', { setValueAs: asNumber })}
      />
      <InputField label="Name" {...formField(form, 'name')} />
      <FormActions
        busy={save.isPending}
        saveLabel={area ? 'Save area' : 'Create area'}
        onCancel={onCancel}
      />
    </form>
  );
}
