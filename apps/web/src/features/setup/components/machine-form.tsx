import { zodResolver } from '@hookform/resolvers/zod';
import {
  machineInputSchema,
  type SetupArea,
  type SetupMachine,
  type SetupSite,
} from '@turnstone/contracts/setup';
import { useState } from 'react';
import type { ReactNode } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '../../../components/ui/button.tsx';
import { type SelectOption } from '../../../components/ui/field.tsx';
import { FormFields, type FieldSpec } from '../../../components/ui/form-fields.tsx';
import { deleteMachine, saveMachine, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors } from '../utils/server-errors.ts';
import { FormAlert } from '../../../components/ui/alert-box.tsx';
import { FormActions, FormSection } from './form-parts.tsx';
import { machineTypeLabels } from '../../../lib/machine-labels.ts';

const FIELDS = [
  'areaId',
  'name',
  'type',
  'nominalRpm',
  'isoGroup',
  'foundation',
  'criticality',
  'powerKw',
  'bladeCount',
  'vaneCount',
  'lineHz',
  'notes',
  'bearings',
  'gears',
] as const;

const machineTypes = ['motor', 'pump', 'fan', 'blower', 'gearbox', 'compressor'] as const;

const isoGroupOptions: SelectOption[] = [
  [1, 'Group 1 (large)'],
  [2, 'Group 2 (medium)'],
];
const foundationOptions: SelectOption[] = [
  ['rigid', 'Rigid'],
  ['flexible', 'Flexible'],
];
const criticalityOptions: SelectOption[] = [
  ['low', 'Low'],
  ['medium', 'Medium'],
  ['high', 'High'],
];
const lineHzOptions: SelectOption[] = [
  ['', 'None or not known'],
  [50, '50 Hz'],
  [60, '60 Hz'],
];

type MachineValues = z.output<typeof machineInputSchema>;

/** The machine's own fields; the area is one of the areas the explorer knows. */
const machineFields = (areaOptions: SelectOption[]): FieldSpec<MachineValues>[] => [
  { kind: 'text', name: 'name', label: 'Name' },
  { kind: 'select', name: 'areaId', label: 'Area', options: areaOptions, value: 'number' },
  {
    kind: 'select',
    name: 'type',
    label: 'Type',
    options: machineTypes.map((t): SelectOption => [t, machineTypeLabels[t]]),
  },
  { kind: 'number', name: 'nominalRpm', label: 'Nominal speed', unit: 'r/min', value: 'number' },
  {
    kind: 'select',
    name: 'isoGroup',
    label: 'ISO 20816-3 group',
    hint: 'Group 1: 300 kW – 50 MW; group 2: 15 – 300 kW.',
    options: isoGroupOptions,
    value: 'number',
  },
  { kind: 'select', name: 'foundation', label: 'Foundation', options: foundationOptions },
  { kind: 'select', name: 'criticality', label: 'Criticality', options: criticalityOptions },
  {
    kind: 'number',
    name: 'powerKw',
    label: 'Power (optional)',
    unit: 'kW',
    value: 'number-or-null',
  },
  {
    kind: 'number',
    name: 'bladeCount',
    label: 'Blade count (optional)',
    step: '1',
    value: 'number-or-null',
  },
  {
    kind: 'number',
    name: 'vaneCount',
    label: 'Vane count (optional)',
    step: '1',
    value: 'number-or-null',
  },
  {
    kind: 'select',
    name: 'lineHz',
    label: 'Supply frequency',
    hint: 'Of the motor on this machine; none for a machine without a mains-fed motor or on an inverter.',
    options: lineHzOptions,
    value: 'number-or-null',
  },
];

/** A bearing's geometry, which gives its fault frequencies. */
const bearingFields = (i: number): FieldSpec<MachineValues>[] => [
  {
    kind: 'text',
    name: `bearings.${i}.name`,
    label: 'Position',
    className: 'sm:col-span-2',
    placeholder: 'Motor DE',
  },
  {
    kind: 'text',
    name: `bearings.${i}.designation`,
    label: 'Designation',
    className: 'sm:col-span-2',
    inputClassName: 'font-mono',
    placeholder: '6316',
  },
  {
    kind: 'number',
    name: `bearings.${i}.rollingElements`,
    label: 'Rolling elements',
    step: '1',
    value: 'number',
  },
  {
    kind: 'number',
    name: `bearings.${i}.ballDiameterMm`,
    label: 'Ball diameter',
    unit: 'mm',
    value: 'number',
  },
  {
    kind: 'number',
    name: `bearings.${i}.pitchDiameterMm`,
    label: 'Pitch diameter',
    unit: 'mm',
    value: 'number',
  },
  {
    kind: 'number',
    name: `bearings.${i}.contactAngleDeg`,
    label: 'Contact angle',
    unit: '°',
    value: 'number',
  },
  {
    kind: 'number',
    name: `bearings.${i}.speedRatio`,
    label: 'Speed ratio',
    unit: '×',
    hint: 'Shaft speed ÷ machine speed.',
    value: 'number',
  },
];

const gearFields = (i: number): FieldSpec<MachineValues>[] => [
  { kind: 'text', name: `gears.${i}.name`, label: 'Name' },
  { kind: 'number', name: `gears.${i}.teeth`, label: 'Teeth', step: '1', value: 'number' },
  {
    kind: 'number',
    name: `gears.${i}.mateTeeth`,
    label: 'Mate teeth',
    step: '1',
    value: 'number',
  },
  {
    kind: 'number',
    name: `gears.${i}.speedRatio`,
    label: 'Speed ratio',
    unit: '×',
    value: 'number',
  },
];

/** One bearing or gear mesh of the lists: its fields and the button that removes it. */
function PartGroup({
  label,
  removeLabel,
  onRemove,
  children,
}: {
  label: string;
  removeLabel: string;
  onRemove: () => void;
  children: ReactNode;
}) {
  return (
    <div className="rounded-md border border-line bg-paper/60 p-3" role="group" aria-label={label}>
      <div className="grid gap-3 sm:grid-cols-4">{children}</div>
      <Button size="sm" variant="ghost" className="mt-2" onClick={onRemove}>
        {removeLabel}
      </Button>
    </div>
  );
}

const newBearing = {
  name: '',
  designation: '',
  rollingElements: undefined as unknown as number,
  ballDiameterMm: undefined as unknown as number,
  pitchDiameterMm: undefined as unknown as number,
  contactAngleDeg: 0,
  speedRatio: 1,
};
const newGear = {
  name: '',
  teeth: undefined as unknown as number,
  mateTeeth: undefined as unknown as number,
  speedRatio: 1,
};

export function MachineForm({
  machine,
  sites,
  areas,
  areaId,
  onSaved,
  onDeleted,
  onCancel,
}: {
  machine?: SetupMachine;
  sites: SetupSite[];
  areas: SetupArea[];
  areaId?: number;
  onSaved: (id: number) => void;
  onDeleted: () => void;
  onCancel: () => void;
}) {
  const save = useSetupMutation(saveMachine);
  const remove = useSetupMutation(deleteMachine);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm({
    resolver: zodResolver(machineInputSchema),
    defaultValues: machine
      ? {
          ...machine,
          isoGroup: machine.isoGroup === 1 ? (1 as const) : (2 as const),
          lineHz: machine.lineHz === 50 || machine.lineHz === 60 ? machine.lineHz : null,
          bearings: machine.bearings.map((b) => ({ ...b, designation: b.designation ?? '' })),
        }
      : {
          areaId: areaId ?? areas[0]?.id ?? 0,
          name: '',
          type: 'pump' as const,
          nominalRpm: undefined as unknown as number,
          isoGroup: 2 as const,
          foundation: 'rigid' as const,
          criticality: 'medium' as const,
          powerKw: null,
          bladeCount: null,
          vaneCount: null,
          lineHz: null,
          notes: '',
          bearings: [],
          gears: [],
        },
  });
  const bearings = useFieldArray({ control: form.control, name: 'bearings' });
  const gears = useFieldArray({ control: form.control, name: 'gears' });
  const siteName = (id: number) => sites.find((s) => s.id === id)?.code ?? '';
  const areaOptions = areas.map((a): SelectOption => [a.id, `${siteName(a.siteId)} · ${a.name}`]);

  const onSubmit = form.handleSubmit((values) => {
    setFormError(null);
    save.mutateAsync({ ...values, id: machine?.id }).then(
      (r) => onSaved(r?.id ?? machine?.id ?? 0),
      (e: unknown) => setFormError(applyServerErrors(e, form.setError, FIELDS)),
    );
  });

  const onDelete = () => {
    if (!machine) return;
    const n = machine.points.length;
    if (
      !window.confirm(
        `Delete ${machine.name}${n ? ` and its ${n} point${n === 1 ? '' : 's'}` : ''}? This cannot be undone.`,
      )
    )
      return;
    setFormError(null);
    remove.mutateAsync(machine.id).then(onDeleted, (e: Error) => setFormError(e.message));
  };

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Machine">
      <FormAlert message={formError} />
      <div className="grid gap-4 sm:grid-cols-2">
        <FormFields form={form} fields={machineFields(areaOptions)} />
      </div>

      <FormSection title="Rolling-element bearings">
        {bearings.fields.length === 0 && (
          <p className="text-sm text-ink-muted">
            No bearings yet. Their geometry gives the fault frequencies.
          </p>
        )}
        {bearings.fields.map((f, i) => (
          <PartGroup
            key={f.id}
            label={`Bearing ${i + 1}`}
            removeLabel="Remove bearing"
            onRemove={() => bearings.remove(i)}
          >
            <FormFields form={form} fields={bearingFields(i)} />
          </PartGroup>
        ))}
        <div>
          <Button size="sm" onClick={() => bearings.append(newBearing)}>
            Add bearing
          </Button>
        </div>
      </FormSection>

      <FormSection title="Gear meshes">
        {gears.fields.length === 0 && <p className="text-sm text-ink-muted">No gear meshes.</p>}
        {gears.fields.map((f, i) => (
          <PartGroup
            key={f.id}
            label={`Gear mesh ${i + 1}`}
            removeLabel="Remove gear mesh"
            onRemove={() => gears.remove(i)}
          >
            <FormFields form={form} fields={gearFields(i)} />
          </PartGroup>
        ))}
        <div>
          <Button size="sm" onClick={() => gears.append(newGear)}>
            Add gear mesh
          </Button>
        </div>
      </FormSection>

      <FormActions
        busy={save.isPending}
        saveLabel={machine ? 'Save machine' : 'Create machine'}
        onCancel={onCancel}
        onDelete={machine ? onDelete : undefined}
        deleteBusy={remove.isPending}
      />
    </form>
  );
}
