/**
 * A limit band as `@turnstone/condition` defines it → the band(s) `@turnstone/dsp` reads
 * from the spectra. Fault windows with several harmonics read one dsp band per harmonic
 * and are combined here (RMS: root-sum-square; peak: the largest).
 */
import type { BandDefinition as LimitBand } from '@turnstone/condition';
import type {
  BandDefinition as DspBand,
  BandUnit,
  BandValue,
  MachineComponents,
} from '@turnstone/dsp';

export interface PointComponents {
  machine: MachineComponents;
  /** Name of the bearing the point sits on, for fault bands without a component. */
  pointBearing: string | null;
}

const unitOf: Record<LimitBand['spectrum'], BandUnit> = {
  acceleration: 'g',
  velocity: 'mm/s',
  displacement: 'um',
  envelope: 'g',
};

function faultName(band: Extract<LimitBand, { kind: 'fault' }>, c: PointComponents): string | null {
  switch (band.fault) {
    case '1x':
      return '1×';
    case '2x':
      return '2×';
    case '3x':
      return '3×';
    case 'blade-pass':
      return c.machine.blades ? 'blade pass' : null;
    case 'gear-mesh': {
      const gear =
        c.machine.gears?.find((g) => !band.component || g.name === band.component) ?? null;
      return gear ? `${gear.name} GMF` : null;
    }
    default: {
      const bearingName = band.component ?? c.pointBearing ?? c.machine.bearings?.[0]?.name ?? null;
      return bearingName ? `${bearingName} ${band.fault.toUpperCase()}` : null;
    }
  }
}

/** Sub-band key for harmonic h of a fault band. */
const sub = (key: string, h: number) => `${key}#${h}`;

export function toDspBands(
  bands: readonly LimitBand[],
  c: PointComponents,
  nominalShaftHz: number,
): DspBand[] {
  const out: DspBand[] = [];
  for (const b of bands) {
    const unit = unitOf[b.spectrum];
    const source = b.spectrum === 'envelope' ? 'envelope' : 'spectrum';
    const measure = b.measure === 'rms' ? 'rms' : 'peak';
    if (b.kind === 'overall') {
      const span = b.fromHz !== undefined && b.toHz !== undefined;
      if (span && source === 'envelope') {
        out.push({ key: b.key, kind: 'hz', loHz: b.fromHz, hiHz: b.toHz, unit, measure, source });
      } else if (span) {
        // The overall value over the band's own span (not the ISO value, not the largest line).
        out.push({ key: b.key, kind: 'overall', loHz: b.fromHz, hiHz: b.toHz, unit, measure });
      } else {
        out.push({ key: b.key, kind: 'overall', unit, measure, source });
      }
    } else if (b.kind === 'hz') {
      out.push({ key: b.key, kind: 'hz', loHz: b.fromHz, hiHz: b.toHz, unit, measure, source });
    } else if (b.kind === 'order') {
      out.push({
        key: b.key,
        kind: 'order',
        loOrder: b.fromOrder,
        hiOrder: b.toOrder,
        unit,
        measure,
        source,
      });
    } else {
      const name = faultName(b, c);
      if (!name) continue;
      const harmonics = Math.max(1, b.harmonics ?? 1);
      for (let h = 1; h <= harmonics; h++) {
        // dsp takes the half-width as a percentage of the centre; convert the other units
        // at the nominal speed (bands are a few per cent wide, speed drifts less).
        let widthPercent = b.halfWidth;
        if (b.halfWidthUnit === 'hz') widthPercent = (100 * b.halfWidth) / (h * nominalShaftHz);
        if (b.halfWidthUnit === 'order') widthPercent = (100 * b.halfWidth) / h;
        widthPercent = Math.min(49, Math.max(0.1, widthPercent));
        out.push({
          key: sub(b.key, h),
          kind: 'fault',
          fault: name,
          harmonic: h,
          widthPercent,
          unit,
          measure,
          source,
        });
      }
    }
  }
  return out;
}

/** Band values by limit-band key (null where the band cannot be read from this capture). */
export function combineBandValues(
  bands: readonly LimitBand[],
  values: readonly BandValue[],
): Record<string, number | null> {
  const byKey = new Map(values.map((v) => [v.key, v.value]));
  const out: Record<string, number | null> = {};
  for (const b of bands) {
    let v: number | null;
    if (b.kind !== 'fault') {
      v = byKey.get(b.key) ?? null;
    } else {
      const parts: number[] = [];
      for (let h = 1; byKey.has(sub(b.key, h)); h++) {
        const x = byKey.get(sub(b.key, h));
        if (x !== null && x !== undefined) parts.push(x);
      }
      if (parts.length === 0) v = null;
      else if (b.measure === 'rms') v = Math.sqrt(parts.reduce((s, x) => s + x * x, 0));
      else v = Math.max(...parts);
    }
    if (v !== null && b.measure === 'peak-to-peak') v *= 2;
    out[b.key] = v;
  }
  return out;
}
