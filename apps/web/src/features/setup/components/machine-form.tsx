import { zodResolver } from '@hookform/resolvers/zod';
import {
  machineInputSchema,
  type SetupArea,
  type SetupMachine,
  type SetupSite,
} from '@turnstone/contracts/setup';
import { useState } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import { Button } from '../../../components/ui/button.tsx';
import {
  InputField,
  NumberField,
  SelectField,
  type SelectOption,
} from '../../../components/ui/field.tsx';
import { formField } from '../../../lib/form-field.ts';
import { deleteMachine, saveMachine, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors, asNullableNumber, asNumber } from '../utils/server-errors.ts';
import { FormAlert } from '../../../components/ui/alert-box.tsx';
import { FormActions, FormSection } from './form-parts.tsx';

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
        <InputField label="Name" {...formField(form, 'name')} />
        <SelectField
          label="Area"
          options={areas.map((a): SelectOption => [a.id, `${siteName(a.siteId)} · ${a.name}`])}
          {...formField(form, 'areaId', { setValueAs: asNumber })}
        />
        <SelectField
          label="Type"
          options={machineTypes.map((t): SelectOption => [t, t[0]!.toUpperCase() + t.slice(1)])}
          {...formField(form, 'type')}
        />
        <NumberField
          label="Nominal speed"
          unit="r/min"
          {...formField(form, 'nominalRpm', { setValueAs: asNumber })}
        />
        <SelectField
          label="ISO 20816-3 group"
          hint="Group 1: 300 kW – 50 MW; group 2: 15 – 300 kW."
          options={isoGroupOptions}
          {...formField(form, 'isoGroup', { setValueAs: asNumber })}
        />
        <SelectField
          label="Foundation"
          options={foundationOptions}
          {...formField(form, 'foundation')}
        />
        <SelectField
          label="Criticality"
          options={criticalityOptions}
          {...formField(form, 'criticality')}
        />
        <NumberField
          label="Power (optional)"
          unit="kW"
          {...formField(form, 'powerKw', { setValueAs: asNullableNumber })}
        />
        <NumberField
          label="Blade count (optional)"
          step="1"
          {...formField(form, 'bladeCount', { setValueAs: asNullableNumber })}
        />
        <NumberField
          label="Vane count (optional)"
          step="1"
          {...formField(form, 'vaneCount', { setValueAs: asNullableNumber })}
        />
        <SelectField
          label="Supply frequency"
          hint="Of the motor on this machine; none for a machine without a mains-fed motor or on an inverter."
          options={lineHzOptions}
          {...formField(form, 'lineHz', { setValueAs: asNullableNumber })}
        />
      </div>

      <FormSection title="Rolling-element bearings">
        {bearings.fields.length === 0 && (
          <p className="text-sm text-ink-muted">
            No bearings yet. Their geometry gives the fault frequencies.
          </p>
        )}
        {bearings.fields.map((f, i) => (
          <div
            key={f.id}
            className="rounded-md border border-line bg-paper/60 p-3"
            aria-label={`Bearing ${i + 1}`}
            role="group"
          >
            <div className="grid gap-3 sm:grid-cols-4">
              <InputField
                label="Position"
                className="sm:col-span-2"
                placeholder="Motor DE"
                {...formField(form, `bearings.${i}.name`)}
              />
              <InputField
                label="Designation"
                className="sm:col-span-2"
                inputClassName="font-mono"
                placeholder="6316"
                {...formField(form, `bearings.${i}.designation`)}
              />
              <NumberField
                label="Rolling elements"
                step="1"
                {...formField(form, `bearings.${i}.rollingElements`, { setValueAs: asNumber })}
              />
              <NumberField
                label="Ball diameter"
                unit="mm"
                {...formField(form, `bearings.${i}.ballDiameterMm`, { setValueAs: asNumber })}
              />
              <NumberField
                label="Pitch diameter"
                unit="mm"
                {...formField(form, `bearings.${i}.pitchDiameterMm`, { setValueAs: asNumber })}
              />
              <NumberField
                label="Contact angle"
                unit="°"
                {...formField(form, `bearings.${i}.contactAngleDeg`, { setValueAs: asNumber })}
              />
              <NumberField
                label="Speed ratio"
                unit="×"
                hint="Shaft speed ÷ machine speed."
                {...formField(form, `bearings.${i}.speedRatio`, { setValueAs: asNumber })}
              />
            </div>
            <Button size="sm" variant="ghost" className="mt-2" onClick={() => bearings.remove(i)}>
              Remove bearing
            </Button>
          </div>
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
          <div
            key={f.id}
            className="rounded-md border border-line bg-paper/60 p-3"
            role="group"
            aria-label={`Gear mesh ${i + 1}`}
          >
            <div className="grid gap-3 sm:grid-cols-4">
              <InputField label="Name" {...formField(form, `gears.${i}.name`)} />
              <NumberField
                label="Teeth"
                step="1"
                {...formField(form, `gears.${i}.teeth`, { setValueAs: asNumber })}
              />
              <NumberField
                label="Mate teeth"
                step="1"
                {...formField(form, `gears.${i}.mateTeeth`, { setValueAs: asNumber })}
              />
              <NumberField
                label="Speed ratio"
                unit="×"
                {...formField(form, `gears.${i}.speedRatio`, { setValueAs: asNumber })}
              />
            </div>
            <Button size="sm" variant="ghost" className="mt-2" onClick={() => gears.remove(i)}>
              Remove gear mesh
            </Button>
          </div>
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
