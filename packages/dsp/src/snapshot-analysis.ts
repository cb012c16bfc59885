/** The result of {@link analyzeSnapshot}: what the worker stores and the web app plots. */
import type { BandValue } from './band-values.ts';
import type { FaultFrequency } from './fault-frequencies.ts';
import type { IsoBand } from './iso-overall-band.ts';
import type { QualityFinding, QualityMetrics, QualityVerdict } from './quality-verdict.ts';
import type { ShaftVector } from './shaft-vector.ts';
import type { WindowName } from './window-functions.ts';

/** Version of the {@link SnapshotAnalysis} shape; bumped on any breaking change. */
export const ANALYSIS_SCHEMA_VERSION = 1;

/** A stored spectrum on a Hz axis: values[k] at k · dfHz. */
export interface HzSpectrum {
  unit: 'g' | 'mm/s';
  /** 'rms': each line is the RMS of a tone on it; 'peak': its amplitude. */
  scale: 'rms' | 'peak';
  dfHz: number;
  values: Float32Array;
  window: WindowName;
}

/** The analysis of one snapshot; the worker stores it and the web app plots it. */
export interface SnapshotAnalysis {
  schemaVersion: typeof ANALYSIS_SCHEMA_VERSION;
  sampleRateHz: number;
  sampleCount: number;
  durationS: number;
  fmaxHz: number;
  quality: {
    verdict: QualityVerdict;
    bitsUsed: number;
    snrDb: number;
    findings: QualityFinding[];
    metrics: QualityMetrics;
  };
  overall: {
    /** Acceleration RMS over {@link accelBandHz} (an ideal band of the whole record), g. */
    accelRmsG: number;
    /** Largest |a| of the acceleration high-passed at accelBandHz[0], on the record's middle 80 %, g. */
    accelPeakG: number;
    /** Band of the acceleration figures (accelRmsG, accelPeakG, crestFactor, kurtosis): [high-pass, Fmax], Hz. */
    accelBandHz: [number, number];
    /** Velocity RMS over the ISO band isoBandHz (an ideal band of the whole record), mm/s. */
    velocityRmsMmS: number;
    /** Displacement peak-to-peak over the ISO band, µm: frequency-domain double integration of the waveform (raised-cosine rise from half the lower edge), measured on its middle 80 %. */
    displacementPkPkUm: number;
    /** Peak / RMS of the high-passed acceleration waveform (over accelBandHz). */
    crestFactor: number;
    /** Pearson kurtosis of the high-passed acceleration waveform (sine 1.5, Gaussian 3). */
    kurtosis: number;
    isoBand: IsoBand;
    /** Band of velocityRmsMmS and displacementPkPkUm, Hz (upper edge capped at Fmax). */
    isoBandHz: [number, number];
  };
  speed: { rpm: number | null; hz: number | null; source: 'tach' | 'rpm' | 'estimated' | 'none' };
  spectra: {
    /** Welch-averaged acceleration, g RMS per line, 0 … Fmax. */
    acceleration: HzSpectrum & {
      unit: 'g';
      scale: 'rms';
      nperseg: number;
      averages: number;
      enbwBins: number;
    };
    /** Velocity by frequency-domain integration, mm/s RMS, zero below the ISO band's lower edge. */
    velocity: HzSpectrum & { unit: 'mm/s'; scale: 'rms'; lowCutoffHz: number };
    /** Envelope spectrum, g peak (mean removed first: line 0 is 0, the mean is `meanG`), or null when the record is too short. */
    envelope:
      (HzSpectrum & { unit: 'g'; scale: 'peak'; bandHz: [number, number]; meanG: number }) | null;
    /** Acceleration in orders (g RMS per line at k · dOrder), or null without a speed. */
    order: {
      unit: 'g';
      scale: 'rms';
      dOrder: number;
      values: Float32Array;
      method: 'computed-order-tracking' | 'hz-axis';
    } | null;
  };
  /** Largest peaks of the acceleration spectrum, largest first, interpolated between lines. */
  peaks: { hz: number; order: number | null; amplitude: number }[];
  faultFrequencies: FaultFrequency[];
  bandValues: BandValue[];
  /** 1× and 2× vectors (amplitude, phase lag against the tach pulse; see {@link ShaftVector}), or null without a tach. */
  shaftVectors: ShaftVector[] | null;
}
