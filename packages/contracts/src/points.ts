import { z } from 'zod';
import {
  criticalitySchema,
  directionSchema,
  foundationSchema,
  machineTypeSchema,
  nodeStatusSchema,
} from './fleet.ts';

/**
 * The Machine and Point analysis views: machine data with fault frequencies, point detail,
 * the analyses list, stored spectra, the time waveform and the waterfall.
 * Spectra and waveforms travel as base64 of little-endian float32 (4 bytes a value), so a
 * 1,600-line spectrum is ≈ 8.5 kB instead of ≈ 30 kB of JSON numbers; decode with
 * {@link decodeFloat32Base64}.
 */

export const verdictSchema = z.enum(['ok', 'suspect', 'unusable']);
export const isoZoneSchema = z.enum(['A', 'B', 'C', 'D']);
export const speedSourceSchema = z.enum(['tach', 'rpm', 'estimated', 'none']);
export const spectrumKindSchema = z.enum(['acceleration', 'velocity', 'envelope', 'order']);
export type SpectrumKind = z.infer<typeof spectrumKindSchema>;

export const faultFrequencySchema = z.object({
  name: z.string(),
  kind: z.enum(['shaft', 'bpfo', 'bpfi', 'bsf', 'ftf', 'gear-mesh', 'blade-pass']),
  /** Hz at the speed in question (nominal for the machine page, measured for a spectrum). */
  hz: z.number().nullable(),
  order: z.number(),
});
export type FaultFrequencyItem = z.infer<typeof faultFrequencySchema>;

export const qualityFindingSchema = z.object({
  code: z.string(),
  severity: z.enum(['suspect', 'unusable']),
  message: z.string(),
  value: z.number(),
});
export type QualityFinding = z.infer<typeof qualityFindingSchema>;

/** Overall values of one analysis. */
export const overallValuesSchema = z.object({
  accelRmsG: z.number(),
  accelPeakG: z.number(),
  velocityRmsMmS: z.number(),
  displacementPkPkUm: z.number(),
  crestFactor: z.number(),
  kurtosis: z.number(),
  /** Band of accelRmsG, accelPeakG, crestFactor and kurtosis, Hz; null for analyses stored before bands were recorded. */
  accelBandHz: z.tuple([z.number(), z.number()]).nullable(),
  /** Band of velocityRmsMmS and displacementPkPkUm (the ISO band), Hz; null when not recorded. */
  velocityBandHz: z.tuple([z.number(), z.number()]).nullable(),
});

/** Diagnosis hint codes (trade terms). */
export const diagnosisCodeSchema = z.enum([
  'unbalance',
  'misalignment',
  'looseness',
  'bearing-outer-race',
  'bearing-inner-race',
  'bearing-rolling-element',
  'bearing-cage',
  'gear-mesh',
  'blade-pass',
  'electrical',
  'belt',
]);
export type DiagnosisCodeName = z.infer<typeof diagnosisCodeSchema>;

/** The hint codes in words, for screens and mails. */
export const diagnosisCodeNames: Record<DiagnosisCodeName, string> = {
  unbalance: 'Unbalance',
  misalignment: 'Misalignment',
  looseness: 'Mechanical looseness',
  'bearing-outer-race': 'Bearing outer race',
  'bearing-inner-race': 'Bearing inner race',
  'bearing-rolling-element': 'Bearing rolling element',
  'bearing-cage': 'Bearing cage',
  'gear-mesh': 'Gear mesh',
  'blade-pass': 'Blade/vane pass',
  electrical: 'Electrical',
  belt: 'Belt drive',
};

/** Unit of an evidence peak's amplitude, by the spectrum it was read from. */
export const evidenceUnits = {
  velocity: 'mm/s RMS',
  acceleration: 'g RMS',
  envelope: 'g pk',
} as const;

/** One spectral peak that supports a hint. */
export const diagnosisEvidenceSchema = z.object({
  hz: z.number(),
  order: z.number(),
  /** mm/s RMS (velocity), g RMS (acceleration), g peak (envelope). */
  amplitude: z.number(),
  /** "1×", "2×", "DE BPFO ×2", "GMF+1×" … */
  label: z.string(),
  spectrum: z.enum(['velocity', 'acceleration', 'envelope']),
});
export type DiagnosisEvidenceItem = z.infer<typeof diagnosisEvidenceSchema>;

/** A likely cause with the peaks that support it: a hint, never a verdict. */
export const diagnosisHintSchema = z.object({
  code: diagnosisCodeSchema,
  /** A heuristic score in [0, 1] that orders the hints, not a probability. */
  confidence: z.number(),
  summary: z.string(),
  evidence: z.array(diagnosisEvidenceSchema),
});
export type DiagnosisHintItem = z.infer<typeof diagnosisHintSchema>;

/** The hints of one capture (highest confidence first), notes, and the severity they counted from. */
export const diagnosisSchema = z.object({
  hints: z.array(diagnosisHintSchema),
  notes: z.array(z.string()),
  /** Overall velocity (mm/s RMS) from which velocity-spectrum hints counted. */
  severityMmS: z.number(),
  severitySource: z.string(),
});
export type Diagnosis = z.infer<typeof diagnosisSchema>;

/**
 * A shaft-order vector against the tach pulse. Phase is a lag in degrees (0 ≤ φ < 360): how
 * far the order's positive peak comes after the pulse, in degrees of its own cycle.
 */
export const shaftVectorSchema = z.object({
  order: z.number(),
  hz: z.number(),
  accelPeakG: z.number(),
  accelPhaseDeg: z.number(),
  velocityRmsMmS: z.number(),
  velocityPhaseDeg: z.number(),
  revolutions: z.number().int(),
});
export type ShaftVectorItem = z.infer<typeof shaftVectorSchema>;

/** The hints of a point's newest analysis ("current hints"), with the capture they come from. */
export const currentDiagnosisSchema = z.object({
  analysisId: z.number().int(),
  takenAt: z.string(),
  diagnosis: diagnosisSchema,
});
export type CurrentDiagnosis = z.infer<typeof currentDiagnosisSchema>;

export const analysisSummarySchema = z.object({
  id: z.number().int(),
  snapshotId: z.number().int(),
  takenAt: z.string(),
  verdict: verdictSchema,
  isoZone: isoZoneSchema.nullable(),
  speedRpm: z.number().nullable(),
  speedSource: speedSourceSchema,
  bitsUsed: z.number().nullable(),
  overall: overallValuesSchema,
  /** Null for analyses stored before hints were kept. */
  diagnosis: diagnosisSchema.nullable(),
  /** 1× and 2× vectors; null without a tach. */
  shaftVectors: z.array(shaftVectorSchema).nullable(),
  /** True when the retention policy cleared this capture's spectra (its values stay). */
  spectraThinned: z.boolean().optional(),
  /** The quality checks' findings behind a suspect or unusable verdict (why). */
  findings: z.array(qualityFindingSchema).optional(),
  /** Set when a person pinned the capture: retention keeps it whole. */
  pinned: z.object({ by: z.string(), at: z.string(), note: z.string() }).nullable().optional(),
});
export type AnalysisSummary = z.infer<typeof analysisSummarySchema>;

// ---------------------------------------------------------------- machine

export const machinePointSchema = z.object({
  id: z.number().int(),
  tag: z.string(),
  name: z.string(),
  location: z.string(),
  direction: directionSchema,
  bearing: z.string().nullable(),
  status: nodeStatusSchema,
  latest: analysisSummarySchema.nullable(),
  /** Last ≈ 50 overall velocity values (mm/s RMS), oldest first. */
  recentVelocity: z.array(z.object({ t: z.string(), v: z.number() })),
  /**
   * The band that decides the point's state: the band of its worst open alert (danger before
   * alert, then the newest), else overall velocity; with its last ≈ 50 values, oldest first.
   */
  governing: z.object({
    key: z.string(),
    name: z.string(),
    unit: z.string(),
    /** The open alert's level on this band; null when no alert is open on the point. */
    level: z.enum(['alert', 'danger']).nullable(),
    values: z.array(z.object({ t: z.string(), v: z.number() })),
  }),
});
export type MachinePoint = z.infer<typeof machinePointSchema>;

export const machineDetailSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  type: machineTypeSchema,
  nominalRpm: z.number(),
  isoGroup: z.number().int(),
  foundation: foundationSchema,
  criticality: criticalitySchema,
  powerKw: z.number().nullable(),
  bladeCount: z.number().int().nullable(),
  vaneCount: z.number().int().nullable(),
  /** Supply frequency of the machine's motor, Hz (50 or 60); null when none or not known. */
  lineHz: z.number().int().nullable(),
  notes: z.string().nullable(),
  site: z.object({ id: z.number().int(), name: z.string(), code: z.string() }),
  area: z.object({ id: z.number().int(), name: z.string() }),
  status: nodeStatusSchema,
  /** ISO 20816-3 zone boundaries (mm/s RMS) of the machine's group and foundation. */
  isoBoundaries: z.object({ ab: z.number(), bc: z.number(), cd: z.number() }).nullable(),
  bearings: z.array(
    z.object({
      id: z.number().int(),
      name: z.string(),
      designation: z.string().nullable(),
      rollingElements: z.number().int(),
      ballDiameterMm: z.number(),
      pitchDiameterMm: z.number(),
      contactAngleDeg: z.number(),
      speedRatio: z.number(),
    }),
  ),
  gears: z.array(
    z.object({
      id: z.number().int(),
      name: z.string(),
      teeth: z.number().int(),
      mateTeeth: z.number().int(),
      speedRatio: z.number(),
    }),
  ),
  /** Orders always; Hz at the nominal speed. */
  faultFrequencies: z.array(faultFrequencySchema),
  points: z.array(machinePointSchema),
});
export type MachineDetail = z.infer<typeof machineDetailSchema>;

// ---------------------------------------------------------------- point

export const pointBandSchema = z.object({
  key: z.string(),
  name: z.string(),
  kind: z.enum(['overall', 'hz', 'order', 'fault']),
  spectrum: z.string(),
  unit: z.string(),
  alertLevel: z.number(),
  dangerLevel: z.number(),
  levelSource: z.enum(['fixed', 'statistical']),
  /**
   * Where in the spectrum the band sits, as defined (the spectrum view opens on it): overall
   * over a Hz span (null edges: the analysis' own span), a Hz or order range, or a window of
   * ± halfWidth around a fault frequency and its first `harmonics` harmonics.
   */
  range: z
    .discriminatedUnion('kind', [
      z.object({
        kind: z.literal('overall'),
        fromHz: z.number().nullable(),
        toHz: z.number().nullable(),
      }),
      z.object({ kind: z.literal('hz'), fromHz: z.number(), toHz: z.number() }),
      z.object({ kind: z.literal('order'), fromOrder: z.number(), toOrder: z.number() }),
      z.object({
        kind: z.literal('fault'),
        fault: z.string(),
        halfWidth: z.number(),
        halfWidthUnit: z.enum(['hz', 'order', 'percent']),
        harmonics: z.number().int(),
      }),
    ])
    .optional(),
});
export type PointBand = z.infer<typeof pointBandSchema>;

export const pointDetailSchema = z.object({
  id: z.number().int(),
  tag: z.string(),
  name: z.string(),
  location: z.string(),
  direction: directionSchema,
  sensitivityMvPerG: z.number(),
  fmaxHz: z.number(),
  lines: z.number().int(),
  bearing: z.string().nullable(),
  status: nodeStatusSchema,
  machine: z.object({
    id: z.number().int(),
    name: z.string(),
    type: machineTypeSchema,
    nominalRpm: z.number(),
    siteName: z.string(),
    areaName: z.string(),
  }),
  latest: analysisSummarySchema.nullable(),
  bands: z.array(pointBandSchema),
});
export type PointDetail = z.infer<typeof pointDetailSchema>;

export const analysesQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  limit: z.coerce.number().int().min(1).max(2000).default(200),
});
export const analysisListSchema = z.object({
  items: z.array(analysisSummarySchema),
});
export type AnalysisList = z.infer<typeof analysisListSchema>;

// ---------------------------------------------------------------- spectra and waveform

export const spectrumQuerySchema = z.object({
  kind: spectrumKindSchema.default('acceleration'),
});

export const spectrumPeakSchema = z.object({
  hz: z.number().nullable(),
  order: z.number().nullable(),
  amplitude: z.number(),
});

export const spectrumSchema = z.object({
  analysisId: z.number().int(),
  takenAt: z.string(),
  kind: spectrumKindSchema,
  unit: z.string(),
  scale: z.enum(['rms', 'peak']),
  /** `hz`: line k at k·dfHz; `order`: line k at k·dOrder. */
  axis: z.enum(['hz', 'order']),
  dfHz: z.number().nullable(),
  dOrder: z.number().nullable(),
  lines: z.number().int(),
  /** base64 of little-endian float32, `lines` values. */
  values: z.string(),
  peaks: z.array(spectrumPeakSchema),
  /** Hz at this capture's running speed (null without one). */
  faultFrequencies: z.array(faultFrequencySchema),
  speed: z.object({
    rpm: z.number().nullable(),
    hz: z.number().nullable(),
    source: speedSourceSchema,
  }),
});
export type Spectrum = z.infer<typeof spectrumSchema>;

export const waveformSchema = z.object({
  analysisId: z.number().int(),
  takenAt: z.string(),
  unit: z.literal('g'),
  sampleRateHz: z.number(),
  sampleCount: z.number().int(),
  /** base64 of little-endian float32 acceleration in g. */
  values: z.string(),
  /** The ADC's most negative and most positive codes, in g. */
  rails: z.object({ lowG: z.number(), highG: z.number() }),
  clipped: z.boolean(),
  adcBits: z.number().int(),
  bitsUsed: z.number().nullable(),
  verdict: verdictSchema,
  findings: z.array(qualityFindingSchema),
});
export type Waveform = z.infer<typeof waveformSchema>;

/** base64 of little-endian float32 → numbers (browser and Node; no Buffer needed). */
export function decodeFloat32Base64(b64: string): Float32Array {
  const bin = atob(b64);
  const bytes = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
  const view = new DataView(bytes.buffer);
  const out = new Float32Array(Math.floor(bytes.length / 4));
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat32(i * 4, true);
  return out;
}
