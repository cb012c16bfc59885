import { useState } from 'react';
import {
  useWatch,
  type Control,
  type FieldErrors,
  type UseFormRegister,
  type UseFormSetValue,
} from 'react-hook-form';
import { Button } from '../../../components/ui/button.tsx';
import { useUnits } from '../../account/api/use-units.ts';
import {
  Field,
  Input,
  NumberField,
  SelectField,
  type SelectOption,
} from '../../../components/ui/field.tsx';
import type { LimitsFormValues } from '../utils/band-form.ts';
import { getSuggestion } from '../api/get-limits.ts';

const kindLabels = {
  overall: 'Overall value',
  hz: 'Band in Hz',
  order: 'Band in orders',
  fault: 'Window around a fault frequency',
} as const;
const faultLabels = {
  '1x': '1× running speed',
  '2x': '2×',
  '3x': '3×',
  bpfo: 'BPFO (outer race)',
  bpfi: 'BPFI (inner race)',
  bsf: 'BSF (rolling element)',
  ftf: 'FTF (cage)',
  'gear-mesh': 'Gear mesh',
  'blade-pass': 'Blade / vane pass',
} as const;
const halfWidthUnitOptions: SelectOption[] = [
  ['percent', '% of the frequency'],
  ['hz', 'Hz'],
  ['order', 'orders'],
];
const spectrumOptions: SelectOption[] = [
  ['velocity', 'Velocity'],
  ['acceleration', 'Acceleration'],
  ['envelope', 'Envelope'],
  ['displacement', 'Displacement'],
];
const measureOptions: SelectOption[] = [
  ['rms', 'RMS'],
  ['peak', 'Peak'],
  ['peak-to-peak', 'Peak-to-peak'],
];
const combineOptions: SelectOption[] = [
  ['min', 'Lower of the two'],
  ['max', 'Higher of the two'],
  ['statistical', 'Statistical only'],
];

type BandKey = keyof LimitsFormValues['bands'][number];

type Props = {
  index: number;
  /** The point whose stored trend a suggestion is taken from; null for a template. */
  pointId: number | null;
  control: Control<LimitsFormValues>;
  register: UseFormRegister<LimitsFormValues>;
  setValue: UseFormSetValue<LimitsFormValues>;
  errors: FieldErrors<LimitsFormValues>;
  onRemove: () => void;
};

/** The fields of one band; which range fields show depends on its kind. */
export function BandFields({
  index,
  pointId,
  control,
  register,
  setValue,
  errors,
  onRemove,
}: Props) {
  const band = useWatch({ control, name: `bands.${index}` });
  const units = useUnits();
  const e = errors.bands?.[index];
  const [suggestion, setSuggestion] = useState<{ busy: boolean; text: string | null }>({
    busy: false,
    text: null,
  });
  // A field's registration and its error message, both found by the band value's name; the
  // band form's number fields are compact.
  const number = (name: BandKey, onChange?: () => void) => ({
    controlSize: 'sm' as const,
    error: e?.[name]?.message,
    ...register(`bands.${index}.${name}` as const, { valueAsNumber: true, onChange }),
  });
  // Levels typed by hand no longer come from the source named before.
  const byHand = () => setValue(`bands.${index}.levelSource`, 'set by hand');
  const choice = (name: BandKey) => ({
    error: e?.[name]?.message,
    ...register(`bands.${index}.${name}` as const),
  });
  const t = (name: BandKey) => register(`bands.${index}.${name}` as const);

  const suggest = async () => {
    if (pointId === null) return;
    setSuggestion({ busy: true, text: null });
    try {
      const s = await getSuggestion(pointId, band.key);
      if (s.alertLevel === null || s.dangerLevel === null || !s.baseline) {
        setSuggestion({ busy: false, text: s.message ?? 'No baseline available.' });
        return;
      }
      // Suggested levels in the user's unit system, three significant digits.
      const round = (v: number) => Number(units.value(v, band.unit).toPrecision(3));
      setValue(`bands.${index}.alertLevel`, round(s.alertLevel), {
        shouldDirty: true,
        shouldValidate: true,
      });
      setValue(`bands.${index}.dangerLevel`, round(s.dangerLevel), {
        shouldDirty: true,
        shouldValidate: true,
      });
      setValue(
        `bands.${index}.levelSource`,
        `baseline mean + ${s.kAlert}σ / ${s.kDanger}σ over ${s.baseline.count} values`,
        { shouldDirty: true },
      );
      setSuggestion({
        busy: false,
        text: `Baseline of the first ${s.baseline.count} usable values: mean ${units.format(s.baseline.mean, band.unit)}, σ ${units.format(s.baseline.sigma, band.unit)} → alert mean + ${s.kAlert}σ, danger mean + ${s.kDanger}σ.`,
      });
    } catch (err) {
      setSuggestion({
        busy: false,
        text: err instanceof Error ? err.message : 'Could not suggest levels.',
      });
    }
  };

  return (
    <fieldset
      className="rounded-lg border border-line bg-surface p-4"
      aria-label={`Band ${index + 1}: ${band?.name ?? ''}`}
    >
      <legend className="px-1 text-sm font-semibold text-ink">
        {band?.name || `Band ${index + 1}`}{' '}
        <span className="font-mono text-xs font-normal text-ink-muted">{band?.key}</span>
      </legend>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Field label="Name" error={e?.name?.message} className="col-span-2">
          {(c) => <Input {...c} controlSize="sm" {...t('name')} />}
        </Field>
        <Field label="Key" error={e?.key?.message} hint="Trend and alerts follow it">
          {(c) => <Input {...c} controlSize="sm" className="font-mono" {...t('key')} />}
        </Field>
        <SelectField label="Kind" options={Object.entries(kindLabels)} {...choice('kind')} />

        {(band?.kind === 'hz' || band?.kind === 'overall') && (
          <>
            <NumberField
              label="From (Hz)"
              hint={band.kind === 'overall' ? 'Empty: the analysis span' : undefined}
              {...number('fromHz')}
            />
            <NumberField label="To (Hz)" {...number('toHz')} />
          </>
        )}
        {band?.kind === 'order' && (
          <>
            <NumberField label="From (orders)" {...number('fromOrder')} />
            <NumberField label="To (orders)" {...number('toOrder')} />
          </>
        )}
        {band?.kind === 'fault' && (
          <>
            <SelectField
              label="Fault frequency"
              options={Object.entries(faultLabels)}
              {...choice('fault')}
            />
            <NumberField label="Half-width" {...number('halfWidth')} />
            <SelectField
              label="Half-width unit"
              options={halfWidthUnitOptions}
              {...choice('halfWidthUnit')}
            />
            <NumberField
              label="Harmonics"
              hint="1 = fundamental only"
              step="1"
              {...number('harmonics')}
            />
          </>
        )}

        <SelectField label="Spectrum" options={spectrumOptions} {...choice('spectrum')} />
        <SelectField label="Measure" options={measureOptions} {...choice('measure')} />
        <SelectField
          label="Unit"
          options={[
            ['mm/s', units.unit('mm/s')],
            ['g', 'g'],
            ['um', units.unit('um')],
          ]}
          {...choice('unit')}
        />
        <div />
        <NumberField label="Alert level" {...number('alertLevel', byHand)} />
        <NumberField label="Danger level" {...number('dangerLevel', byHand)} />
        <NumberField
          label="Persistence"
          hint="Exceedances in a row to raise"
          step="1"
          min="1"
          {...number('persistence')}
        />
        <NumberField
          label="Clear persistence"
          hint="Values in a row below the clear level to clear"
          step="1"
          min="1"
          {...number('clearPersistence')}
        />
        <NumberField
          label="Clear after (h)"
          hint="Hours below the clear level to clear, as well"
          step="1"
          min="0"
          {...number('clearAfterHours')}
        />
        <NumberField
          label="Hysteresis"
          hint="Clears below this × alert level"
          step="0.01"
          {...number('hysteresis')}
        />
      </div>

      <div className="mt-3 flex flex-col gap-3 border-t border-line pt-3">
        <label className="flex items-center gap-2 text-sm text-ink">
          <input type="checkbox" className="size-4 accent-accent" {...t('statistical')} />
          Statistical rule: levels from the baseline mean + k·σ
        </label>
        {band?.statistical && (
          <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
            <NumberField label="k for alert" {...number('kAlert')} />
            <NumberField
              label="k for danger"
              hint="Empty: danger stays fixed"
              {...number('kDanger')}
            />
            <NumberField label="Baseline: first N values" step="1" {...number('baselineCount')} />
            <SelectField
              label="Combine with fixed levels"
              options={combineOptions}
              {...choice('combine')}
            />
          </div>
        )}
        <div className="flex flex-wrap items-center gap-2">
          {pointId !== null && (
            <Button size="sm" onClick={() => void suggest()} busy={suggestion.busy}>
              Suggest from baseline
            </Button>
          )}
          <Button size="sm" variant="ghost" onClick={onRemove}>
            Remove band
          </Button>
          {band?.levelSource && (
            <span className="text-xs text-ink-muted">Levels: {band.levelSource}</span>
          )}
        </div>
        {suggestion.text && (
          <p role="status" className="text-xs text-ink-muted">
            {suggestion.text}
          </p>
        )}
      </div>
    </fieldset>
  );
}
