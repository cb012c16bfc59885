// The WAV reader on files from an outside writer: scipy.io.wavfile (Debian python3-scipy)
// writes int16, int32 and float32 files, run live; 24-bit PCM and WAVE_FORMAT_EXTENSIBLE
// (which scipy cannot write) are built byte by byte from the format specification and read
// back by scipy as a check that the bytes say what we think they say.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readWav, wavCapture } from '@turnstone/dsp';
import { pcmWavBytes } from '../support/wav-bytes.ts';
import { runPython, scipyAvailable } from './scipy.ts';

const available = scipyAvailable();
const dir = mkdtempSync(join(tmpdir(), 'turnstone-wav-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const FS = 25600;
/** A 156.25 Hz sine at `fraction` of a `bits` converter's full scale (definition), as integers. */
const sine = (bits: number, fraction: number, n = 4096) =>
  Array.from(
    { length: n },
    (_, i) =>
      Math.round(fraction * (2 ** (bits - 1) - 1) * Math.sin((2 * Math.PI * 156.25 * i) / FS)) || 0,
  );

describe.skipIf(!available)(
  'WAV files written by scipy.io.wavfile, live',
  { timeout: 60_000 },
  () => {
    it('when scipy writes int16, int32 and float32 files, every sample and the rate read back exactly', () => {
      const i16 = sine(16, 0.9);
      const i32 = sine(32, 0.9);
      const f32 = Array.from({ length: 4096 }, (_, i) =>
        Math.fround(0.7 * Math.sin((2 * Math.PI * 156.25 * i) / FS)),
      );
      // scipy.io.wavfile.write: the WAV format follows the array's dtype (int16 and int32 →
      // PCM, float32 → IEEE float)
      runPython<null>(
        `from scipy.io import wavfile
wavfile.write(data['dir'] + '/i16.wav', 25600, np.array(data['i16'], dtype=np.int16))
wavfile.write(data['dir'] + '/i32.wav', 25600, np.array(data['i32'], dtype=np.int32))
wavfile.write(data['dir'] + '/f32.wav', 25600, np.array(data['f32'], dtype=np.float32))
print('null')`,
        { dir, i16, i32, f32 },
      );
      const read = (name: string) => new Uint8Array(readFileSync(join(dir, name)));
      const a = readWav(read('i16.wav'));
      expect([a.encoding, a.sampleRateHz, a.bitsPerSample]).toEqual(['int16', FS, 16]);
      expect(Array.from(a.samples)).toEqual(i16);
      const b = readWav(read('i32.wav'));
      expect([b.encoding, b.bitsPerSample, b.validBits]).toEqual(['int32', 32, 32]);
      expect(Array.from(b.samples)).toEqual(i32);
      const c = readWav(read('f32.wav'));
      expect(c.encoding).toBe('float32');
      expect(Array.from(c.samples)).toEqual(f32);
      // float 1.0 = full scale, as the largest integer code: the float file at 0.7 and the
      // int16 file at 0.9 of full scale read in that ratio of volts, with any --full-scale
      const peak = (x: ArrayLike<number>) => Math.max(...Array.from(x, Math.abs));
      const fsF = wavCapture(read('f32.wav'), { fullScaleV: 5 });
      const fsI = wavCapture(read('i16.wav'), { fullScaleV: 5 });
      expect(peak(fsF.samples)).toBeCloseTo(0.7 * 5, 5);
      expect((peak(fsI.samples) / 2 ** 15) * 5).toBeCloseTo(0.9 * 5, 3);
    });

    // Microsoft/IBM RIFF/WAVE (1991) for 24-bit PCM; Microsoft Learn, "WAVEFORMATEXTENSIBLE
    // structure (mmreg.h)" for 0xFFFE with wValidBitsPerSample below the container.
    // scipy.io.wavfile.read returns 24-bit data as int32 with the samples in the top 24 bits
    // (its documentation's table of data types), so it reads code × 2^(32 − valid bits).
    it('when 24-bit PCM and EXTENSIBLE files are built from the specification, scipy and we read the same codes', () => {
      const cases = [
        { name: 'i24.wav', container: 24 as const, valid: 24, extensible: false },
        { name: 'x24.wav', container: 24 as const, valid: 24, extensible: true },
        { name: 'x20in24.wav', container: 24 as const, valid: 20, extensible: true },
        { name: 'x24in32.wav', container: 32 as const, valid: 24, extensible: true },
      ];
      const codes = Object.fromEntries(cases.map((c) => [c.name, sine(c.valid, 0.8)]));
      for (const c of cases)
        writeFileSync(
          join(dir, c.name),
          pcmWavBytes(codes[c.name]!, FS, c.container, c.valid, c.extensible),
        );
      const scipy = runPython<Record<string, { rate: number; dtype: string; x: number[] }>>(
        `from scipy.io import wavfile
out = {}
for name in data['names']:
    rate, x = wavfile.read(data['dir'] + '/' + name)
    out[name] = {'rate': rate, 'dtype': str(x.dtype), 'x': x.astype(np.int64).tolist()}
print(json.dumps(out))`,
        { dir, names: cases.map((c) => c.name) },
      );
      for (const c of cases) {
        const ref = scipy[c.name]!;
        expect(ref.rate).toBe(FS);
        expect(ref.dtype).toBe('int32');
        const cap = wavCapture(new Uint8Array(readFileSync(join(dir, c.name))));
        expect(cap.adc.bits).toBe(c.valid);
        expect(cap.container).toEqual({ bits: c.container, validBits: c.valid });
        expect(Array.from(cap.samples)).toEqual(codes[c.name]);
        // scipy's int32 values are our codes × 2^(32 − valid)
        const scale = 2 ** (32 - c.valid);
        expect(ref.x.map((v) => v / scale)).toEqual(Array.from(cap.samples));
      }
    });
  },
);
