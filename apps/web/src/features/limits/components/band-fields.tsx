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
import { Field, Input, Select } from '../../../components/ui/field.tsx';
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
  const n = (name: keyof LimitsFormValues['bands'][number]) =>
    register(`bands.${index}.${name}` as const, { valueAsNumber: true });
  // Levels typed by hand no longer come from the source named before.
  const level = (name: 'alertLevel' | 'dangerLevel') =>
    register(`bands.${index}.${name}` as const, {
      valueAsNumber: true,
      onChange: () => setValue(`bands.${index}.levelSource`, 'set by hand'),
    });
  const t = (name: keyof LimitsFormValues['bands'][number]) =>
    register(`bands.${index}.${name}` as const);

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
        <Field label="Kind" error={e?.kind?.message}>
          {(c) => (
            <Select id={c.id} {...t('kind')}>
              {Object.entries(kindLabels).map(([k, label]) => (
                <option key={k} value={k}>
                  {label}
                </option>
              ))}
            </Select>
          )}
        </Field>

        {(band?.kind === 'hz' || band?.kind === 'overall') && (
          <>
            <NumberField
              label="From (Hz)"
              error={e?.fromHz?.message}
              hint={band.kind === 'overall' ? 'Empty: the analysis span' : undefined}
              registration={n('fromHz')}
            />
            <NumberField label="To (Hz)" error={e?.toHz?.message} registration={n('toHz')} />
          </>
        )}
        {band?.kind === 'order' && (
          <>
            <NumberField
              label="From (orders)"
              error={e?.fromOrder?.message}
              registration={n('fromOrder')}
            />
            <NumberField
              label="To (orders)"
              error={e?.toOrder?.message}
              registration={n('toOrder')}
            />
          </>
        )}
        {band?.kind === 'fault' && (
          <>
            <Field label="Fault frequency" error={e?.fault?.message}>
              {(c) => (
                <Select id={c.id} {...t('fault')}>
                  {Object.entries(faultLabels).map(([k, label]) => (
                    <option key={k} value={k}>
                      {label}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <NumberField
              label="Half-width"
              error={e?.halfWidth?.message}
              registration={n('halfWidth')}
            />
            <Field label="Half-width unit" error={e?.halfWidthUnit?.message}>
              {(c) => (
                <Select id={c.id} {...t('halfWidthUnit')}>
                  <option value="percent">% of the frequency</option>
                  <option value="hz">Hz</option>
                  <option value="order">orders</option>
                </Select>
              )}
            </Field>
            <NumberField
              label="Harmonics"
              error={e?.harmonics?.message}
              hint="1 = fundamental only"
              step="1"
              registration={n('harmonics')}
            />
          </>
        )}

        <Field label="Spectrum" error={e?.spectrum?.message}>
          {(c) => (
            <Select id={c.id} {...t('spectrum')}>
              <option value="velocity">Velocity</option>
              <option value="acceleration">Acceleration</option>
              <option value="envelope">Envelope</option>
              <option value="displacement">Displacement</option>
            </Select>
          )}
        </Field>
        <Field label="Measure" error={e?.measure?.message}>
          {(c) => (
            <Select id={c.id} {...t('measure')}>
              <option value="rms">RMS</option>
              <option value="peak">Peak</option>
              <option value="peak-to-peak">Peak-to-peak</option>
            </Select>
          )}
        </Field>
        <Field label="Unit" error={e?.unit?.message}>
          {(c) => (
            <Select id={c.id} {...t('unit')}>
              <option value="mm/s">{units.unit('mm/s')}</option>
              <option value="g">g</option>
              <option value="um">{units.unit('um')}</option>
            </Select>
          )}
        </Field>
        <div />
        <NumberField
          label="Alert level"
          error={e?.alertLevel?.message}
          registration={level('alertLevel')}
        />
        <NumberField
          label="Danger level"
          error={e?.dangerLevel?.message}
          registration={level('dangerLevel')}
        />
        <NumberField
          label="Persistence"
          error={e?.persistence?.message}
          hint="Exceedances in a row to raise"
          step="1"
          min="1"
          registration={n('persistence')}
        />
        <NumberField
          label="Clear persistence"
          error={e?.clearPersistence?.message}
          hint="Values in a row below the clear level to clear"
          step="1"
          min="1"
          registration={n('clearPersistence')}
        />
        <NumberField
          label="Clear after (h)"
          error={e?.clearAfterHours?.message}
          hint="Hours below the clear level to clear, as well"
          step="1"
          min="0"
          registration={n('clearAfterHours')}
        />
        <NumberField
          label="Hysteresis"
          error={e?.hysteresis?.message}
          hint="Clears below this × alert level"
          step="0.01"
          registration={n('hysteresis')}
        />
      </div>

      <div className="mt-3 flex flex-col gap-3 border-t border-line pt-3">
        <label className="flex items-center gap-2 text-sm text-ink">
          <input type="checkbox" className="size-4 accent-accent" {...t('statistical')} />
          Statistical rule: levels from the baseline mean + k·σ
        </label>
        {band?.statistical && (
          <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
            <NumberField
              label="k for alert"
              error={e?.kAlert?.message}
              registration={n('kAlert')}
            />
            <NumberField
              label="k for danger"
              error={e?.kDanger?.message}
              hint="Empty: danger stays fixed"
              registration={n('kDanger')}
            />
            <NumberField
              label="Baseline: first N values"
              error={e?.baselineCount?.message}
              step="1"
              registration={n('baselineCount')}
            />
            <Field label="Combine with fixed levels" error={e?.combine?.message}>
              {(c) => (
                <Select id={c.id} {...t('combine')}>
                  <option value="min">Lower of the two</option>
                  <option value="max">Higher of the two</option>
                  <option value="statistical">Statistical only</option>
                </Select>
              )}
            </Field>
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

/** A number field of the band form: compact, monospaced, registered with the form. */
function NumberField({
  label,
  error,
  hint,
  step = 'any',
  min,
  registration,
}: {
  label: string;
  error: string | undefined;
  hint?: string | undefined;
  step?: string;
  min?: string;
  registration: ReturnType<UseFormRegister<LimitsFormValues>>;
}) {
  return (
    <Field label={label} error={error} hint={hint}>
      {(c) => (
        <Input
          {...c}
          controlSize="sm"
          type="number"
          step={step}
          min={min}
          className="font-mono"
          {...registration}
        />
      )}
    </Field>
  );
}
