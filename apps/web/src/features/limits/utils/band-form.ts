/**
 * The band editor's form values: one flat record per band (every field of every band kind,
 * numbers as NaN when empty), turned into a `BandDefinition` and checked with the shared
 * contract schema on submit, so the editor and the server agree on what a band is.
 * Levels are typed in the user's unit system (in/s and mil for imperial) and stored in metric:
 * `toFormBand` shows a converted level to four significant digits and keeps the stored value
 * beside it (`alertLevelStored`); `toDefinition` gives that stored value back while the field
 * still shows it, and converts only a level typed anew (contracts/units.ts).
 */
import { z } from 'zod';
import type { FieldErrors } from 'react-hook-form';
import { NEW_BAND_RULES } from '@turnstone/condition/band-definition';
import { bandDefinitionSchema, type BandDefinitionInput } from '@turnstone/contracts/limits';
import { levelForInput, levelFromInput, type UnitSystem } from '@turnstone/contracts/units';

export interface BandFormValues {
  key: string;
  name: string;
  kind: BandDefinitionInput['kind'];
  spectrum: BandDefinitionInput['spectrum'];
  measure: BandDefinitionInput['measure'];
  unit: BandDefinitionInput['unit'];
  alertLevel: number;
  dangerLevel: number;
  /** The stored (metric) levels the fields were filled from; NaN for none. */
  alertLevelStored: number;
  dangerLevelStored: number;
  persistence: number;
  clearPersistence: number;
  clearAfterHours: number;
  hysteresis: number;
  fromHz: number;
  toHz: number;
  fromOrder: number;
  toOrder: number;
  fault: Extract<BandDefinitionInput, { kind: 'fault' }>['fault'];
  halfWidth: number;
  halfWidthUnit: Extract<BandDefinitionInput, { kind: 'fault' }>['halfWidthUnit'];
  harmonics: number;
  component: string;
  statistical: boolean;
  kAlert: number;
  kDanger: number;
  baselineCount: number;
  combine: 'min' | 'max' | 'statistical';
  levelSource: string;
}

export interface LimitsFormValues {
  bands: BandFormValues[];
}

const num = (v: number | undefined) => (v === undefined ? Number.NaN : v);
const opt = (v: number) => (Number.isFinite(v) ? v : undefined);

export function toFormBand(b: BandDefinitionInput, system: UnitSystem = 'metric'): BandFormValues {
  const s = b.statistical;
  return {
    key: b.key,
    name: b.name,
    kind: b.kind,
    spectrum: b.spectrum,
    measure: b.measure,
    unit: b.unit,
    alertLevel: levelForInput(b.alertLevel, b.unit, system),
    dangerLevel: levelForInput(b.dangerLevel, b.unit, system),
    alertLevelStored: b.alertLevel,
    dangerLevelStored: b.dangerLevel,
    persistence: num(b.persistence),
    clearPersistence: num(b.clearPersistence),
    clearAfterHours: num(b.clearAfterHours),
    hysteresis: num(b.hysteresis),
    fromHz: b.kind === 'overall' || b.kind === 'hz' ? num(b.fromHz) : Number.NaN,
    toHz: b.kind === 'overall' || b.kind === 'hz' ? num(b.toHz) : Number.NaN,
    fromOrder: b.kind === 'order' ? b.fromOrder : Number.NaN,
    toOrder: b.kind === 'order' ? b.toOrder : Number.NaN,
    fault: b.kind === 'fault' ? b.fault : '1x',
    halfWidth: b.kind === 'fault' ? b.halfWidth : Number.NaN,
    halfWidthUnit: b.kind === 'fault' ? b.halfWidthUnit : 'percent',
    harmonics: b.kind === 'fault' ? num(b.harmonics) : Number.NaN,
    component: b.kind === 'fault' ? (b.component ?? '') : '',
    statistical: s !== undefined,
    kAlert: s?.kAlert ?? 3,
    kDanger: num(s?.kDanger),
    baselineCount: s?.baseline.from === 'first-n' ? s.baseline.count : 30,
    combine: s?.combine ?? 'min',
    levelSource: b.levelSource ?? '',
  };
}

/** A new band, for "Add band", with the rules every new band starts with (condition's). */
export function emptyBand(index: number, system: UnitSystem = 'metric'): BandFormValues {
  return toFormBand(
    {
      key: `band-${index + 1}`,
      name: 'New band',
      kind: 'hz',
      fromHz: 10,
      toHz: 1000,
      spectrum: 'velocity',
      measure: 'rms',
      unit: 'mm/s',
      alertLevel: 2.8,
      dangerLevel: 4.5,
      ...NEW_BAND_RULES,
    },
    system,
  );
}

/** The band definition the API takes; `original` keeps fields the form does not edit. */
export function toDefinition(
  f: BandFormValues,
  original?: BandDefinitionInput,
  system: UnitSystem = 'metric',
): unknown {
  const common = {
    key: f.key.trim(),
    name: f.name.trim(),
    spectrum: f.spectrum,
    measure: f.measure,
    unit: f.unit,
    alertLevel: levelFromInput(f.alertLevel, f.unit, system, f.alertLevelStored),
    dangerLevel: levelFromInput(f.dangerLevel, f.unit, system, f.dangerLevelStored),
    ...(opt(f.persistence) !== undefined ? { persistence: f.persistence } : {}),
    ...(opt(f.clearPersistence) !== undefined ? { clearPersistence: f.clearPersistence } : {}),
    ...(opt(f.clearAfterHours) !== undefined ? { clearAfterHours: f.clearAfterHours } : {}),
    ...(opt(f.hysteresis) !== undefined ? { hysteresis: f.hysteresis } : {}),
    ...(f.levelSource.trim() ? { levelSource: f.levelSource.trim() } : {}),
    ...(f.statistical
      ? {
          statistical: {
            kAlert: f.kAlert,
            ...(opt(f.kDanger) !== undefined ? { kDanger: f.kDanger } : {}),
            baseline: { from: 'first-n', count: f.baselineCount },
            combine: f.combine,
            // A baseline already established stays with the rule while its source is unchanged.
            ...(original?.statistical?.established &&
            original.statistical.baseline.from === 'first-n' &&
            original.statistical.baseline.count === f.baselineCount
              ? { established: original.statistical.established }
              : {}),
          },
        }
      : {}),
  };
  switch (f.kind) {
    case 'overall':
      return {
        ...common,
        kind: 'overall',
        ...(opt(f.fromHz) !== undefined ? { fromHz: f.fromHz } : {}),
        ...(opt(f.toHz) !== undefined ? { toHz: f.toHz } : {}),
      };
    case 'hz':
      return { ...common, kind: 'hz', fromHz: f.fromHz, toHz: f.toHz };
    case 'order':
      return { ...common, kind: 'order', fromOrder: f.fromOrder, toOrder: f.toOrder };
    case 'fault':
      return {
        ...common,
        kind: 'fault',
        fault: f.fault,
        halfWidth: f.halfWidth,
        halfWidthUnit: f.halfWidthUnit,
        ...(opt(f.harmonics) !== undefined ? { harmonics: f.harmonics } : {}),
        ...(f.component.trim() ? { component: f.component.trim() } : {}),
      };
  }
}

const nanMessage = (issue: { message: string }) =>
  /NaN|expected number/i.test(issue.message) ? 'Enter a number.' : issue.message;

/**
 * Checks every band with the shared contract schema, plus danger above alert; returns the
 * definitions, or errors keyed by form path (`bands.0.alertLevel`).
 */
export function checkForm(
  values: LimitsFormValues,
  originals: readonly BandDefinitionInput[],
  system: UnitSystem = 'metric',
):
  | { ok: true; bands: BandDefinitionInput[] }
  | { ok: false; errors: { path: string; message: string }[] } {
  const errors: { path: string; message: string }[] = [];
  const bands: BandDefinitionInput[] = [];
  const keys = new Set<string>();
  values.bands.forEach((f, i) => {
    const original = originals.find((o) => o.key === f.key);
    const parsed = bandDefinitionSchema.safeParse(toDefinition(f, original, system));
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const field =
          issue.path[0] === 'statistical'
            ? mapStatistical(issue.path)
            : String(issue.path[0] ?? 'key');
        errors.push({ path: `bands.${i}.${field}`, message: nanMessage(issue) });
      }
      return;
    }
    const b = parsed.data;
    if (!(b.dangerLevel > b.alertLevel))
      errors.push({
        path: `bands.${i}.dangerLevel`,
        message: 'The danger level must be above the alert level.',
      });
    if (keys.has(b.key))
      errors.push({ path: `bands.${i}.key`, message: 'Another band has this key.' });
    keys.add(b.key);
    bands.push(b);
  });
  return errors.length ? { ok: false, errors } : { ok: true, bands };
}

function mapStatistical(path: PropertyKey[]): string {
  const last = String(path.at(-1));
  if (last === 'count') return 'baselineCount';
  return last;
}

export const reasonSchema = z
  .string()
  .trim()
  .min(3, 'Say why the limits change (at least 3 characters).')
  .max(1000);

/** Maps the server's `bands.0.statistical.kAlert`-style paths to form fields. */
export function formPathOf(serverPath: string): string {
  const parts = serverPath.split('.');
  if (parts[0] !== 'bands' || parts.length < 3) return 'root';
  const field = parts[2] === 'statistical' ? mapStatistical(parts.slice(2)) : parts[2]!;
  return `bands.${parts[1]}.${field}`;
}

/** The form's nested errors (as react-hook-form keeps them) from flat `bands.0.alertLevel` paths. */
export function nestErrors(
  errors: { path: string; message: string }[],
): FieldErrors<LimitsFormValues> {
  const out: Record<string, unknown> = {};
  for (const { path, message } of errors) {
    const parts = path.split('.');
    let node = out as Record<string, unknown>;
    parts.forEach((part, i) => {
      if (i === parts.length - 1) node[part] ??= { type: 'validate', message };
      else node = (node[part] ??= {}) as Record<string, unknown>;
    });
  }
  return out as FieldErrors<LimitsFormValues>;
}
