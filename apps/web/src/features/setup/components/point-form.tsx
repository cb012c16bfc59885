import { zodResolver } from '@hookform/resolvers/zod';
import { pointInputSchema, type SetupMachine, type SetupPoint } from '@turnstone/contracts/setup';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Field, Input, Select } from '../../../components/ui/field.tsx';
import { deletePoint, savePoint, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors, asNullableNumber, asNumber } from '../utils/server-errors.ts';
import { FormActions, FormAlert, NumberField } from './form-parts.tsx';

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
  const { errors } = form.formState;
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
        <Field
          label="Tag"
          hint="Unique; the gateway sends it with each snapshot."
          error={errors.tag?.message}
        >
          {({ invalid, ...ids }) => (
            <Input
              {...ids}
              invalid={invalid}
              className="font-mono"
              spellCheck={false}
              {...form.register('tag')}
            />
          )}
        </Field>
        <Field label="Name" error={errors.name?.message}>
          {({ invalid, ...ids }) => <Input {...ids} invalid={invalid} {...form.register('name')} />}
        </Field>
        <Field label="Location" hint="e.g. Motor DE" error={errors.location?.message}>
          {({ invalid, ...ids }) => (
            <Input {...ids} invalid={invalid} {...form.register('location')} />
          )}
        </Field>
        <Field label="Direction" error={errors.direction?.message}>
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('direction')}>
              <option value="H">H — horizontal</option>
              <option value="V">V — vertical</option>
              <option value="A">A — axial</option>
            </Select>
          )}
        </Field>
        <NumberField
          label="Sensor sensitivity"
          unit="mV/g"
          error={errors.sensitivityMvPerG?.message}
          registration={form.register('sensitivityMvPerG', { setValueAs: asNumber })}
        />
        <Field label="Bearing" error={errors.bearingId?.message}>
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('bearingId', { setValueAs: asNullableNumber })}>
              <option value="">None</option>
              {machine.bearings.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.name}
                  {b.designation ? ` (${b.designation})` : ''}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <NumberField
          label="Fmax"
          unit="Hz"
          error={errors.fmaxHz?.message}
          registration={form.register('fmaxHz', { setValueAs: asNumber })}
        />
        <NumberField
          label="Lines"
          step="1"
          error={errors.lines?.message}
          registration={form.register('lines', { setValueAs: asNumber })}
        />
        <NumberField
          label="Envelope band from"
          unit="Hz"
          hint="Around the resonance the bearing impacts ring; leave both empty for the default from the sample rate (fs/10.24 to fs/2.56)."
          error={errors.envelopeLoHz?.message}
          registration={form.register('envelopeLoHz', { setValueAs: asNullableNumber })}
        />
        <NumberField
          label="Envelope band to"
          unit="Hz"
          error={errors.envelopeHiHz?.message}
          registration={form.register('envelopeHiHz', { setValueAs: asNullableNumber })}
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
