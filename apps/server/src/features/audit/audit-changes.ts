/**
 * An audit entry's change in plain lines: which field went from which value to which. A
 * limit set's bands are compared band by band (matched by key), so a changed alert level
 * reads "Overall velocity · alert level: 2.8 → 3.1 mm/s" instead of two JSON documents.
 * Levels are written in the reader's unit system: exactly as stored in metric, and converted
 * to four significant digits in imperial ("0.1102 → 0.1220 in/s").
 */
import { formatNumber } from '@turnstone/contracts/number-format';
import {
  displayUnit,
  LEVEL_DIGITS,
  toDisplay,
  unitText,
  type UnitSystem,
} from '@turnstone/contracts/units';

export interface AuditChange {
  /** What changed, e.g. "Overall velocity · alert level" or "name". */
  field: string;
  /** Old and new values as text; null when absent (added or removed). */
  before: string | null;
  after: string | null;
}

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Band fields in people's words (the rest keep their key). */
const BAND_FIELDS: Record<string, string> = {
  alertLevel: 'alert level',
  dangerLevel: 'danger level',
  persistence: 'values to raise',
  clearPersistence: 'values to clear',
  clearAfterHours: 'clear off-delay (h)',
  hysteresis: 'hysteresis',
  name: 'name',
  fromHz: 'from (Hz)',
  toHz: 'to (Hz)',
  fromOrder: 'from (order)',
  toOrder: 'to (order)',
  statistical: 'statistical rule',
};

function text(v: unknown, unit?: string, system: UnitSystem = 'metric'): string | null {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number') {
    if (!unit) return String(v);
    const shown = displayUnit(unit, system);
    return shown === unit
      ? `${v} ${unitText(unit)}`
      : `${formatNumber(toDisplay(v, unit, system), LEVEL_DIGITS)} ${unitText(shown)}`;
  }
  if (typeof v === 'string') return v;
  return JSON.stringify(v);
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

function isBandList(v: unknown): v is Obj[] {
  return Array.isArray(v) && v.every((b) => isObj(b) && typeof b.key === 'string');
}

function bandChanges(before: Obj[], after: Obj[], system: UnitSystem): AuditChange[] {
  const out: AuditChange[] = [];
  const old = new Map(before.map((b) => [String(b.key), b]));
  const now = new Map(after.map((b) => [String(b.key), b]));
  for (const [key, b] of now) {
    const name = String(b.name ?? key);
    const a = old.get(key);
    if (!a) {
      out.push({ field: `${name}`, before: null, after: 'band added' });
      continue;
    }
    const unit = typeof b.unit === 'string' ? b.unit : undefined;
    for (const f of new Set([...Object.keys(a), ...Object.keys(b)])) {
      if (f === 'key' || same(a[f], b[f])) continue;
      const levelField = f === 'alertLevel' || f === 'dangerLevel';
      out.push({
        field: `${name} · ${BAND_FIELDS[f] ?? f}`,
        before: text(a[f], levelField ? unit : undefined, system),
        after: text(b[f], levelField ? unit : undefined, system),
      });
    }
  }
  for (const [key, a] of old)
    if (!now.has(key)) out.push({ field: String(a.name ?? key), before: 'band', after: null });
  return out;
}

/**
 * The entry's changes, levels in `system`; empty when there is nothing to compare (a creation
 * lists its fields).
 */
export function auditChanges(
  before: unknown,
  after: unknown,
  system: UnitSystem = 'metric',
): AuditChange[] {
  if (isBandList(after) && (before === null || before === undefined || isBandList(before)))
    return bandChanges(before ?? [], after, system);
  if (isObj(before) || isObj(after)) {
    const a = isObj(before) ? before : {};
    const b = isObj(after) ? after : {};
    const out: AuditChange[] = [];
    for (const f of new Set([...Object.keys(a), ...Object.keys(b)])) {
      if (same(a[f], b[f])) continue;
      out.push({ field: f, before: text(a[f]), after: text(b[f]) });
    }
    return out;
  }
  return [];
}
