/**
 * The severity from which a point's velocity-spectrum diagnosis hints count (see
 * {@link DiagnosisInput.severityMmS}): every healthy machine has a dominant 1×, so a 1×-family
 * hint needs the overall velocity at a level that matters for *this* point.
 */
import type { BandDefinition } from './band-definition.ts';
import { baselineStats } from './baseline.ts';
import { levelsInForce } from './effective-levels.ts';
import { isoZoneBoundaries, type Foundation, type MachineGroup } from './iso-zones.ts';
import type { PointState } from './snapshot-evaluation.ts';

/**
 * A point's overall velocity counts as raised for diagnosis once it reaches this multiple of
 * its baseline mean (×2 = +6 dB). A doubling of a steady machine's overall level is the
 * usual "something changed, look closer" step in trending, well above the scatter of a
 * steady baseline (a log-σ of 0.1–0.3 puts ×2 at 2.3–7 σ). Common practice, no source.
 */
export const DIAGNOSIS_BASELINE_MARGIN = 2;

/** The severity and where it came from (shown with the hints). */
export interface DiagnosisSeverity {
  severityMmS: number;
  source: string;
}

/** The point's overall-velocity band: overall, velocity spectrum, mm/s RMS. */
function overallVelocityBand(bands: readonly BandDefinition[]): BandDefinition | undefined {
  return bands.find(
    (b) =>
      b.kind === 'overall' && b.spectrum === 'velocity' && b.unit === 'mm/s' && b.measure === 'rms',
  );
}

/**
 * The severity for a point's hints, from the point's own levels: the lower of its overall
 * velocity band's alert level in force ({@link levelsInForce}: fixed, or statistical once the
 * baseline is complete) and {@link DIAGNOSIS_BASELINE_MARGIN} × the band's baseline mean
 * (once a baseline exists). A point without an overall-velocity band falls back to the
 * ISO 20816-3 zone A/B boundary of its machine group and foundation, as the analyzer CLI does.
 *
 * Source: Turnstone rule; the margin is common practice, no source.
 */
export function diagnosisSeverity(
  bands: readonly BandDefinition[],
  state: PointState | null | undefined,
  machine: { isoGroup: MachineGroup; foundation: Foundation },
): DiagnosisSeverity {
  const band = overallVelocityBand(bands);
  if (band === undefined || !(band.alertLevel > 0)) {
    return {
      severityMmS: isoZoneBoundaries(machine.isoGroup, machine.foundation).ab,
      source: `ISO 20816-3 zone A/B boundary, group ${machine.isoGroup}, ${machine.foundation} (the point has no overall velocity band)`,
    };
  }
  const track = state?.[band.key];
  const levels = levelsInForce(band, track?.band ?? null);
  const baseline =
    band.statistical?.established ??
    (track?.band.baselineComplete ? baselineStats(track.band.baseline) : null);
  const byBaseline =
    baseline !== null && baseline.mean > 0 ? DIAGNOSIS_BASELINE_MARGIN * baseline.mean : null;
  if (byBaseline !== null && byBaseline < levels.alertLevel) {
    return {
      severityMmS: byBaseline,
      source: `${DIAGNOSIS_BASELINE_MARGIN} × the point's baseline mean of "${band.name}"`,
    };
  }
  return {
    severityMmS: levels.alertLevel,
    source: `the point's ${levels.source} alert level of "${band.name}"`,
  };
}
