import { zodResolver } from '@hookform/resolvers/zod';
import { pointInputSchema, type SetupMachine, type SetupPoint } from '@turnstone/contracts/setup';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { type SelectOption } from '../../../components/ui/field.tsx';
import { FormFields, type FieldSpec } from '../../../components/ui/form-fields.tsx';
import { deletePoint, savePoint, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors } from '../utils/server-errors.ts';
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

type PointValues = z.output<typeof pointInputSchema>;

/** The point's fields; the bearing is one of its machine's. */
const pointFields = (machine: SetupMachine): FieldSpec<PointValues>[] => [
  {
    kind: 'text',
    name: 'tag',
    label: 'Tag',
    hint: 'Unique; the gateway sends it with each snapshot.',
    inputClassName: 'font-mono',
    spellCheck: false,
  },
  { kind: 'text', name: 'name', label: 'Name' },
  { kind: 'text', name: 'location', label: 'Location', hint: 'e.g. Motor DE' },
  { kind: 'select', name: 'direction', label: 'Direction', options: directionOptions },
  {
    kind: 'number',
    name: 'sensitivityMvPerG',
    label: 'Sensor sensitivity',
    unit: 'mV/g',
    value: 'number',
  },
  {
    kind: 'select',
    name: 'bearingId',
    label: 'Bearing',
    options: [
      ['', 'None'],
      ...machine.bearings.map((b): SelectOption => [
        b.id,
        `${b.name}${b.designation ? ` (${b.designation})` : ''}`,
      ]),
    ],
    value: 'number-or-null',
  },
  { kind: 'number', name: 'fmaxHz', label: 'Fmax', unit: 'Hz', value: 'number' },
  { kind: 'number', name: 'lines', label: 'Lines', step: '1', value: 'number' },
  {
    kind: 'number',
    name: 'envelopeLoHz',
    label: 'Envelope band from',
    unit: 'Hz',
    hint: 'Around the resonance the bearing impacts ring; leave both empty for the default from the sample rate (fs/10.24 to fs/2.56).',
    value: 'number-or-null',
  },
  {
    kind: 'number',
    name: 'envelopeHiHz',
    label: 'Envelope band to',
    unit: 'Hz',
    value: 'number-or-null',
  },
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
        <FormFields form={form} fields={pointFields(machine)} />
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
