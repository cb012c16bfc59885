import { describe, expect, it } from 'vitest';
import { floatWavBytes, pcmWavBytes } from '../../../tests/support/wav-bytes.ts';
import { analyzeSnapshot } from './analyze-snapshot.ts';
import { wavCapture, wavCaptureBytes } from './wav-capture.ts';
import { readWavLayout } from './read-wav.ts';
import { decodeSamples } from './sample-codec.ts';

const FS = 25600;
/** Codes of a `bits` converter for a 156.25 Hz sine (a whole number of cycles in 4096, 8192 or 16384 samples) at `fraction` of full scale (definition). */
const sineCodes = (bits: number, fraction: number, n = 16384) =>
  Array.from(
    { length: n },
    (_, i) =>
      // "|| 0": no negative zero (a code is an integer)
      Math.round(fraction * 2 ** (bits - 1) * Math.sin((2 * Math.PI * 156.25 * i) / FS)) || 0,
  );

describe('wavCapture', () => {
  // Microsoft, WAVEFORMATEXTENSIBLE: 20 valid bits left-justified in a 24-bit container.
  // A half-scale sine of a 20-bit converter at 1 V full scale and 100 mV/g is 5 g peak,
  // 3.5355 g RMS (peak/√2, definition of a sine) — not 16× that, and not clipped.
  it('when 20 valid bits sit in a 24-bit EXTENSIBLE container, the codes are 20-bit and the level is right', () => {
    const codes = sineCodes(20, 0.5);
    const cap = wavCapture(pcmWavBytes(codes, FS, 24, 20));
    expect(cap.container).toEqual({ bits: 24, validBits: 20 });
    expect(cap.adc).toEqual({ bits: 20, fullScaleV: 1 });
    expect(Array.from(cap.samples)).toEqual(codes);
    const a = analyzeSnapshot({ ...cap, sensor: { sensitivityMvPerG: 100 } });
    expect(a.overall.accelRmsG).toBeCloseTo(5 / Math.SQRT2, 3);
    expect(a.quality.findings.map((f) => f.code)).not.toContain('clipped');
    expect(a.quality.bitsUsed).toBeCloseTo(19, 2); // peak-to-peak = one 20-bit full scale
  });

  // RIFF/WAVE (1991): plain PCM, full scale is the container's.
  it('when a plain 24-bit PCM file holds a sine at a quarter of full scale, it reads 0.25 × full scale', () => {
    const cap = wavCapture(pcmWavBytes(sineCodes(24, 0.25), FS, 24), { fullScaleV: 5 });
    expect(cap.adc).toEqual({ bits: 24, fullScaleV: 5 });
    const a = analyzeSnapshot({ ...cap, sensor: { sensitivityMvPerG: 100 } });
    // 0.25 × 5 V = 1.25 V peak = 12.5 g peak at 100 mV/g → 8.839 g RMS
    expect(a.overall.accelRmsG).toBeCloseTo(12.5 / Math.SQRT2, 2);
  });

  // Float WAV: 1.0 is full scale, the same full scale as the largest integer code.
  it('when a float WAV holds ±0.5, it is 0.5 × the given full scale in volts', () => {
    const values = Array.from({ length: 8192 }, (_, i) =>
      Math.fround(0.5 * Math.sin((2 * Math.PI * 156.25 * i) / FS)),
    );
    const cap = wavCapture(floatWavBytes(values, FS), { fullScaleV: 2 });
    expect(cap.encoding).toBe('float32');
    expect(cap.adc).toEqual({ bits: 24, fullScaleV: 2 });
    expect(Math.max(...cap.samples)).toBeCloseTo(1, 5); // 0.5 × 2 V
    const pcm = wavCapture(pcmWavBytes(sineCodes(16, 0.5, 8192), FS, 16), { fullScaleV: 2 });
    const g = (c: typeof cap) =>
      analyzeSnapshot({ ...c, sensor: { sensitivityMvPerG: 100 } }).overall.accelRmsG;
    // the same half-scale sine as 16-bit codes reads the same level (to 16-bit rounding)
    expect(g(cap) / g(pcm)).toBeCloseTo(1, 4);
  });

  it('when fewer ADC bits are given than the container holds, codes are those of that converter', () => {
    const codes = sineCodes(12, 0.5, 4096);
    const cap = wavCapture(pcmWavBytes(codes, FS, 16, 12, false), { bits: 12 });
    expect(Array.from(cap.samples)).toEqual(codes);
    expect(() => wavCapture(pcmWavBytes(codes, FS, 16), { bits: 20 })).toThrow(/exceed/);
  });
});

describe('wavCaptureBytes', () => {
  // RIFF/WAVE (Microsoft/IBM 1991): a mono file's data chunk holds the little-endian samples
  // themselves, so where the stored values are the file's own the bytes pass unchanged.
  const dataChunk = (wav: Uint8Array) => {
    const { data } = readWavLayout(wav);
    return Buffer.from(wav.subarray(data.start, data.start + data.size));
  };
  const volts = sineCodes(24, 0.5, 4096).map((c) => c / 2 ** 23);

  it('keeps a full-width PCM file’s data chunk and a float file’s at 1 V full scale byte for byte', () => {
    const pcm = pcmWavBytes(sineCodes(16, 0.5, 4096), FS, 16);
    const got = wavCaptureBytes(pcm);
    expect(got).toMatchObject({ encoding: 'int16', count: 4096, adc: { bits: 16, fullScaleV: 1 } });
    expect(Buffer.from(got.sampleBytes).equals(dataChunk(pcm))).toBe(true);
    const flt = floatWavBytes(volts, FS);
    const f = wavCaptureBytes(flt);
    expect(f).toMatchObject({ encoding: 'float32', count: 4096 });
    expect(Buffer.from(f.sampleBytes).equals(dataChunk(flt))).toBe(true);
  });

  // WAVEFORMATEXTENSIBLE: valid bits sit at the top of the container, so a 20-bit code is the
  // container value ÷ 2^4; float samples are volts at full scale × value (definitions).
  it('stores 20-bit codes of a 24-bit container, and float values scaled to volts', () => {
    const codes = sineCodes(20, 0.5, 4096);
    const pcm = wavCaptureBytes(pcmWavBytes(codes, FS, 24, 20));
    expect(pcm).toMatchObject({ encoding: 'int24', adc: { bits: 20, fullScaleV: 1 } });
    expect(Array.from(decodeSamples(pcm.sampleBytes, 'int24'))).toEqual(codes);
    const flt = wavCaptureBytes(floatWavBytes(volts, FS), { fullScaleV: 2.5 });
    expect(Array.from(decodeSamples(flt.sampleBytes, 'float32'))).toEqual(
      volts.map((v) => Math.fround(Math.fround(v) * 2.5)),
    );
  });

  it('refuses a float file holding NaN, as reading it does', () => {
    const bad = floatWavBytes(volts, FS);
    new DataView(bad.buffer, bad.byteOffset).setFloat32(dataStart(bad) + 4 * 7, Number.NaN, true);
    expect(() => wavCaptureBytes(bad)).toThrow(/invalid WAV: sample 7 is not a finite number/);
  });
});

const dataStart = (wav: Uint8Array) => readWavLayout(wav).data.start;
