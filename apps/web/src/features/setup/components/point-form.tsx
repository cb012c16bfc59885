import { zodResolver } from '@hookform/resolvers/zod';
import { pointInputSchema, type SetupMachine, type SetupPoint } from '@turnstone/contracts/setup';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import {
  InputField,
  NumberField,
  SelectField,
  type SelectOption,
} from '../../../components/ui/field.tsx';
import { formField } from '../../../lib/form-field.ts';
import { deletePoint, savePoint, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors, asNullableNumber, asNumber } from '../utils/server-errors.ts';
import { FormAlert } from '../../../components/ui/alert-box.tsx';
import { FormActions } from './form-parts.tsx';

const FIELDS = [
  'machineId',
  'tag',
  'name',
  'location',
  'direction',
  'sensitivityMvPerG',
  'bearingId',
  'fmaxHz',
  'lines',
  'envelopeLoHz',
  'envelopeHiHz',
] as const;

const directionOptions: SelectOption[] = [
  ['H', 'H — horizontal'],
  ['V', 'V — vertical'],
  ['A', 'A — axial'],
];

export function PointForm({
  point,
  machine,
  onSaved,
  onDeleted,
  onCancel,
}: {
  point?: SetupPoint;
  machine: SetupMachine;
  onSaved: (id: number) => void;
  onDeleted: () => void;
  onCancel: () => void;
}) {
  const save = useSetupMutation(savePoint);
  const remove = useSetupMutation(deletePoint);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm({
    resolver: zodResolver(pointInputSchema),
    defaultValues: point ?? {
      machineId: machine.id,
      tag: '',
      name: '',
      location: '',
      direction: 'H' as const,
      sensitivityMvPerG: 100,
      bearingId: null,
      fmaxHz: 1000,
      lines: 1600,
      envelopeLoHz: null,
      envelopeHiHz: null,
    },
  });
  const onSubmit = form.handleSubmit((values) => {
    setFormError(null);
    save.mutateAsync({ ...values, id: point?.id }).then(
      (r) => onSaved(r?.id ?? point?.id ?? 0),
      (e: unknown) => setFormError(applyServerErrors(e, form.setError, FIELDS)),
    );
  });
  const onDelete = () => {
    if (!point || !window.confirm(`Delete point ${point.tag}? This cannot be undone.`)) return;
    setFormError(null);
    remove.mutateAsync(point.id).then(onDeleted, (e: Error) => setFormError(e.message));
  };
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Point">
      <FormAlert message={formError} />
      <p className="text-sm text-ink-muted">
        On <span className="font-medium text-ink">{machine.name}</span>
      </p>
      <div className="grid gap-4 sm:grid-cols-2">
        <InputField
          label="Tag"
          hint="Unique; the gateway sends it with each snapshot."
          inputClassName="font-mono"
          spellCheck={false}
          {...formField(form, 'tag')}
        />
        <InputField label="Name" {...formField(form, 'name')} />
        <InputField label="Location" hint="e.g. Motor DE" {...formField(form, 'location')} />
        <SelectField
          label="Direction"
          options={directionOptions}
          {...formField(form, 'direction')}
        />
        <NumberField
          label="Sensor sensitivity"
          unit="mV/g"
          {...formField(form, 'sensitivityMvPerG', { setValueAs: asNumber })}
        />
        <SelectField
          label="Bearing"
          options={[
            ['', 'None'],
            ...machine.bearings.map((b): SelectOption => [
              b.id,
              `${b.name}${b.designation ? ` (${b.designation})` : ''}`,
            ]),
          ]}
          {...formField(form, 'bearingId', { setValueAs: asNullableNumber })}
        />
        <NumberField
          label="Fmax"
          unit="Hz"
          {...formField(form, 'fmaxHz', { setValueAs: asNumber })}
        />
        <NumberField
          label="Lines"
          step="1"
          {...formField(form, 'lines', { setValueAs: asNumber })}
        />
        <NumberField
          label="Envelope band from"
          unit="Hz"
          hint="Around the resonance the bearing impacts ring; leave both empty for the default from the sample rate (fs/10.24 to fs/2.56)."
          {...formField(form, 'envelopeLoHz', { setValueAs: asNullableNumber })}
        />
        <NumberField
          label="Envelope band to"
          unit="Hz"
          {...formField(form, 'envelopeHiHz', { setValueAs: asNullableNumber })}
        />
      </div>
      <FormActions
        busy={save.isPending}
        saveLabel={point ? 'Save point' : 'Create point'}
        onCancel={onCancel}
        onDelete={point ? onDelete : undefined}
        deleteBusy={remove.isPending}
      />
    </form>
  );
}
