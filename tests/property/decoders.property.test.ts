/**
 * Property-based checks (fast-check) of everything that parses outside input: the ingest
 * sample codec and the WAV/CSV readers. Round trips must be exact; arbitrary bytes must give
 * a clean Error (never a crash, a hang, or samples that are not finite).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decodeSamples, encodeSamples, readCsv, readWav, writeWav } from '@turnstone/dsp';

const encodings = ['int16', 'int24', 'int32'] as const;
const range = { int16: 2 ** 15, int24: 2 ** 23, int32: 2 ** 31 } as const;

describe('ingest sample codec', () => {
  it('integer samples survive encode → decode unchanged, for every encoding', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...encodings),
        fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 400 }),
        (enc, us) => {
          const values = us.map((u) => Math.floor(u * (2 * range[enc] - 1)) - range[enc]);
          const decoded = decodeSamples(new Uint8Array(encodeSamples(values, enc)), enc);
          expect(Array.from(decoded)).toEqual(values);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('float32 samples survive encode → decode as their float32 rounding', () => {
    fc.assert(
      fc.property(
        fc.array(fc.float({ noNaN: true, noDefaultInfinity: true }), {
          minLength: 1,
          maxLength: 400,
        }),
        (values) => {
          const decoded = decodeSamples(
            new Uint8Array(encodeSamples(values, 'float32')),
            'float32',
          );
          expect(Array.from(decoded)).toEqual(values.map((v) => Math.fround(v)));
        },
      ),
    );
  });

  it('values outside an encoding are refused with a RangeError naming the sample', () => {
    fc.assert(
      fc.property(fc.constantFrom(...encodings), fc.integer({ min: 1, max: 1000 }), (enc, over) => {
        expect(() => encodeSamples([0, range[enc] - 1 + over], enc)).toThrow(/samples\[1\]/);
      }),
    );
  });

  it('arbitrary bytes decode to finite samples or a clean error', () => {
    fc.assert(
      fc.property(
        fc.constantFrom('int16', 'int24', 'int32', 'float32' as const),
        fc.uint8Array({ maxLength: 600 }),
        (enc, bytes) => {
          try {
            const out = decodeSamples(bytes, enc);
            expect(out.every((v) => Number.isFinite(v))).toBe(true);
          } catch (err) {
            expect(err).toBeInstanceOf(Error);
          }
        },
      ),
      { numRuns: 500 },
    );
  });
});

describe('WAV reader', () => {
  it('writeWav → readWav returns the same counts and rate', () => {
    fc.assert(
      fc.property(
        fc.constantFrom('int16', 'int24', 'int32' as const),
        fc.integer({ min: 1000, max: 200_000 }),
        fc.array(fc.integer({ min: -32768, max: 32767 }), { minLength: 1, maxLength: 300 }),
        (enc, rate, values) => {
          const wav = readWav(writeWav(values, rate, enc));
          expect(wav.sampleRateHz).toBe(rate);
          expect(Array.from(wav.samples)).toEqual(values);
        },
      ),
      { numRuns: 150 },
    );
  });

  it('arbitrary or corrupted bytes give a clean Error', () => {
    const valid = writeWav(
      Array.from({ length: 64 }, (_, i) => i * 100),
      10240,
      'int16',
    );
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: valid.length - 1 }),
        fc.integer({ min: 0, max: 255 }),
        fc.integer({ min: 0, max: valid.length }),
        (at, byte, cut) => {
          const bytes = valid.slice(0, cut);
          if (at < bytes.length) bytes[at] = byte;
          try {
            const w = readWav(bytes);
            expect(w.samples.length).toBeGreaterThan(0);
            expect(Array.from(w.samples).every((v) => Number.isFinite(v))).toBe(true);
          } catch (err) {
            expect(err).toBeInstanceOf(Error);
            expect((err as Error).message.length).toBeGreaterThan(5);
          }
        },
      ),
      { numRuns: 500 },
    );
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 300 }), (bytes) => {
        expect(() => readWav(bytes)).toThrow(Error);
      }),
    );
  });
});

describe('CSV reader', () => {
  it('one column of numbers reads back exactly', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 2, maxLength: 300 }),
        (values) => {
          const csv = readCsv(values.map((v) => String(v)).join('\n'));
          // String(-0) is "0": compare with signed zeros folded.
          expect(Array.from(csv.values)).toEqual(values.map((v) => v + 0));
        },
      ),
    );
  });

  it('arbitrary text gives numbers or a clean Error, never NaN', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 400 }), (text) => {
        try {
          const csv = readCsv(text);
          expect(Array.from(csv.values).every((v) => Number.isFinite(v))).toBe(true);
        } catch (err) {
          expect(err).toBeInstanceOf(Error);
        }
      }),
      { numRuns: 500 },
    );
  });
});
