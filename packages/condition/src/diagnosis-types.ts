/**
 * The shapes of a diagnosis: hint codes, hints with their evidence, the machine's parts that
 * make known frequencies, what a diagnosis reads and what it returns.
 */
import type { BearingGeometry, GearMesh, SnapshotAnalysis } from '@turnstone/dsp';

/** Hint codes (trade terms). */
export type DiagnosisCode =
  | 'unbalance'
  | 'misalignment'
  | 'looseness'
  | 'bearing-outer-race'
  | 'bearing-inner-race'
  | 'bearing-rolling-element'
  | 'bearing-cage'
  | 'gear-mesh'
  | 'blade-pass'
  | 'electrical'
  | 'belt';

/** Which stored spectrum a piece of evidence was read from. */
export type EvidenceSpectrum = 'velocity' | 'acceleration' | 'envelope';

/** One peak that supports a hint. */
export interface DiagnosisEvidence {
  /** Frequency of the peak, Hz (interpolated between lines). */
  hz: number;
  /** The same in orders of the running speed. */
  order: number;
  /** Amplitude in the spectrum's unit and scale: mm/s RMS (velocity), g RMS (acceleration), g peak (envelope). */
  amplitude: number;
  /** What the peak is: "1×", "2×", "0.5×", "DE BPFO ×2", "GMF+1×", "2 × line". */
  label: string;
  spectrum: EvidenceSpectrum;
}

/** One hint. */
export interface DiagnosisHint {
  code: DiagnosisCode;
  /** A heuristic score in [0, 1] for ordering hints, not a probability. */
  confidence: number;
  summary: string;
  evidence: DiagnosisEvidence[];
}

/** A belt drive on the measured shaft. */
export interface BeltDrive {
  name: string;
  /** Pitch diameter of the pulley on the measured shaft, mm. */
  pulleyDiameterMm: number;
  /** Belt pitch length, mm. */
  lengthMm: number;
}

/** The machine's parts that make known frequencies. */
export interface DiagnosisComponents {
  bearings?: BearingGeometry[];
  gears?: GearMesh[];
  blades?: number;
  belts?: BeltDrive[];
  /** Electrical supply frequency of a motor on the shaft, Hz. */
  lineHz?: number;
}

/** What a diagnosis reads. */
export interface DiagnosisInput {
  analysis: Pick<SnapshotAnalysis, 'overall' | 'speed' | 'spectra'>;
  /** Measurement direction of the point; axial points are read for misalignment, not unbalance. */
  direction?: 'H' | 'V' | 'A' | null;
  components?: DiagnosisComponents;
  /**
   * Overall velocity (mm/s RMS, the analysis' ISO band) from which velocity-spectrum hints
   * count: the CLI passes the ISO 20816-3 zone A/B boundary of the machine's group; the
   * server a point's own alert level.
   */
  severityMmS: number;
  /** Where {@link severityMmS} comes from, for the notes ("ISO 20816-3 A/B, group 2 rigid"). */
  severitySource?: string;
}

/** Hints (highest confidence first) and notes on what could not be told. */
export interface DiagnosisResult {
  diagnosis: DiagnosisHint[];
  notes: string[];
}
