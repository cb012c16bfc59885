/**
 * The input of {@link analyzeSnapshot}: one stored snapshot and its secondary settings, and
 * the checks that turn it into validated values (a clear error for each bad field).
 */
import { checkBands, type BandDefinition } from './band-values.ts';
import { parseEncoding, type SampleEncoding } from './sample-codec.ts';
import type { MachineComponents } from './fault-frequencies.ts';
import { ISO_BAND_HZ, type IsoBand } from './iso-overall-band.ts';
import { tachSpeedRpm, type TachPulses } from './order-tracking.ts';
import { parseWindowName, type WindowName } from './window-functions.ts';

/** One snapshot as stored: raw samples plus the facts needed to read them. */
export interface SnapshotInput {
  /** ADC counts for integer encodings; volts for float32. */
  samples: Int16Array | Int32Array | Float32Array | Float64Array;
  encoding: SampleEncoding;
  sampleRateHz: number;
  /** ADC resolution and the volts at code 2^(bits−1). */
  adc: { bits: number; fullScaleV: number };
  sensor: { sensitivityMvPerG: number };
  /** Measured running speed, r/min (used when there is no tach). */
  speedRpm?: number;
  /** Tach pulse times for computed order tracking (wins over speedRpm). */
  tach?: TachPulses;
  /** Nominal speed from the machine record; running speed is estimated near it when neither tach nor speedRpm is given. */
  nominalRpm?: number;
  machine?: MachineComponents;
  /** Anti-alias filter cutoff, when the gateway reports it (Hz). */
  antiAliasCutoffHz?: number;
  /** Analysis Fmax, Hz. @default sampleRateHz / 2.56 */
  fmaxHz?: number;
  /** Spectral lines from 0 to Fmax (sets the segment length, rounded up to a power of two). @default 3200 */
  lines?: number;
  /** Window for the Hz spectra. @default 'hann' */
  window?: WindowName;
  /** ISO 20816 overall band. @default from the known or nominal speed by {@link isoBandForSpeed} ('below600' at or below 600 r/min) */
  isoBand?: IsoBand;
  /** Bands to report (see {@link BandDefinition}). @default [] */
  bands?: BandDefinition[];
  /**
   * Envelope band-pass edges, Hz: the point's own, set by the engineer around the
   * resonance its bearing impacts excite. Independent of Fmax (the resonance usually lies
   * far above a point's analysis Fmax).
   * @default defaultEnvelopeBandHz(sampleRateHz), [fs/10.24, fs/2.56]
   */
  envelopeBandHz?: readonly [number, number];
}

/** Secondary settings of {@link analyzeSnapshot}. */
export interface AnalyzeSnapshotOptions {
  /** Highest envelope-spectrum frequency stored, Hz. @default min(1000, envelope band width) */
  envelopeFmaxHz?: number;
  /** Highest order stored in the order spectrum. @default min(100, Fmax / shaft speed) */
  maxOrder?: number;
  /** Number of spectral peaks reported. @default 10 */
  peakCount?: number;
  /** Speed search window around the nominal speed, ± fraction. @default 0.1 */
  speedSearchFraction?: number;
  /**
   * High-pass edge of the overall acceleration, crest factor and kurtosis, Hz (they are
   * taken over [this, Fmax], so a settling offset or slow drift does not count).
   * @default the ISO band's lower edge (10 Hz, or 2 Hz for slow machines)
   */
  accelerationHighPassHz?: number;
}

function positive(value: unknown, what: string): number {
  if (typeof value !== 'number' || !(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${what} must be a positive number, got ${String(value)}`);
  }
  return value;
}

export const MIN_SAMPLES = 64;

/** The validated values of a {@link SnapshotInput}, defaults applied. */
export interface ReadSnapshotInput {
  samples: SnapshotInput['samples'];
  n: number;
  /** How counts become g: the sample encoding, the ADC and the sensor. */
  scale: { encoding: SampleEncoding; bits: number; fullScaleV: number; sensitivityMvPerG: number };
  fs: number;
  fmaxHz: number;
  lines: number;
  windowName: WindowName;
  bands: BandDefinition[];
  /** Running speed from the tach pulses, or null without a tach. */
  tachRpm: number | null;
}

/** Checks a snapshot field by field (TypeError/RangeError naming the field) and applies defaults. */
export function readSnapshotInput(input: SnapshotInput): ReadSnapshotInput {
  if (!input || typeof input !== 'object')
    throw new TypeError('analyzeSnapshot expects a snapshot object');
  const samples = input.samples;
  if (!(
    samples instanceof Int16Array ||
    samples instanceof Int32Array ||
    samples instanceof Float32Array ||
    samples instanceof Float64Array
  )) {
    throw new TypeError('samples must be an Int16Array, Int32Array, Float32Array or Float64Array');
  }
  const n = samples.length;
  if (n < MIN_SAMPLES)
    throw new RangeError(`a snapshot needs at least ${MIN_SAMPLES} samples, got ${n}`);
  const encoding = parseEncoding(String(input.encoding));
  const fs = positive(input.sampleRateHz, 'sampleRateHz');
  if (!input.adc) throw new TypeError('adc { bits, fullScaleV } is required');
  if (!input.sensor) throw new TypeError('sensor { sensitivityMvPerG } is required');
  const bits = input.adc.bits;
  const fullScaleV = input.adc.fullScaleV;
  const sensitivityMvPerG = positive(input.sensor.sensitivityMvPerG, 'sensor.sensitivityMvPerG');
  const fmaxHz = input.fmaxHz === undefined ? fs / 2.56 : positive(input.fmaxHz, 'fmaxHz');
  if (fmaxHz > fs / 2) throw new RangeError(`fmaxHz ${fmaxHz} is above Nyquist (${fs / 2} Hz)`);
  const lines = input.lines ?? 3200;
  if (!Number.isInteger(lines) || lines < 1)
    throw new RangeError(`lines must be a positive integer, got ${lines}`);
  const windowName = parseWindowName(String(input.window ?? 'hann'));
  if (input.speedRpm !== undefined) positive(input.speedRpm, 'speedRpm');
  if (input.nominalRpm !== undefined) positive(input.nominalRpm, 'nominalRpm');
  if (input.isoBand !== undefined && !(input.isoBand in ISO_BAND_HZ)) {
    throw new TypeError(`isoBand must be 'above600' or 'below600', got ${String(input.isoBand)}`);
  }
  const bands = input.bands ?? [];
  checkBands(bands);
  const tachRpm = input.tach ? tachSpeedRpm(input.tach) : null;

  const scale = { encoding, bits, fullScaleV, sensitivityMvPerG };
  return { samples, n, scale, fs, fmaxHz, lines, windowName, bands, tachRpm };
}
