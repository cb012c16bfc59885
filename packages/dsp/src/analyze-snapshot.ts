import type { PowerSpectrum } from './band-rms.ts';
import { bandValues } from './band-values.ts';
import { envelopeBandFor, envelopeSpectrum } from './envelope.ts';
import { faultFrequencies } from './fault-frequencies.ts';
import { getFftPlan, nextPowerOfTwo } from './fft-plan.ts';
import { integratePowerSpectrum } from './integrate-spectrum.ts';
import { idealBandRms, recordSpectrum } from './ideal-band-rms.ts';
import { integrateWaveform, taperEnds, trimmedPeakToPeak } from './integrate-waveform.ts';
import { ISO_BAND_HZ, isoBandForSpeed, type IsoBand } from './iso-overall-band.ts';
import { computedOrderTracking } from './order-tracking.ts';
import { assessQuality } from './quality-verdict.ts';
import { scaleToAcceleration } from './scale-samples.ts';
import { scratch } from './scratch.ts';
import { shaftVectors } from './shaft-vector.ts';
import { ANALYSIS_SCHEMA_VERSION, type SnapshotAnalysis } from './snapshot-analysis.ts';
import {
  readSnapshotInput,
  type AnalyzeSnapshotOptions,
  type SnapshotInput,
} from './snapshot-input.ts';
import { findPeaks } from './spectral-peaks.ts';
import { estimateSpeed } from './speed-estimate.ts';
import { waveformStatistics } from './waveform-statistics.ts';
import { welch } from './welch.ts';

export {
  ANALYSIS_SCHEMA_VERSION,
  type HzSpectrum,
  type SnapshotAnalysis,
} from './snapshot-analysis.ts';
export type { AnalyzeSnapshotOptions, SnapshotInput } from './snapshot-input.ts';

/** Fraction of the record tapered at each end before waveform integration (2× it is skipped when measuring). */
const DISPLACEMENT_TAPER = 0.05;

/**
 * Everything Turnstone shows about one snapshot, in one call: counts → g, quality verdict
 * from the raw counts, Welch spectra (acceleration, velocity), envelope spectrum, order
 * spectrum (computed order tracking with a tach, the Hz axis rescaled with an rpm),
 * running speed and its source, overall values, interpolated peaks, fault frequencies and
 * band values. Spectra are `Float32Array`s (compact to store and plot).
 *
 * Sources: see each step — Welch 1967 and scipy.signal.welch (spectra), Harris 1978
 * (windows, ENBW), ISO 20816-1/-3 (overall velocity band), Kester MT-001 (quantization
 * SNR), Fyfe & Munck 1997 (order tracking), Randall & Antoni 2011 (envelope, bearing
 * frequencies).
 */
export function analyzeSnapshot(
  input: SnapshotInput,
  options: AnalyzeSnapshotOptions = {},
): SnapshotAnalysis {
  const { samples, n, scale, fs, fmaxHz, lines, windowName, bands, tachRpm } =
    readSnapshotInput(input);
  const peakCount = options.peakCount ?? 10;

  // ---- counts → g; quality from the counts
  const accel = scaleToAcceleration(samples, scale);
  waveformStatistics(accel, { centerInPlace: true }); // removes the mean (and checks finiteness)

  // ---- Welch acceleration spectrum
  const maxSeg = 2 ** Math.floor(Math.log2(n));
  const nperseg = Math.min(nextPowerOfTwo(Math.ceil((fs * lines) / fmaxHz - 1e-9)), maxSeg);
  const spec = welch(accel, {
    sampleRateHz: fs,
    nperseg,
    window: windowName,
    scaling: 'spectrum',
    detrend: 'constant',
  });
  const df = spec.dfHz;
  const storedLines = Math.min(spec.power.length, Math.floor(fmaxHz / df + 1e-9) + 1);

  const quality = assessQuality(samples, {
    ...scale,
    sampleRateHz: fs,
    fmaxHz,
    ...(input.antiAliasCutoffHz === undefined
      ? {}
      : { antiAliasCutoffHz: input.antiAliasCutoffHz }),
    spectrum: { power: spec.power, dfHz: df },
  });

  // ---- ISO band and velocity
  const bandRpm = tachRpm ?? input.speedRpm ?? input.nominalRpm;
  const isoBand: IsoBand = input.isoBand ?? isoBandForSpeed(bandRpm);
  const [isoLo, isoHiNominal] = ISO_BAND_HZ[isoBand];
  const isoHi = Math.min(isoHiNominal, fmaxHz);
  // Welch lines for the stored velocity spectrum and for `hz` bands in mm/s and µm.
  const velocityPower = integratePowerSpectrum(spec.power, df, {
    from: 'g',
    to: 'mm/s',
    lowCutoffHz: isoLo,
  });
  const displacementPower = integratePowerSpectrum(spec.power, df, {
    from: 'g',
    to: 'um',
    lowCutoffHz: isoLo,
  });
  const enbw = spec.enbwBins;
  // Overall values over ideal bands, read from the whole record at its full resolution.
  const record = recordSpectrum(accel, fs);
  const velocityRmsMmS = idealBandRms(record, { loHz: isoLo, hiHz: isoHi, to: 'mm/s' });
  const displacementRmsUm = idealBandRms(record, { loHz: isoLo, hiHz: isoHi, to: 'um' });
  const accelLo = options.accelerationHighPassHz ?? isoLo;
  if (!(accelLo > 0 && accelLo < fmaxHz)) {
    throw new RangeError(`accelerationHighPassHz must be in (0, ${fmaxHz}), got ${accelLo}`);
  }
  const accelBandHz: [number, number] = [accelLo, fmaxHz];
  const accelRmsG = idealBandRms(record, { loHz: accelLo, hiHz: fmaxHz, to: 'g' });

  // ---- one FFT of the whole (end-tapered) record, shared by displacement, the
  // high-passed acceleration waveform and the envelope; the envelope spectrum's own Hann
  // window already gives the tapered ends ~zero weight.
  const tapered = scratch('analyze-tapered', n);
  tapered.set(accel);
  taperEnds(tapered, DISPLACEMENT_TAPER);
  const full = scratch('analyze-full', 2 * n);
  getFftPlan(n).realForward(full, tapered);
  const bandWaveform = (to: 'g' | 'mm/s' | 'um', loHz: number, hiHz: number) => {
    const top = Math.min(Math.max(hiHz, loHz * 1.5), fs / 2);
    return integrateWaveform(accel, {
      sampleRateHz: fs,
      from: 'g',
      to,
      lowCutoffHz: loHz,
      highCutoffHz: top,
      taperFraction: DISPLACEMENT_TAPER,
      spectrum: full,
      // Synthesised at ≥ 12.8 samples per cycle of the band's top: peaks are read to better
      // than 1 − cos(π/12.8) = 3 % at the band's top and 0.03 % a decade below.
      outputLength: displacementLength(n, fs, top),
    });
  };
  const displacementPkPkUm = trimmedPeakToPeak(
    bandWaveform('um', isoLo, isoHi),
    2 * DISPLACEMENT_TAPER,
  );
  // Peak, crest factor and kurtosis of the high-passed acceleration, on the middle of the
  // record (its tapered ends are not valid output).
  const accelWave = bandWaveform('g', accelLo, fmaxHz);
  const skip = Math.floor(accelWave.length * 2 * DISPLACEMENT_TAPER);
  const accelStats = waveformStatistics(accelWave.subarray(skip, accelWave.length - skip));

  // ---- speed
  let speed: SnapshotAnalysis['speed'] = { rpm: null, hz: null, source: 'none' };
  if (tachRpm !== null) speed = { rpm: tachRpm, hz: tachRpm / 60, source: 'tach' };
  else if (input.speedRpm !== undefined)
    speed = { rpm: input.speedRpm, hz: input.speedRpm / 60, source: 'rpm' };
  else if (input.nominalRpm !== undefined) {
    const est = estimateSpeed(spec.power.subarray(0, storedLines), df, {
      nominalRpm: input.nominalRpm,
      window: windowName,
      nperseg,
      ...(options.speedSearchFraction === undefined
        ? {}
        : { searchFraction: options.speedSearchFraction }),
    });
    if (est) speed = { rpm: est.rpm, hz: est.hz, source: 'estimated' };
  }
  const shaftHz = speed.hz;

  // ---- envelope
  let envelope: SnapshotAnalysis['spectra']['envelope'] = null;
  let envelopePower: PowerSpectrum | null = null;
  const envBand = envelopeBandFor(input.envelopeBandHz, fs);
  if (n >= 256) {
    const env = envelopeSpectrum(accel, {
      sampleRateHz: fs,
      bandHz: envBand,
      spectrum: full,
      ...(options.envelopeFmaxHz === undefined ? {} : { fmaxHz: options.envelopeFmaxHz }),
    });
    const values = new Float32Array(env.amplitude);
    const power = new Float64Array(env.amplitude.length);
    for (let k = 0; k < power.length; k++) {
      const amp = env.amplitude[k]!;
      power[k] = k === 0 ? amp * amp : (amp * amp) / 2;
    }
    envelope = {
      unit: 'g',
      scale: 'peak',
      dfHz: env.dfHz,
      values,
      window: env.window,
      bandHz: env.bandHz,
      meanG: env.mean,
    };
    envelopePower = { power, dfHz: env.dfHz, enbwBins: env.enbwBins };
  }

  // ---- orders
  let order: SnapshotAnalysis['spectra']['order'] = null;
  if (shaftHz !== null) {
    const maxOrder = options.maxOrder ?? Math.min(100, fmaxHz / shaftHz);
    if (speed.source === 'tach' && input.tach) {
      const cot = computedOrderTracking(accel, input.tach, {
        sampleRateHz: fs,
        maxOrder,
        window: windowName,
      });
      order = {
        unit: 'g',
        scale: 'rms',
        dOrder: cot.dOrder,
        values: sqrtToFloat32(cot.power),
        method: 'computed-order-tracking',
      };
    } else {
      const dOrder = df / shaftHz;
      const count = Math.min(storedLines, Math.floor(maxOrder / dOrder + 1e-9) + 1);
      order = {
        unit: 'g',
        scale: 'rms',
        dOrder,
        values: sqrtToFloat32(spec.power.subarray(0, count)),
        method: 'hz-axis',
      };
    }
  }

  // ---- peaks, fault frequencies, bands
  const peaks = findPeaks(spec.power.subarray(0, storedLines), df, {
    count: peakCount,
    window: windowName,
    nperseg,
  }).map((p) => ({
    hz: p.hz,
    order: shaftHz === null ? null : p.hz / shaftHz,
    amplitude: p.amplitude,
  }));
  const faults = faultFrequencies(input.machine ?? {}, shaftHz);
  const accelStored = spec.power.subarray(0, storedLines);
  const values = bandValues(bands, {
    spectra: {
      g: { power: accelStored, dfHz: df, enbwBins: enbw },
      'mm/s': { power: velocityPower.subarray(0, storedLines), dfHz: df, enbwBins: enbw },
      um: { power: displacementPower.subarray(0, storedLines), dfHz: df, enbwBins: enbw },
    },
    envelope: envelopePower,
    shaftHz,
    faultFrequencies: faults,
    overallOver: (unit, measure, loHz, hiHz) => {
      // What the analysis holds of the span: up to Fmax, and above 0 Hz when integrating.
      const hi = Math.min(hiHz, fmaxHz);
      const lo = Math.max(loHz, unit === 'g' ? 0 : record.dfHz);
      if (!(hi > lo)) return null;
      if (measure === 'rms') return idealBandRms(record, { loHz: lo, hiHz: hi, to: unit });
      const wave = bandWaveform(unit, Math.max(lo, record.dfHz), hi);
      if (unit === 'um') return trimmedPeakToPeak(wave, 2 * DISPLACEMENT_TAPER) / 2;
      const edge = Math.floor(wave.length * 2 * DISPLACEMENT_TAPER);
      let peak = 0;
      for (let i = edge; i < wave.length - edge; i++) peak = Math.max(peak, Math.abs(wave[i]!));
      return peak;
    },
    overall: {
      accelRmsG,
      accelPeakG: accelStats.peak,
      velocityRmsMmS,
      displacementPkPkUm,
      displacementRmsUm,
    },
  });

  return {
    schemaVersion: ANALYSIS_SCHEMA_VERSION,
    sampleRateHz: fs,
    sampleCount: n,
    durationS: n / fs,
    fmaxHz,
    quality: {
      verdict: quality.verdict,
      bitsUsed: quality.bitsUsed,
      snrDb: quality.snrDb,
      findings: quality.findings,
      metrics: quality.metrics,
    },
    overall: {
      accelRmsG,
      accelPeakG: accelStats.peak,
      accelBandHz,
      velocityRmsMmS,
      displacementPkPkUm,
      crestFactor: accelStats.rms > 0 ? accelStats.peak / accelStats.rms : 0,
      kurtosis: accelStats.kurtosis,
      isoBand,
      isoBandHz: [isoLo, isoHi],
    },
    speed,
    spectra: {
      acceleration: {
        unit: 'g',
        scale: 'rms',
        dfHz: df,
        values: sqrtToFloat32(accelStored),
        window: windowName,
        nperseg,
        averages: spec.segments,
        enbwBins: enbw,
      },
      velocity: {
        unit: 'mm/s',
        scale: 'rms',
        dfHz: df,
        values: sqrtToFloat32(velocityPower.subarray(0, storedLines)),
        window: windowName,
        lowCutoffHz: isoLo,
      },
      envelope,
      order,
    },
    peaks,
    faultFrequencies: faults,
    bandValues: values,
    shaftVectors:
      speed.source === 'tach' && input.tach
        ? shaftVectors(accel, input.tach, { sampleRateHz: fs, orders: [1, 2] })
        : null,
  };
}

/** Power-of-two length giving ≥ 12.8 samples per cycle at `hiHz`, or n when that is not shorter. */
function displacementLength(n: number, fs: number, hiHz: number): number {
  const need = Math.max(16, nextPowerOfTwo(Math.ceil((12.8 * hiHz * n) / fs)));
  return need < n ? need : n;
}

function sqrtToFloat32(power: ArrayLike<number>): Float32Array {
  const out = new Float32Array(power.length);
  for (let i = 0; i < power.length; i++) out[i] = Math.sqrt(power[i]!);
  return out;
}
