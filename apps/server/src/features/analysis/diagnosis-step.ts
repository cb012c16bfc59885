/**
 * The machine's parts as the computations read them (fault frequencies for the machine page,
 * the diagnosis for each capture), and the diagnosis hints stored with an analysis.
 */
import type { SnapshotAnalysis } from '@turnstone/dsp';
import {
  diagnose,
  diagnosisSeverity,
  type BandDefinition as LimitBand,
  type DiagnosisComponents,
  type PointState,
} from '@turnstone/condition';
import type { PointContext } from './analysis-repository.ts';
import { machineComponentsOf } from '../points/machine-components.ts';

/** The machine's parts that make known frequencies, as the diagnosis reads them. */
function diagnosisComponentsOf(pc: PointContext): DiagnosisComponents {
  const m = pc.machine;
  return {
    ...machineComponentsOf(m, pc),
    // The supply frequency the engineer recorded; none, no electrical hint (and no note).
    ...(m.lineHz !== null ? { lineHz: m.lineHz } : {}),
    // The machine's speed is its driver's: the belt frequency is read on the driver sheave.
    ...(m.belt
      ? {
          belts: [
            {
              name: 'belt',
              pulleyDiameterMm: m.belt.driverSheaveMm,
              lengthMm: m.belt.beltLengthMm,
            },
          ],
        }
      : {}),
  };
}

/**
 * The capture's diagnosis hints as stored with the analysis: the hints count from the point's
 * own levels (`diagnosisSeverity`: its overall velocity alert level in force, or its baseline
 * by a stated margin) as judged before this batch. A machine record the diagnosis refuses (a
 * belt longer than nothing, say) leaves a note instead of failing the capture.
 */
export function diagnosisOf(
  p: { analysis: SnapshotAnalysis; pc: PointContext; limitSet: { bands: readonly LimitBand[] } },
  state: PointState | null,
): Record<string, unknown> {
  const severity = diagnosisSeverity(p.limitSet.bands as LimitBand[], state, {
    isoGroup: p.pc.machine.isoGroup === 1 ? 1 : 2,
    foundation: p.pc.machine.foundation,
  });
  try {
    const result = diagnose({
      analysis: p.analysis,
      direction: p.pc.point.direction,
      components: diagnosisComponentsOf(p.pc),
      severityMmS: severity.severityMmS,
      severitySource: severity.source,
    });
    return {
      hints: result.diagnosis,
      notes: result.notes,
      severityMmS: severity.severityMmS,
      severitySource: severity.source,
    };
  } catch (err) {
    if (!(err instanceof RangeError)) throw err;
    return {
      hints: [],
      notes: [`No diagnosis: ${err.message}.`],
      severityMmS: severity.severityMmS,
      severitySource: severity.source,
    };
  }
}
