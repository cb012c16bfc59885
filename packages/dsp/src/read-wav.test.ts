import { describe, expect, it } from 'vitest';
import { readWav, writeWav } from './read-wav.ts';

describe('readWav', () => {
  // RIFF/WAVE spec (1991): header fields round-trip
  it.each(['int16', 'int24', 'int32', 'float32'] as const)(
    'when a %s WAV is written and read, rate, format and samples survive',
    (encoding) => {
      const values = encoding === 'float32' ? [0.5, -0.25, 1] : [1, -1, 1234, -32768];
      const wav = readWav(writeWav(values, 25600, encoding));
      expect(wav.sampleRateHz).toBe(25600);
      expect(wav.encoding).toBe(encoding);
      expect(wav.channels).toBe(1);
      expect(Array.from(wav.samples)).toEqual(values);
    },
  );

  it('when a stereo PCM file is read, the asked channel comes back', () => {
    const mono = writeWav([1, 2, 3, 4], 8000, 'int16');
    // Rewrite as 2 channels of 2 frames: fmt channels = 2, block align = 4, byte rate ×2.
    const bytes = mono.slice();
    const view = new DataView(bytes.buffer);
    view.setUint16(22, 2, true);
    view.setUint32(28, 8000 * 4, true);
    view.setUint16(32, 4, true);
    expect(Array.from(readWav(bytes, { channel: 1 }).samples)).toEqual([2, 4]);
    expect(() => readWav(bytes, { channel: 2 })).toThrow(/channel/);
  });

  it('when the bytes are not RIFF/WAVE, it says so', () => {
    expect(() => readWav(new TextEncoder().encode('time,value\n0,1\n'))).toThrow(/not a WAV file/);
    expect(() => readWav(new Uint8Array(3))).toThrow(/not a WAV file/);
  });

  it('when the file is cut short, the data chunk no longer fits and it is rejected', () => {
    const wav = writeWav(new Array(100).fill(7), 1000, 'int16');
    expect(() => readWav(wav.subarray(0, wav.length - 10))).toThrow(
      /claims 200 bytes but only 190 remain/,
    );
  });

  it('when the header lies about the data size, it is rejected', () => {
    const wav = writeWav([1, 2, 3], 1000, 'int16');
    new DataView(wav.buffer).setUint32(40, 0xffffffff, true);
    expect(() => readWav(wav)).toThrow(/claims/);
  });

  it('when the data chunk is empty, it is rejected as holding no samples', () => {
    expect(() => readWav(writeWav([], 1000, 'int16'))).toThrow(/no samples/);
  });

  it('when a float WAV holds NaN, it is rejected', () => {
    expect(() => readWav(writeWav([0, NaN], 1000, 'float32'))).toThrow(/not a finite/);
  });

  it('when the format is 8-bit PCM or the fmt chunk is missing, it is rejected', () => {
    const wav = writeWav([1, 2], 1000, 'int16');
    const eight = wav.slice();
    new DataView(eight.buffer).setUint16(34, 8, true);
    expect(() => readWav(eight)).toThrow(/unsupported WAV format/);
    const noFmt = wav.slice();
    noFmt.set(new TextEncoder().encode('junk'), 12);
    expect(() => readWav(noFmt)).toThrow(/no fmt chunk/);
  });
});
