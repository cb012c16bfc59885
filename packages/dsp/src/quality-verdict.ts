import { quantizationSnrDb } from './quantization-snr.ts';
import type { SampleEncoding } from './sample-codec.ts';
import { checkAdc } from './scale-samples.ts';
import { welch } from './welch.ts';
import {
  countSpikes,
  DRIFT_LINE_RATIO,
  driftRatio,
  flatTops,
  scanCounts,
  SPIKE_SIGMA_MULTIPLE,
} from './quality-waveform.ts';

/** Overall judgement of a capture. */
export type QualityVerdict = 'ok' | 'suspect' | 'unusable';
/** What a finding is about. */
export type QualityCode =
  | 'clipped'
  | 'flat-top'
  | 'under-range'
  | 'no-signal'
  | 'alias-risk'
  | 'bias'
  | 'drift'
  | 'flatline'
  | 'spikes';

/** One thing wrong with a capture, in words an engineer can act on. */
export interface QualityFinding {
  code: QualityCode;
  /** 'suspect': evaluate but mark the values; 'unusable': keep out of limit evaluation. */
  severity: 'suspect' | 'unusable';
  message: string;
  /** The measured figure behind the finding (its meaning is given in the message). */
  value: number;
}

/** Measured figures behind the verdict, kept whether or not they raised a finding. */
export interface QualityMetrics {
  /** Fraction of samples at or within one code of either ADC rail. */
  railFraction: number;
  /** Longest run of consecutive rail samples. */
  longestRailRun: number;
  /** Peak-to-peak in ADC counts. */
  peakToPeakCounts: number;
  /** Mean as a fraction of the positive full scale (signed). */
  biasFraction: number;
  /** Fraction of the (mean-removed) power between fs/2.56 and Nyquist. */
  guardBandPowerFraction: number;
  /** Longest run of identical consecutive values away from the rails, as a fraction of the capture. */
  stuckFraction: number;
  /** Isolated impulses found. */
  spikeCount: number;
  /** Fraction of samples on flat tops away from the rails (runs held within a hair of the extreme). */
  flatTopFraction: number;
  /** RMS of the straight line fitted over the capture ÷ RMS of what is left (0 for none). */
  driftRatio: number;
  /** RMS of the capture (mean removed) in g, or null when no sensitivity was given. */
  rmsG: number | null;
}

/** Result of {@link assessQuality}. */
export interface QualityResult {
  verdict: QualityVerdict;
  /** Bits actually used: log2 of the peak-to-peak in counts (0 for a constant signal). */
  bitsUsed: number;
  /** Ideal quantization SNR of the bits used, 6.02·N + 1.76 dB (exact constants; Kester MT-001). */
  snrDb: number;
  findings: QualityFinding[];
  metrics: QualityMetrics;
}

// Thresholds. Engineering judgement unless a source is named; all are exported so the
// UI can explain them and tests can pin them.

/** Any sample at or within one code of a rail makes the capture `suspect` (common practice, no source). */
export const CLIPPED_FRACTION_SUSPECT = 0;
/** Rail samples above this fraction (0.1 %) make the capture `unusable` for spectra. */
export const CLIPPED_FRACTION_UNUSABLE = 1e-3;
/** A run of this many consecutive rail samples makes the capture `unusable`. */
export const CLIPPED_RUN_UNUSABLE = 4;
/** Fewer bits used than this (8 bits ≈ 50 dB ideal SNR) makes the capture `suspect`. */
export const UNDER_RANGE_SUSPECT_BITS = 8;
/** Fewer bits used than this (4 bits ≈ 26 dB ideal SNR) makes the capture `unusable`. */
export const UNDER_RANGE_UNUSABLE_BITS = 4;
/** Minimum samples per Fmax: fs ≥ 2.56·Fmax (common practice for analyser anti-alias filters). */
export const ALIAS_MIN_SAMPLES_PER_FMAX = 2.56;
/**
 * More than this fraction of the power between fs/2.56 and Nyquist (the guard band, where
 * the anti-alias filter rolls off) makes the capture `suspect`. Rule: a working filter has
 * started attenuating at fs/2.56, so the guard band's mean power density must stay below
 * that of the band under it. Equal density (white noise, or broadband content folded from
 * above Nyquist) puts the guard band's share of the width, (fs/2 − fs/2.56)/(fs/2) = 0.28/1.28
 * = 21.9 %, of the power there; more than that is flagged. Derived from the definition of
 * the guard band; 2.56 is common practice, no source.
 */
export const ALIAS_GUARD_BAND_POWER_FRACTION = 1 - 2 / ALIAS_MIN_SAMPLES_PER_FMAX;
/** |mean| above this fraction of full scale makes the capture `suspect` (sensor bias or coupling fault). */
export const BIAS_FRACTION_SUSPECT = 0.1;
/** |mean| above this fraction of full scale makes the capture `unusable`. */
export const BIAS_FRACTION_UNUSABLE = 0.5;
/** A peak-to-peak of this many counts or fewer is no signal at all: `unusable`. */
export const FLATLINE_MAX_PEAK_TO_PEAK_COUNTS = 1;
/** A run of identical values (off the rails) longer than this fraction of the capture is `suspect`. */
export const FLATLINE_STUCK_FRACTION_SUSPECT = 0.05;
/**
 * A capture whose RMS is below this many g carries no machine signal: a dead or
 * disconnected sensor, or a stopped machine (0.5 mg RMS is a few times the broadband noise
 * of a general-purpose 100 mV/g accelerometer, from memory; engineering judgement).
 */
export const NO_SIGNAL_RMS_G = 0.5e-3;

/** Options for {@link assessQuality}. */
export interface QualityOptions {
  /** Integer encodings are counts; float32 samples are volts. @default 'int32' */
  encoding?: SampleEncoding;
  /** ADC resolution in bits. @default 24 */
  bits?: number;
  /** Volts at the positive rail (code 2^(bits−1)). @default 1.0 */
  fullScaleV?: number;
  /** Sample rate in Hz; needed for the alias checks. @default undefined (alias checks skipped) */
  sampleRateHz?: number;
  /**
   * Sensor sensitivity in mV/g; needed for the no-signal check (a level in g).
   * @default undefined (no-signal check skipped)
   */
  sensitivityMvPerG?: number;
  /** Analysis Fmax in Hz. @default sampleRateHz / 2.56 */
  fmaxHz?: number;
  /** Anti-alias filter cutoff in Hz, when the gateway reports it. @default undefined */
  antiAliasCutoffHz?: number;
  /**
   * A one-sided power spectrum of the capture (any scaling, bins at k·dfHz up to Nyquist),
   * to reuse instead of computing one for the guard-band check.
   * @default computed with welch (Hann, up to 1024 samples per segment)
   */
  spectrum?: { power: ArrayLike<number>; dfHz: number };
}

const ORDER: Record<QualityVerdict, number> = { ok: 0, suspect: 1, unusable: 2 };

function fmt(value: number, digits = 3): string {
  return Number(value.toPrecision(digits)).toString();
}

/**
 * Measurement-quality verdict of a capture from its raw ADC counts: clipping at the rails,
 * flat tops below them, bits used (under-range), no machine signal, alias risk, DC bias,
 * drift/settling, flatline and spikes. The verdict is the worst severity among the findings.
 *
 * Sources: ideal quantization SNR 6.02·N + 1.76 dB (Kester, Analog Devices MT-001);
 * fs ≥ 2.56·Fmax and guard band (common practice for FFT analysers, no source);
 * thresholds are the exported constants above, each with its rule.
 */
export function assessQuality(
  samples: ArrayLike<number>,
  options: QualityOptions = {},
): QualityResult {
  const n = samples.length;
  if (n < 2) throw new RangeError(`a quality verdict needs at least 2 samples, got ${n}`);
  const encoding = options.encoding ?? 'int32';
  const bits = options.bits ?? 24;
  const fullScaleV = options.fullScaleV ?? 1;
  checkAdc(bits, fullScaleV);
  const half = 2 ** (bits - 1);
  const toCounts = encoding === 'float32' ? half / fullScaleV : 1;
  const upperRail = half - 1 - 1; // at or within one code of the top code 2^(bits−1) − 1
  const lowerRail = -half + 1;

  const { min, max, mean, sigma, railCount, longestRailRun, longestStuck } = scanCounts(
    samples,
    toCounts,
    upperRail,
    lowerRail,
  );

  const peakToPeakCounts = max - min;
  const flat = peakToPeakCounts <= FLATLINE_MAX_PEAK_TO_PEAK_COUNTS;
  const bitsUsed = peakToPeakCounts > 0 ? Math.log2(peakToPeakCounts) : 0;
  const snrDb = quantizationSnrDb(bitsUsed);
  const railFraction = railCount / n;
  const biasFraction = mean / half;
  const stuckFraction = longestStuck / n;

  const spikeCount = flat ? 0 : countSpikes(samples, toCounts, mean, sigma, min, max);

  const flatTop = flat ? null : flatTops(samples, toCounts, min, max, half);
  const drift = flat ? 0 : driftRatio(samples, toCounts, mean, sigma);
  const sensitivity = options.sensitivityMvPerG;
  if (sensitivity !== undefined && !(sensitivity > 0 && Number.isFinite(sensitivity)))
    throw new RangeError(`sensitivityMvPerG must be a positive number, got ${sensitivity}`);
  const rmsG =
    sensitivity === undefined ? null : ((sigma / half) * fullScaleV) / (sensitivity / 1000);
  const noSignal = !flat && rmsG !== null && rmsG < NO_SIGNAL_RMS_G;

  let guardBandPowerFraction = 0;
  const fs = options.sampleRateHz;
  const findings: QualityFinding[] = [];
  const add = (
    code: QualityCode,
    severity: 'suspect' | 'unusable',
    message: string,
    value: number,
  ): void => {
    findings.push({ code, severity, message, value });
  };

  if (fs !== undefined) {
    if (!(fs > 0)) throw new RangeError(`sampleRateHz must be positive, got ${fs}`);
    const fmax = options.fmaxHz ?? fs / ALIAS_MIN_SAMPLES_PER_FMAX;
    if (!(fmax > 0)) throw new RangeError(`fmaxHz must be positive, got ${fmax}`);
    if (fs < ALIAS_MIN_SAMPLES_PER_FMAX * fmax * (1 - 1e-9)) {
      add(
        'alias-risk',
        'suspect',
        `sample rate ${fmt(fs)} Hz is below 2.56 × Fmax ${fmt(fmax)} Hz; lines near Fmax may be aliases`,
        fs / fmax,
      );
    }
    if (options.antiAliasCutoffHz !== undefined && options.antiAliasCutoffHz > fs / 2) {
      add(
        'alias-risk',
        'suspect',
        `anti-alias filter cutoff ${fmt(options.antiAliasCutoffHz)} Hz is above Nyquist ${fmt(fs / 2)} Hz`,
        options.antiAliasCutoffHz,
      );
    }
    // Without a machine signal the spectrum is the input's own noise: nothing to alias.
    if (!flat && !noSignal) {
      const spectrum =
        options.spectrum ??
        (() => {
          const r = welch(samples, {
            sampleRateHz: fs,
            nperseg: Math.min(1024, n),
            scaling: 'spectrum',
          });
          return { power: r.power, dfHz: r.dfHz };
        })();
      let total = 0;
      let guard = 0;
      const guardStart = fs / ALIAS_MIN_SAMPLES_PER_FMAX;
      for (let k = 1; k < spectrum.power.length; k++) {
        const p = spectrum.power[k]!;
        total += p;
        if (k * spectrum.dfHz > guardStart) guard += p;
      }
      guardBandPowerFraction = total > 0 ? guard / total : 0;
      if (guardBandPowerFraction > ALIAS_GUARD_BAND_POWER_FRACTION) {
        add(
          'alias-risk',
          'suspect',
          `${fmt(100 * guardBandPowerFraction)} % of the power lies between fs/2.56 and Nyquist; ` +
            'the anti-alias filter may be missing and lines may be aliases',
          guardBandPowerFraction,
        );
      }
    }
  }

  if (railFraction > CLIPPED_FRACTION_SUSPECT) {
    const unusable =
      railFraction > CLIPPED_FRACTION_UNUSABLE || longestRailRun >= CLIPPED_RUN_UNUSABLE;
    add(
      'clipped',
      unusable ? 'unusable' : 'suspect',
      `${fmt(100 * railFraction)} % of samples are at the ADC rails (longest run ${longestRailRun}); ` +
        (unusable ? 'the spectrum is distorted' : 'the signal touches full scale'),
      railFraction,
    );
  }
  if (flatTop && flatTop.fraction > 0) {
    add(
      'flat-top',
      'unusable',
      `the waveform is held flat at ${fmt(100 * flatTop.levelFraction)} % of full scale on ` +
        `${fmt(100 * flatTop.fraction)} % of samples, below the ADC rails: the sensor or its amplifier ` +
        'saturated (too much vibration for its range, or a failing sensor); the spectrum is distorted',
      flatTop.fraction,
    );
  }
  if (flat) {
    add(
      'flatline',
      'unusable',
      `no signal: peak-to-peak is ${fmt(peakToPeakCounts)} counts (sensor, cable or power fault?)`,
      peakToPeakCounts,
    );
  } else if (noSignal) {
    add(
      'no-signal',
      'unusable',
      `no machine signal: ${fmt(rmsG! * 1000)} mg RMS is sensor noise and pick-up, not vibration; ` +
        'check that the sensor is connected (cable, connector, sensor power) and that the machine was running — raising the gain will not help',
      rmsG!,
    );
  } else {
    if (bitsUsed < UNDER_RANGE_SUSPECT_BITS) {
      add(
        'under-range',
        bitsUsed < UNDER_RANGE_UNUSABLE_BITS ? 'unusable' : 'suspect',
        `only ${fmt(bitsUsed)} bits of ${bits} are used (ideal SNR ${fmt(snrDb)} dB); raise the gain or range`,
        bitsUsed,
      );
    }
    if (stuckFraction > FLATLINE_STUCK_FRACTION_SUSPECT) {
      add(
        'flatline',
        'suspect',
        `the signal holds one value for ${fmt(100 * stuckFraction)} % of the capture (dropout?)`,
        stuckFraction,
      );
    }
  }
  if (Math.abs(biasFraction) > BIAS_FRACTION_SUSPECT) {
    add(
      'bias',
      Math.abs(biasFraction) > BIAS_FRACTION_UNUSABLE ? 'unusable' : 'suspect',
      `DC offset is ${fmt(100 * biasFraction)} % of full scale (sensor bias or coupling fault?)`,
      biasFraction,
    );
  }
  if (drift > DRIFT_LINE_RATIO) {
    add(
      'drift',
      'suspect',
      `the signal drifts across the capture (a straight line holds ${fmt(drift)} × the RMS of the rest): ` +
        'a sensor still settling after power-up or a thermal transient; let it settle before capturing',
      drift,
    );
  }
  if (spikeCount > 0) {
    add(
      'spikes',
      'suspect',
      `${spikeCount} isolated impulse${spikeCount === 1 ? '' : 's'} over ${SPIKE_SIGMA_MULTIPLE} σ (electrical noise or a loose connection?)`,
      spikeCount,
    );
  }

  let verdict: QualityVerdict = 'ok';
  for (const f of findings) if (ORDER[f.severity] > ORDER[verdict]) verdict = f.severity;

  return {
    verdict,
    bitsUsed,
    snrDb,
    findings,
    metrics: {
      railFraction,
      longestRailRun,
      peakToPeakCounts,
      biasFraction,
      guardBandPowerFraction,
      stuckFraction,
      spikeCount,
      flatTopFraction: flatTop?.fraction ?? 0,
      driftRatio: drift,
      rmsG,
    },
  };
}
