import { describe, expect, it } from 'vitest';
import { decodeSamples, parseEncoding } from './sample-codec.ts';
import { scaleToAcceleration, voltsPerCount } from './scale-samples.ts';

describe('decode samples', () => {
  // RIFF/WAVE spec (1991): little-endian two's complement
  it('when int16, int24 and int32 bytes are decoded, little-endian two’s-complement values come out', () => {
    expect(
      Array.from(decodeSamples(Uint8Array.of(0x01, 0x00, 0xff, 0xff, 0x00, 0x80), 'int16')),
    ).toEqual([1, -1, -32768]);
    expect(
      Array.from(
        decodeSamples(Uint8Array.of(0xff, 0xff, 0x7f, 0x00, 0x00, 0x80, 0xfe, 0xff, 0xff), 'int24'),
      ),
    ).toEqual([8388607, -8388608, -2]);
    expect(
      Array.from(decodeSamples(Uint8Array.of(0x00, 0x00, 0x00, 0x80, 0x05, 0, 0, 0), 'int32')),
    ).toEqual([-2147483648, 5]);
  });

  // IEEE 754 binary32: 0x3f800000 = 1.0, 0xc0000000 = −2.0
  it('when float32 bytes are decoded, IEEE values come out and NaN is refused', () => {
    expect(
      Array.from(decodeSamples(Uint8Array.of(0, 0, 0x80, 0x3f, 0, 0, 0, 0xc0), 'float32')),
    ).toEqual([1, -2]);
    expect(() => decodeSamples(Uint8Array.of(0, 0, 0xc0, 0x7f), 'float32')).toThrow(/not a finite/);
  });

  it('when the byte count is not whole samples or empty, or the encoding unknown, it throws', () => {
    expect(() => decodeSamples(new Uint8Array(5), 'int16')).toThrow(/whole number/);
    expect(() => decodeSamples(new Uint8Array(0), 'int16')).toThrow(/empty/);
    expect(() => decodeSamples(new Uint8Array(4), 'int8' as never)).toThrow(TypeError);
    expect(() => parseEncoding('pcm')).toThrow(/use one of/);
  });

  // Kester MT-001 (bipolar ADC transfer); 3rd CGPM 1901 (g)
  it('when 24-bit counts are scaled, 2^23 counts at 1 V full scale and 100 mV/g is 10 g (98.0665 m/s²)', () => {
    expect(voltsPerCount(24, 1)).toBe(2 ** -23);
    const g = scaleToAcceleration(Int32Array.of(2 ** 23, -(2 ** 22)), {
      bits: 24,
      fullScaleV: 1,
      sensitivityMvPerG: 100,
    });
    expect(Array.from(g)).toEqual([10, -5]);
    const ms2 = scaleToAcceleration([2 ** 23], { bits: 24, unit: 'm/s2' });
    expect(ms2[0]).toBeCloseTo(98.0665, 10);
    const volts = scaleToAcceleration(Float32Array.of(0.5), {
      encoding: 'float32',
      sensitivityMvPerG: 50,
    });
    expect(volts[0]).toBe(10);
  });

  it('when ADC or sensor figures are impossible, scaling throws RangeError', () => {
    expect(() => scaleToAcceleration([1], { bits: 1 })).toThrow(RangeError);
    expect(() => scaleToAcceleration([1], { fullScaleV: 0 })).toThrow(RangeError);
    expect(() => scaleToAcceleration([1], { sensitivityMvPerG: -10 })).toThrow(RangeError);
  });
});
