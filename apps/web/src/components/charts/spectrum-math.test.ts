import { describe, expect, it } from 'vitest';
import {
  decibelUnit,
  differenceDb,
  harmonicLines,
  harmonicMarks,
  lowCutoff,
  matchMark,
  maxInView,
  realPeaks,
  scaleFactor,
  sidebandLines,
  snapToPeak,
  toDecibelLines,
} from './spectrum-math.ts';

/** An envelope-like spectrum: a large 0 Hz line leaking into lines 1–2, and small tones. */
function envelope(): Float32Array {
  const v = new Float32Array(801).fill(0.001);
  v[0] = 0.5;
  v[1] = 0.25;
  v[2] = 0.02;
  v[107] = 0.03; // a bearing tone at 107 × 1.25 = 133.75 Hz
  v[214] = 0.012; // its second harmonic
  return v;
}

describe('spectrum y scale', () => {
  // Common practice, no source: the 0 Hz line of an envelope spectrum must not set the scale.
  it('when the window starts at 0 Hz, the envelope DC line and its leakage are left out of the maximum', () => {
    const v = envelope();
    const cut = lowCutoff(1.25, 'hz', 24.7);
    expect(cut).toBe(3.75); // 3 lines of 1.25 Hz, more than the 2 Hz cut-off
    expect(maxInView(v, 1.25, 0, 1000, cut)).toBeCloseTo(0.03, 7);
    // Zoomed on the second harmonic alone the scale follows it.
    expect(maxInView(v, 1.25, 200, 300, cut)).toBeCloseTo(0.012, 7);
  });

  it('on an order axis the 2 Hz cut-off is turned into orders of the running speed', () => {
    // 2 Hz at 24.7 Hz running speed = 0.081 order, above 3 lines of 0.0125 order.
    expect(lowCutoff(0.0125, 'order', 24.7)).toBeCloseTo(2 / 24.7, 12);
  });
});

describe('levels in dB re ISO 1683', () => {
  // ISO 1683:2015 reference values: acceleration 1 µm/s², velocity 1 nm/s, displacement 1 pm —
  // not read from the standard here but as python-acoustics states them
  // (acoustics/standards/iso_1683_2015.py, REFERENCE_VALUES["vibration"]: 1e-6 m/s², 1e-9 m/s,
  // 1e-12 m); the ASA terminology entries "particle velocity level" and "(vibratory)
  // acceleration level" (asastandards.org/Terms) give 1 nm/s and 1 µm/s² for ISO 1683:2008.
  // Expected levels computed by hand from 20·log10(x/x0).
  it('when a line is 1 mm/s, 1 g or 1 µm, it reads 120 dB, 139.83 dB and 120 dB', () => {
    const [v] = toDecibelLines([1], 'mm/s');
    const [a] = toDecibelLines([1], 'g'); // 9.80665 m/s² / 1e-6 m/s² → 139.830 dB
    const [d] = toDecibelLines([1], 'um');
    expect(v).toBeCloseTo(120, 9);
    expect(a).toBeCloseTo(20 * Math.log10(9.80665e6), 9);
    expect(a).toBeCloseTo(139.83, 2);
    expect(d).toBeCloseTo(120, 9);
  });

  it('a line of 0 has no level (a gap, not −Infinity); unknown units have no dB scale', () => {
    expect(toDecibelLines([0, 0.001], 'mm/s')).toEqual([null, expect.closeTo(60, 9)]);
    expect(decibelUnit('g')).toBe('g');
    expect(decibelUnit('µm')).toBe('um');
    expect(decibelUnit('V')).toBeNull();
  });
});

describe('cursors', () => {
  // Common practice, no source: a click beside a peak lands on the peak.
  it('when a click lands two lines beside a peak, the cursor snaps to the peak line', () => {
    const v = envelope();
    expect(snapToPeak(v, 1.25, 131.3)).toBeCloseTo(133.75, 9);
    // Flat surroundings: stays on its own line.
    expect(snapToPeak(v, 1.25, 500.2)).toBeCloseTo(500, 9);
  });

  it('the harmonic cursor reads each harmonic’s amplitude and stops at the last line', () => {
    const v = envelope();
    const h = harmonicLines(v, 1.25, 133.75, 10);
    expect(h.map((l) => l.n)).toEqual([1, 2, 3, 4, 5, 6, 7]); // 7 × 133.75 = 936 ≤ 1000 Hz
    expect(h[0]!.amplitude).toBeCloseTo(0.03, 7);
    expect(h[1]!.x).toBeCloseTo(267.5, 9);
    expect(h[1]!.amplitude).toBeCloseTo(0.012, 7); // line 214 is within ±1 line of 267.5 / 1.25 = 214
  });

  // Gear mesh sidebands at ± n × shaft speed (Randall, Vibration-based Condition Monitoring, 2011, ch. 2; from memory).
  it('the sideband cursor puts carrier ± n × spacing, dropping positions at or below 0 Hz', () => {
    const v = new Float32Array(801).fill(0.001);
    const s = sidebandLines(v, 1.25, 50, 24.7, 3);
    expect(s.map((l) => l.n)).toEqual([-2, -1, 0, 1, 2, 3]); // 50 − 3 × 24.7 < 0
    expect(s.map((l) => l.x)).toEqual(
      [0.6, 25.3, 50, 74.7, 99.4, 124.1].map((x) => expect.closeTo(x, 9)),
    );
  });
});

describe('fault-frequency marks and matching', () => {
  it('each fault frequency gets its harmonics, named “2× …”; running speed’s are plainly 2×, 3×', () => {
    const m = harmonicMarks(
      [
        { name: '1×', x: 24.7 },
        { name: 'DE 6205 BPFO', x: 88.6 },
      ],
      3,
      200,
    );
    expect(m.map((x) => x.name)).toEqual(['1×', '2×', '3×', 'DE 6205 BPFO', '2× DE 6205 BPFO']);
    expect(m[4]!.x).toBeCloseTo(177.2, 9);
  });

  it('a peak is matched to the nearest mark within one line spacing, else to none', () => {
    const marks = harmonicMarks([{ name: 'DE 6205 BPFO', x: 88.6 }], 3, 400);
    expect(matchMark(177.5, marks, 1.25)?.name).toBe('2× DE 6205 BPFO');
    expect(matchMark(179, marks, 1.25)).toBeNull();
  });

  it('the peaks table lists the tones above the floor with their match, not the DC line', () => {
    const v = envelope();
    const marks = harmonicMarks([{ name: 'BPFO', x: 133.9 }], 3, 1000);
    const { peaks, floor } = realPeaks(v, 1.25, 0, 1000, { lowCut: 3.75, marks });
    expect(floor).toBeCloseTo(0.001 * 10 ** 0.5, 9);
    expect(peaks.map((p) => [p.x, p.match?.name ?? null])).toEqual([
      [133.75, 'BPFO'],
      [267.5, '2× BPFO'],
    ]);
  });
});

describe('compare', () => {
  it('the change is 20·log10(after/before) per line; a different line spacing is interpolated', () => {
    const before = [1, 1, 2, 4];
    const after = [1, 2, 2, 0.4];
    const d = differenceDb(after, 1, before, 1);
    expect(d[0]).toBeCloseTo(0, 12);
    expect(d[1]).toBeCloseTo(6.0206, 4); // doubling = 6.02 dB (20·log10 2)
    expect(d[3]).toBeCloseTo(-20, 12);
    // Before on half the spacing: after's line 1 (x = 1) meets before's line 2.
    const fine = differenceDb([1, 3], 1, [1, 2, 3], 0.5);
    expect(fine[1]).toBeCloseTo(0, 12);
    expect(differenceDb([1, 0], 1, [1, 1], 1)[1]).toBeNull();
  });

  // Sine: peak = √2 · RMS, peak-to-peak = 2 · peak (definition of RMS).
  it('RMS, peak and peak-to-peak of a sine convert by √2 and 2', () => {
    expect(scaleFactor('rms', 'peak')).toBeCloseTo(Math.SQRT2, 12);
    expect(scaleFactor('peak', 'peak-to-peak')).toBeCloseTo(2, 12);
    expect(scaleFactor('rms', 'rms')).toBe(1);
  });
});
