import { describe, expect, it } from 'vitest';
import { analyzeSnapshot, bearingOrders, decodeSamples, type BandDefinition } from '@turnstone/dsp';
import { demoChannels } from './plant-channels.ts';
import { simulateSnapshot } from './simulated-snapshot.ts';
import {
  impactAmplitudeG,
  synthesizeCapture,
  toneAccelPeakG,
  type CaptureRecipe,
} from './synthesize-capture.ts';

/** Smallest angle between two directions, degrees (0 … 180). */
function angleGapDeg(a: number, b: number): number {
  const d = Math.abs((((a - b) % 360) + 360) % 360);
  return Math.min(d, 360 - d);
}

const base: CaptureRecipe = {
  sampleRateHz: 12_800,
  sampleCount: 8192,
  rpm: 1480,
  noiseG: 0.002,
  sensitivityMvPerG: 100,
  adc: { encoding: 'int24', bits: 24, fullScaleV: 5 },
  seed: 7,
};

function analyse(
  recipe: CaptureRecipe,
  bands: BandDefinition[] = [],
  extra: { bearing?: boolean; tach?: { pulseTimesS: number[]; pulsesPerRev: number } } = {},
) {
  const cap = synthesizeCapture(recipe);
  const bearing = {
    name: 'DE',
    rollingElements: 8,
    ballDiameterMm: 28.58,
    pitchDiameterMm: 125,
    contactAngleDeg: 0,
  };
  return analyzeSnapshot({
    samples: cap.counts,
    encoding: cap.encoding,
    sampleRateHz: cap.sampleRateHz,
    adc: cap.adc,
    sensor: { sensitivityMvPerG: recipe.sensitivityMvPerG },
    speedRpm: recipe.rpm,
    fmaxHz: recipe.sampleRateHz / 2.56,
    lines: 1600,
    ...(extra.bearing ? { machine: { bearings: [bearing] } } : {}),
    ...(extra.tach ? { tach: extra.tach } : {}),
    bands,
  });
}

describe('synthesizeCapture', () => {
  it('when asked for 4 mm/s RMS at 1×, analyzeSnapshot reads 4 mm/s in the 1× band', () => {
    // v = a/(2πf) and RMS = peak/√2 (calculus of a sinusoid, textbook): the synthesiser converts, the dsp reads back.
    const a = analyse({ ...base, tones: [{ order: 1, velocityMmS: 4 }] }, [
      { key: '1x', kind: 'order', loOrder: 0.8, hiOrder: 1.2, unit: 'mm/s', measure: 'rms' },
    ]);
    const v = a.bandValues.find((b) => b.key === '1x')!.value!;
    expect(v).toBeGreaterThan(3.9);
    expect(v).toBeLessThan(4.1);
    expect(a.overall.velocityRmsMmS).toBeCloseTo(4, 1);
  });

  it('converts velocity to peak acceleration with a = 2πf·v and peak = √2·RMS', () => {
    // 10 mm/s RMS at 100 Hz: 14.142 mm/s peak · 2π·100 = 8885.8 mm/s² = 0.90610 g (computed).
    expect(toneAccelPeakG(10, 100)).toBeCloseTo(0.9061, 4);
  });

  it('when outer-race impacts ring a 3 kHz resonance, the envelope spectrum shows BPFO at the asked level', () => {
    const bpfo = bearingOrders({
      rollingElements: 8,
      ballDiameterMm: 28.58,
      pitchDiameterMm: 125,
    }).bpfo;
    const recipe: CaptureRecipe = {
      ...base,
      noiseG: 0.01,
      impacts: [{ order: bpfo, envelopeG: 0.3, resonanceHz: 3000, jitter: 0 }],
    };
    const a = analyse(
      recipe,
      [
        {
          key: 'bpfo',
          kind: 'fault',
          fault: 'DE BPFO',
          widthPercent: 2,
          unit: 'g',
          measure: 'peak',
          source: 'envelope',
        },
      ],
      {
        bearing: true,
      },
    );
    const v = a.bandValues.find((b) => b.key === 'bpfo')!.value!;
    // The envelope line of an exponential ring train (impactAmplitudeG's formula, computed);
    // the band-pass and Hann window cost some of it: within 25 % (common practice, no source).
    expect(v).toBeGreaterThan(0.3 * 0.75);
    expect(v).toBeLessThan(0.3 * 1.25);
    expect(a.overall.kurtosis).toBeGreaterThan(3);
  });

  it('needs a larger impact for a higher envelope line, in proportion', () => {
    expect(
      impactAmplitudeG(0.4, 76, 3000, 0.05) / impactAmplitudeG(0.2, 76, 3000, 0.05),
    ).toBeCloseTo(2, 10);
  });

  it('when the input is beyond the ADC range, saturates at the rails and the capture is flagged clipped', () => {
    const cap = synthesizeCapture({
      ...base,
      adc: { encoding: 'int16', bits: 16, fullScaleV: 0.5 },
      bursts: { count: 5, peakG: 9, resonanceHz: 1500 },
    });
    expect(cap.railSamples).toBeGreaterThan(10);
    const a = analyse({
      ...base,
      adc: { encoding: 'int16', bits: 16, fullScaleV: 0.5 },
      bursts: { count: 5, peakG: 9, resonanceHz: 1500 },
    });
    expect(a.quality.findings.map((f) => f.code)).toContain('clipped');
    expect(a.quality.verdict).toBe('unusable');
  });

  it('is deterministic: the same recipe and seed give the same counts, another seed does not', () => {
    const r = { ...base, noiseG: 0.05, tones: [{ order: 1, velocityMmS: 2 }] };
    expect(synthesizeCapture(r).counts).toEqual(synthesizeCapture(r).counts);
    expect(synthesizeCapture({ ...r, seed: 8 }).counts).not.toEqual(synthesizeCapture(r).counts);
  });

  it('places order tones at their stated phase against the tach mark, whatever angle the capture starts at', () => {
    // Phase relative to a once-per-revolution mark (definition; how field balancing reads a
    // vector — common practice, no source): the shaft's start angle, the speed drift and the
    // seed change from capture to capture, the vector read by the dsp must not.
    for (let seed = 1; seed <= 6; seed++) {
      const recipe: CaptureRecipe = {
        ...base,
        seed,
        noiseG: 0.02,
        speedRamp: 0.002 * (seed - 3.5),
        tach: true,
        tones: [
          { order: 1, velocityMmS: 4, phaseLagDeg: 130 },
          { order: 2, velocityMmS: 1.5, phaseLagDeg: 355 },
        ],
      };
      const cap = synthesizeCapture(recipe);
      const a = analyse(recipe, [], { tach: cap.tach! });
      const [v1, v2] = a.shaftVectors!;
      expect(angleGapDeg(v1!.velocityPhaseDeg, 130), `seed ${seed}`).toBeLessThan(1.5);
      expect(angleGapDeg(v2!.velocityPhaseDeg, 355), `seed ${seed}`).toBeLessThan(1.5);
      // Amplitude as asked (the synthesiser's own conversion, read back): within 3 %.
      expect(v1!.velocityRmsMmS / 4).toBeCloseTo(1, 1);
    }
  });

  it('gives one tach pulse per revolution at the shaft speed', () => {
    const cap = synthesizeCapture({ ...base, tach: true });
    const p = cap.tach!.pulseTimesS;
    // 1480 r/min = 24.667 rev/s over 0.64 s: 15 or 16 pulses 40.54 ms apart (computed).
    expect(p.length).toBeGreaterThanOrEqual(15);
    expect(p[1]! - p[0]!).toBeCloseTo(60 / 1480, 4);
  });
});

describe('demo channels with their faults', () => {
  const at = new Date(Date.UTC(2026, 10, 2, 8));
  const channel = (tag: string) => demoChannels().find((c) => c.tag === tag)!;
  const analyseSim = (tag: string, progress: number, when = at) => {
    const c = channel(tag);
    const s = simulateSnapshot(c, when, progress);
    return analyzeSnapshot({
      samples: decodeSamples(new Uint8Array(s.bytes), s.encoding),
      encoding: s.encoding,
      sampleRateHz: s.sampleRateHz,
      adc: s.adc,
      sensor: { sensitivityMvPerG: s.sensitivityMvPerG },
      ...(s.speedRpm ? { speedRpm: s.speedRpm } : {}),
      ...(s.tach ? { tach: s.tach } : {}),
      nominalRpm: c.machine.nominalRpm,
      machine: { bearings: c.machine.bearings },
      fmaxHz: Math.min(c.fmaxHz, s.sampleRateHz / 2.56),
      lines: c.lines,
    });
  };

  it('F-330 is set up with too low a sample rate for its content and is flagged alias-risk', () => {
    const a = analyseSim('TRB-F330-FDE-H', 0.5);
    expect(a.quality.findings.map((f) => f.code)).toContain('alias-risk');
  });

  it('B-302 MDE-V uses only a few bits and is flagged under-range', () => {
    const a = analyseSim('MFP-B302-MDE-V', 0.5);
    expect(a.quality.findings.map((f) => f.code)).toContain('under-range');
    expect(a.quality.bitsUsed).toBeLessThan(8);
  });

  it('P-202 MDE-H clips in some captures but not all', () => {
    const verdicts = Array.from(
      { length: 20 },
      (_, i) =>
        analyseSim('MFP-P202-MDE-H', 0.5, new Date(at.getTime() + i * 3_600_000)).quality.verdict,
    );
    expect(verdicts).toContain('unusable');
    expect(verdicts).toContain('ok');
  });

  it('every channel gives its analysis a running speed (tach, rpm or estimated from 1×)', () => {
    for (const c of demoChannels()) {
      const a = analyseSim(c.tag, 0.5);
      expect(a.speed.source, c.tag).not.toBe('none');
      // Within the ±10 % search window around the nominal speed (dsp default).
      expect(Math.abs(a.speed.rpm! / c.machine.nominalRpm - 1), c.tag).toBeLessThan(0.1);
    }
  });

  it('a healthy pump channel is ok', () => {
    expect(analyseSim('MFP-P102-MDE-H', 0.5).quality.verdict).toBe('ok');
  });

  it('P-101 MDE-H: the outer-race envelope grows over the story', () => {
    const c = channel('MFP-P101-MDE-H');
    const bpfoHz = (c.bearingOrders!.bpfo * 1480) / 60;
    const line = (progress: number) => {
      const a = analyseSim('MFP-P101-MDE-H', progress);
      const env = a.spectra.envelope!;
      const k = Math.round(bpfoHz / env.dfHz);
      return Math.max(...Array.from(env.values.subarray(k - 3, k + 4)));
    };
    expect(line(1)).toBeGreaterThan(2 * line(0.2));
  });

  it('P-201 MDE-H: the 1× phase against the tach is steady from capture to capture and drifts slowly as the unbalance builds up', () => {
    // A machine's 1× phase against its once-per-revolution mark is set by where the heavy
    // spot sits, so it repeats from capture to capture (definition of phase against a
    // once-per-revolution mark; common practice, no source for the tolerance of a few degrees).
    const phase = (progress: number, when: Date) => {
      const a = analyseSim('MFP-P201-MDE-H', progress, when);
      expect(a.speed.source).toBe('tach');
      return a.shaftVectors!.find((v) => v.order === 1)!.velocityPhaseDeg;
    };
    // Twelve captures 8 hours apart late in the story: all within 8° of the first.
    const late = Array.from({ length: 12 }, (_, i) =>
      phase(0.9 + 0.003 * i, new Date(at.getTime() + i * 8 * 3_600_000)),
    );
    for (const p of late) expect(angleGapDeg(p, late[0]!)).toBeLessThan(8);
    // Over the story (a capture every two days, 42 of them): each step moves < 8°, while the
    // build-up turns the vector by more than 10° from start to end (story-recipe.ts).
    const story = Array.from({ length: 42 }, (_, i) =>
      phase(0.02 + i / 41, new Date(at.getTime() + i * 2 * 86_400_000)),
    );
    for (let i = 1; i < story.length; i++)
      expect(angleGapDeg(story[i]!, story[i - 1]!), `step ${i}`).toBeLessThan(8);
    expect(angleGapDeg(story[41]!, story[0]!)).toBeGreaterThan(10);
  });

  it('without faults, the faulty channels send clean captures', () => {
    const c = channel('MFP-B302-MDE-V');
    const s = simulateSnapshot(c, at, 0.5, { faults: false });
    expect(s.adc.bits).toBe(24);
  });
});
