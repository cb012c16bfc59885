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
import { Field, Input, Select } from '../../../components/ui/field.tsx';
import { deleteMachine, saveMachine, useSetupMutation } from '../api/save-setup.ts';
import { applyServerErrors, asNullableNumber, asNumber } from '../utils/server-errors.ts';
import { FormActions, FormAlert, FormSection, NumberField } from './form-parts.tsx';

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
  const { errors } = form.formState;
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
        <Field label="Name" error={errors.name?.message}>
          {({ invalid, ...ids }) => <Input {...ids} invalid={invalid} {...form.register('name')} />}
        </Field>
        <Field label="Area" error={errors.areaId?.message}>
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('areaId', { setValueAs: asNumber })}>
              {areas.map((a) => (
                <option key={a.id} value={a.id}>
                  {siteName(a.siteId)} · {a.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Type" error={errors.type?.message}>
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('type')}>
              {machineTypes.map((t) => (
                <option key={t} value={t}>
                  {t[0]!.toUpperCase() + t.slice(1)}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <NumberField
          label="Nominal speed"
          unit="r/min"
          error={errors.nominalRpm?.message}
          registration={form.register('nominalRpm', { setValueAs: asNumber })}
        />
        <Field
          label="ISO 20816-3 group"
          hint="Group 1: 300 kW – 50 MW; group 2: 15 – 300 kW."
          error={errors.isoGroup?.message}
        >
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('isoGroup', { setValueAs: asNumber })}>
              <option value={1}>Group 1 (large)</option>
              <option value={2}>Group 2 (medium)</option>
            </Select>
          )}
        </Field>
        <Field label="Foundation" error={errors.foundation?.message}>
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('foundation')}>
              <option value="rigid">Rigid</option>
              <option value="flexible">Flexible</option>
            </Select>
          )}
        </Field>
        <Field label="Criticality" error={errors.criticality?.message}>
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('criticality')}>
              <option value="low">Low</option>
              <option value="medium">Medium</option>
              <option value="high">High</option>
            </Select>
          )}
        </Field>
        <NumberField
          label="Power (optional)"
          unit="kW"
          error={errors.powerKw?.message}
          registration={form.register('powerKw', { setValueAs: asNullableNumber })}
        />
        <NumberField
          label="Blade count (optional)"
          step="1"
          error={errors.bladeCount?.message}
          registration={form.register('bladeCount', { setValueAs: asNullableNumber })}
        />
        <NumberField
          label="Vane count (optional)"
          step="1"
          error={errors.vaneCount?.message}
          registration={form.register('vaneCount', { setValueAs: asNullableNumber })}
        />
        <Field
          label="Supply frequency"
          hint="Of the motor on this machine; none for a machine without a mains-fed motor or on an inverter."
          error={errors.lineHz?.message}
        >
          {({ invalid: _i, ...ids }) => (
            <Select {...ids} {...form.register('lineHz', { setValueAs: asNullableNumber })}>
              <option value="">None or not known</option>
              <option value={50}>50 Hz</option>
              <option value={60}>60 Hz</option>
            </Select>
          )}
        </Field>
      </div>

      <FormSection title="Rolling-element bearings">
        {bearings.fields.length === 0 && (
          <p className="text-sm text-ink-muted">
            No bearings yet. Their geometry gives the fault frequencies.
          </p>
        )}
        {bearings.fields.map((f, i) => {
          const e = errors.bearings?.[i];
          return (
            <div
              key={f.id}
              className="rounded-md border border-line bg-paper/60 p-3"
              aria-label={`Bearing ${i + 1}`}
              role="group"
            >
              <div className="grid gap-3 sm:grid-cols-4">
                <Field label="Position" error={e?.name?.message} className="sm:col-span-2">
                  {({ invalid, ...ids }) => (
                    <Input
                      {...ids}
                      invalid={invalid}
                      placeholder="Motor DE"
                      {...form.register(`bearings.${i}.name`)}
                    />
                  )}
                </Field>
                <Field
                  label="Designation"
                  error={e?.designation?.message}
                  className="sm:col-span-2"
                >
                  {({ invalid, ...ids }) => (
                    <Input
                      {...ids}
                      invalid={invalid}
                      className="font-mono"
                      placeholder="6316"
                      {...form.register(`bearings.${i}.designation`)}
                    />
                  )}
                </Field>
                <NumberField
                  label="Rolling elements"
                  step="1"
                  error={e?.rollingElements?.message}
                  registration={form.register(`bearings.${i}.rollingElements`, {
                    setValueAs: asNumber,
                  })}
                />
                <NumberField
                  label="Ball diameter"
                  unit="mm"
                  error={e?.ballDiameterMm?.message}
                  registration={form.register(`bearings.${i}.ballDiameterMm`, {
                    setValueAs: asNumber,
                  })}
                />
                <NumberField
                  label="Pitch diameter"
                  unit="mm"
                  error={e?.pitchDiameterMm?.message}
                  registration={form.register(`bearings.${i}.pitchDiameterMm`, {
                    setValueAs: asNumber,
                  })}
                />
                <NumberField
                  label="Contact angle"
                  unit="°"
                  error={e?.contactAngleDeg?.message}
                  registration={form.register(`bearings.${i}.contactAngleDeg`, {
                    setValueAs: asNumber,
                  })}
                />
                <NumberField
                  label="Speed ratio"
                  unit="×"
                  hint="Shaft speed ÷ machine speed."
                  error={e?.speedRatio?.message}
                  registration={form.register(`bearings.${i}.speedRatio`, { setValueAs: asNumber })}
                />
              </div>
              <Button size="sm" variant="ghost" className="mt-2" onClick={() => bearings.remove(i)}>
                Remove bearing
              </Button>
            </div>
          );
        })}
        <div>
          <Button size="sm" onClick={() => bearings.append(newBearing)}>
            Add bearing
          </Button>
        </div>
      </FormSection>

      <FormSection title="Gear meshes">
        {gears.fields.length === 0 && <p className="text-sm text-ink-muted">No gear meshes.</p>}
        {gears.fields.map((f, i) => {
          const e = errors.gears?.[i];
          return (
            <div
              key={f.id}
              className="rounded-md border border-line bg-paper/60 p-3"
              role="group"
              aria-label={`Gear mesh ${i + 1}`}
            >
              <div className="grid gap-3 sm:grid-cols-4">
                <Field label="Name" error={e?.name?.message}>
                  {({ invalid, ...ids }) => (
                    <Input {...ids} invalid={invalid} {...form.register(`gears.${i}.name`)} />
                  )}
                </Field>
                <NumberField
                  label="Teeth"
                  step="1"
                  error={e?.teeth?.message}
                  registration={form.register(`gears.${i}.teeth`, { setValueAs: asNumber })}
                />
                <NumberField
                  label="Mate teeth"
                  step="1"
                  error={e?.mateTeeth?.message}
                  registration={form.register(`gears.${i}.mateTeeth`, { setValueAs: asNumber })}
                />
                <NumberField
                  label="Speed ratio"
                  unit="×"
                  error={e?.speedRatio?.message}
                  registration={form.register(`gears.${i}.speedRatio`, { setValueAs: asNumber })}
                />
              </div>
              <Button size="sm" variant="ghost" className="mt-2" onClick={() => gears.remove(i)}>
                Remove gear mesh
              </Button>
            </div>
          );
        })}
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
