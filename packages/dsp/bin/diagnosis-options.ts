// The analyzer CLI's diagnosis options: machine components, ISO 20816-3 group and foundation
// (the severity from which 1×-family hints count is the zone A/B boundary), and the output.
import {
  diagnose,
  isoZoneBoundaries,
  type DiagnosisComponents,
  type DiagnosisResult,
  type Foundation,
  type MachineGroup,
} from '@turnstone/condition';
import type { MachineComponents, SnapshotAnalysis } from '../src/index.ts';

export const DIAGNOSIS_USAGE = `       [--bearing n,ball_mm,pitch_mm,angle_deg]... [--gear-teeth N] [--blades N]
       [--line-hz 50|60] [--iso-group 1|2] [--foundation rigid|flexible] [--direction H|V|A]
Diagnosis hints need the speed (--rpm); they count from the ISO 20816-3 zone A/B boundary of
the group and foundation (default group 2, rigid).`;

export const DIAGNOSIS_OPTIONS = {
  bearing: { type: 'string', multiple: true },
  'gear-teeth': { type: 'string' },
  blades: { type: 'string' },
  'line-hz': { type: 'string' },
  'iso-group': { type: 'string' },
  foundation: { type: 'string' },
  direction: { type: 'string' },
} as const;

export interface CliDiagnosis {
  components: DiagnosisComponents;
  severityMmS: number;
  severitySource: string;
  direction: 'H' | 'V' | 'A' | null;
}

function whole(value: string, flag: string): number {
  const n = Number(value);
  if (value.trim() === '' || !Number.isInteger(n) || n < 1) {
    throw new Error(`--${flag} needs a positive whole number, got "${value}"`);
  }
  return n;
}

/** Reads the diagnosis flags; a bad one throws with a message naming it. */
export function parseDiagnosisFlags(flags: Record<string, unknown>): CliDiagnosis {
  const components: DiagnosisComponents = {};
  const bearings = (flags.bearing as string[] | undefined) ?? [];
  components.bearings = bearings.map((text, i) => {
    const parts = text.split(',').map((s) => Number(s.trim()));
    if (parts.length < 3 || parts.length > 4 || parts.some((x) => !Number.isFinite(x))) {
      throw new Error(`--bearing needs n,ball_mm,pitch_mm[,angle_deg], got "${text}"`);
    }
    const [n, ball, pitch, angle] = parts as [number, number, number, number | undefined];
    return {
      name: bearings.length > 1 ? `B${i + 1}` : 'bearing',
      rollingElements: n,
      ballDiameterMm: ball,
      pitchDiameterMm: pitch,
      contactAngleDeg: angle ?? 0,
    };
  });
  if (flags['gear-teeth'] !== undefined) {
    components.gears = [{ name: 'gear', teeth: whole(String(flags['gear-teeth']), 'gear-teeth') }];
  }
  if (flags.blades !== undefined) components.blades = whole(String(flags.blades), 'blades');
  if (flags['line-hz'] !== undefined) {
    const hz = Number(flags['line-hz']);
    if (hz !== 50 && hz !== 60)
      throw new Error(`--line-hz must be 50 or 60, got "${String(flags['line-hz'])}"`);
    components.lineHz = hz;
  }
  const groupText = String(flags['iso-group'] ?? '2');
  if (groupText !== '1' && groupText !== '2') {
    throw new Error(`--iso-group must be 1 or 2, got "${groupText}"`);
  }
  const group = Number(groupText) as MachineGroup;
  const foundation = String(flags.foundation ?? 'rigid');
  if (foundation !== 'rigid' && foundation !== 'flexible') {
    throw new Error(`--foundation must be rigid or flexible, got "${foundation}"`);
  }
  const direction = flags.direction === undefined ? null : String(flags.direction).toUpperCase();
  if (direction !== null && direction !== 'H' && direction !== 'V' && direction !== 'A') {
    throw new Error(`--direction must be H, V or A, got "${String(flags.direction)}"`);
  }
  return {
    components,
    severityMmS: isoZoneBoundaries(group, foundation as Foundation).ab,
    severitySource: `ISO 20816-3 zone A/B boundary, group ${group}, ${foundation}`,
    direction,
  };
}

/** The components the analysis marks on its spectra (bearings, gears, blades). */
export function machineOf(d: CliDiagnosis): MachineComponents {
  return {
    ...(d.components.bearings?.length ? { bearings: d.components.bearings } : {}),
    ...(d.components.gears ? { gears: d.components.gears } : {}),
    ...(d.components.blades === undefined ? {} : { blades: d.components.blades }),
  };
}

export function runDiagnosis(d: CliDiagnosis, analysis: SnapshotAnalysis): DiagnosisResult {
  return diagnose({
    analysis,
    components: d.components,
    direction: d.direction,
    severityMmS: d.severityMmS,
    severitySource: d.severitySource,
  });
}

const SPECTRUM_UNIT = { velocity: 'mm/s RMS', acceleration: 'g RMS', envelope: 'g pk (envelope)' };

/** Readable lines: each hint with its evidence, then the notes. */
export function formatDiagnosis(result: DiagnosisResult): string[] {
  const out = [
    result.diagnosis.length === 0
      ? 'diagnosis hints: none'
      : 'diagnosis hints (likely causes, not verdicts):',
  ];
  for (const h of result.diagnosis) {
    out.push(`  ${h.code} (confidence ${h.confidence.toFixed(2)}): ${h.summary}`);
    for (const e of h.evidence) {
      out.push(
        `      ${e.label.padEnd(24)} ${e.hz.toFixed(2).padStart(9)} Hz  ${e.order.toFixed(3).padStart(7)}×  ${e.amplitude.toExponential(3)} ${SPECTRUM_UNIT[e.spectrum]}`,
      );
    }
  }
  for (const note of result.notes) out.push(`  note: ${note}`);
  return out;
}
