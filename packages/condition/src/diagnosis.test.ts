import { analyzeSnapshot, bearingOrders, type SnapshotAnalysis } from '@turnstone/dsp';
import { describe, expect, it } from 'vitest';
import { diagnose, type DiagnosisComponents, type DiagnosisInput } from './diagnosis.ts';
import { synthCapture, type CaptureSpec } from './diagnosis.test-support.ts';
import { isoZoneBoundaries } from './iso-zones.ts';

// Severity gate: ISO 20816-3 zone A/B boundary, group 2, rigid (values from memory, see iso-zones.ts).
const SEVERITY = isoZoneBoundaries(2, 'rigid').ab;
const RPM = 1480;
const F1 = RPM / 60;
// A 6205-size deep-groove ball bearing: 9 balls of 7.94 mm on a 39.04 mm pitch circle (from memory).
const BEARING = { name: 'DE', rollingElements: 9, ballDiameterMm: 7.94, pitchDiameterMm: 39.04 };
const ORDERS = bearingOrders(BEARING); // Randall & Antoni 2011, eqs. (1)–(4)

function run(
  spec: CaptureSpec,
  components: DiagnosisComponents = {},
  extra: Partial<DiagnosisInput> = {},
): ReturnType<typeof diagnose> & { analysis: SnapshotAnalysis } {
  const analysis = analyzeSnapshot(synthCapture(spec).input);
  return {
    analysis,
    ...diagnose({ analysis, components, severityMmS: SEVERITY, direction: 'H', ...extra }),
  };
}

const codes = (r: ReturnType<typeof diagnose>): string[] => r.diagnosis.map((h) => h.code);
const evidence = (r: ReturnType<typeof diagnose>, code: string, label: string) =>
  r.diagnosis.find((h) => h.code === code)?.evidence.find((e) => e.label === label);

/** An impact train ringing a 4 kHz resonance (ζ = 0.05) at `rateHz`. */
const impacts = (rateHz: number, extra: object = {}) => [
  { rateHz, g: 1, resonanceHz: 4000, damping: 0.05, ...extra },
];

describe('diagnose', () => {
  // Common practice, no source: a sound machine shows a dominant 1× below the A/B boundary,
  // a clean gear mesh, blade pass and noise — none of it is a hint.
  it('when a healthy machine is captured, it gives no hint', () => {
    const r = run(
      {
        rpm: RPM,
        orders: [
          { order: 1, mmS: 0.9 },
          { order: 2, mmS: 0.2 },
          { order: 6, mmS: 0.2 },
        ],
        meshes: [{ hz: 32 * F1, g: 0.3, modHz: F1, depth: 0.05 }],
        hzTones: [{ hz: 100, mmS: 0.2 }],
        noiseG: 0.02,
        seed: 1,
      },
      { bearings: [BEARING], gears: [{ name: 'pinion', teeth: 32 }], blades: 6, lineHz: 50 },
    );
    expect(r.analysis.overall.velocityRmsMmS).toBeLessThan(SEVERITY);
    expect(r.diagnosis).toEqual([]);
    expect(r.notes.join(' ')).toMatch(/below 1\.4 mm\/s/);
  });

  // v = a/(2πf) builds 4 mm/s RMS at 1×; unbalance pattern: common practice, no source.
  it('when 1× dominates a radial reading above A/B, it names unbalance with the 1× peak', () => {
    const r = run({
      rpm: RPM,
      orders: [
        { order: 1, mmS: 4 },
        { order: 2, mmS: 0.4 },
        { order: 3, mmS: 0.2 },
      ],
      noiseG: 0.005,
      seed: 2,
    });
    expect(codes(r)).toEqual(['unbalance']);
    const e = evidence(r, 'unbalance', '1×')!;
    expect(e.hz).toBeCloseTo(F1, 0);
    expect(e.order).toBeCloseTo(1, 2);
    expect(Math.abs(e.amplitude / 4 - 1)).toBeLessThan(0.03);
    expect(e.spectrum).toBe('velocity');
  });

  // The severity gate (ISO 20816-3 A/B boundary): the same pattern at 1 mm/s says nothing.
  it('when the unbalance pattern stays below the A/B boundary, it gives no hint', () => {
    const r = run({
      rpm: RPM,
      orders: [
        { order: 1, mmS: 1.0 },
        { order: 2, mmS: 0.1 },
      ],
      noiseG: 0.005,
      seed: 3,
    });
    expect(r.diagnosis).toEqual([]);
  });

  // Misalignment: 2× above 50 % of 1× (here 175 %), common practice, no source.
  it('when 2× is large against 1×, it names misalignment with 1×, 2× and 3×', () => {
    const r = run({
      rpm: 2960,
      orders: [
        { order: 1, mmS: 2 },
        { order: 2, mmS: 3.5 },
        { order: 3, mmS: 0.8 },
      ],
      noiseG: 0.005,
      seed: 4,
    });
    expect(codes(r)).toEqual(['misalignment']);
    const e2 = evidence(r, 'misalignment', '2×')!;
    expect(e2.hz).toBeCloseTo((2 * 2960) / 60, 0);
    expect(Math.abs(e2.amplitude / 3.5 - 1)).toBeLessThan(0.03);
    expect(evidence(r, 'misalignment', '3×')).toBeDefined();
  });

  // High axial 1×/2×: common practice, no source. On an axial point 1× is not unbalance.
  it('when an axial reading is high at 1× and 2×, it names misalignment and not unbalance', () => {
    const r = run(
      {
        rpm: RPM,
        orders: [
          { order: 1, mmS: 2.5 },
          { order: 2, mmS: 1.2 },
        ],
        noiseG: 0.005,
        seed: 5,
      },
      {},
      { direction: 'A' },
    );
    expect(codes(r)).toEqual(['misalignment']);
    // the same capture read as horizontal is unbalance (1× dominant, 2× < 1×, radial)
    const h = diagnose({ analysis: r.analysis, severityMmS: SEVERITY, direction: 'H' });
    expect(codes(h)).toContain('unbalance');
  });

  // Looseness: long series of harmonics and half orders, common practice, no source.
  it('when 1× carries a long series of harmonics and half orders, it names looseness', () => {
    const r = run({
      rpm: RPM,
      orders: [
        ...[1, 2, 3, 4, 5, 6, 7, 8, 9, 10].map((k) => ({
          order: k,
          mmS: k === 1 ? 3 : 0.9 / Math.sqrt(k),
        })),
        ...[1.5, 2.5, 3.5].map((k) => ({ order: k, mmS: 0.4 })),
      ],
      noiseG: 0.005,
      seed: 6,
    });
    expect(codes(r)).toEqual(['looseness']);
    const labels = r.diagnosis[0]!.evidence.map((e) => e.label);
    expect(labels).toEqual(expect.arrayContaining(['1×', '3×', '10×', '1.5×', '2.5×', '3.5×']));
  });

  // A mix of unbalance (1× 5 mm/s) and misalignment (2× at 70 % of 1×): both, unbalance first.
  it('when unbalance and misalignment mix, it gives both in order of their weight', () => {
    const r = run({
      rpm: RPM,
      orders: [
        { order: 1, mmS: 5 },
        { order: 2, mmS: 3.5 },
      ],
      noiseG: 0.005,
      seed: 7,
    });
    expect(codes(r)).toEqual(['unbalance', 'misalignment']);
    expect(r.diagnosis[0]!.confidence).toBeGreaterThan(r.diagnosis[1]!.confidence);
  });

  // Bearing lines 1 % below kinematic BPFO (slip, Randall & Antoni 2011 §2.1).
  it('when impacts repeat at BPFO, it names the outer race with envelope lines at BPFO harmonics', () => {
    const bpfo = ORDERS.bpfo * F1 * 0.99;
    const r = run(
      { rpm: RPM, orders: [{ order: 1, mmS: 1 }], impacts: impacts(bpfo), noiseG: 0.02, seed: 8 },
      { bearings: [BEARING] },
    );
    expect(codes(r)).toEqual(['bearing-outer-race']);
    const e = evidence(r, 'bearing-outer-race', 'DE BPFO')!;
    expect(e.spectrum).toBe('envelope');
    expect(Math.abs(e.hz / bpfo - 1)).toBeLessThan(0.005);
    expect(evidence(r, 'bearing-outer-race', 'DE BPFO ×2')).toBeDefined();
  });

  it('when impacts at BPFI are modulated by 1×, it names the inner race with 1× sidebands', () => {
    const bpfi = ORDERS.bpfi * F1 * 0.99;
    const r = run(
      {
        rpm: RPM,
        orders: [{ order: 1, mmS: 1 }],
        impacts: impacts(bpfi, { modHz: F1, modDepth: 0.6 }),
        noiseG: 0.02,
        seed: 9,
      },
      { bearings: [BEARING] },
    );
    expect(codes(r)).toEqual(['bearing-inner-race']);
    const lo = evidence(r, 'bearing-inner-race', 'DE BPFI−1×')!;
    const hi = evidence(r, 'bearing-inner-race', 'DE BPFI+1×')!;
    expect(Math.abs(lo.hz - (bpfi - F1))).toBeLessThan(0.5);
    expect(Math.abs(hi.hz - (bpfi + F1))).toBeLessThan(0.5);
  });

  // A spall on a ball strikes both races once per ball turn: impacts at 2 × BSF, unequal
  // strikes put a line at BSF too (Randall & Antoni 2011 §2.1).
  it('when impacts repeat at 2 × BSF, it names the rolling elements', () => {
    const r = run(
      {
        rpm: RPM,
        orders: [{ order: 1, mmS: 1 }],
        impacts: impacts(2 * ORDERS.bsf * F1 * 0.99, { alternate: 0.5 }),
        noiseG: 0.02,
        seed: 10,
      },
      { bearings: [BEARING] },
    );
    expect(codes(r)).toEqual(['bearing-rolling-element']);
    expect(evidence(r, 'bearing-rolling-element', 'DE BSF ×2')).toBeDefined();
  });

  // FTF series; BPFO = 9 · FTF sits on it and must not be named as well.
  it('when impacts repeat at FTF, it names the cage and not the outer race it echoes', () => {
    const r = run(
      {
        rpm: RPM,
        orders: [{ order: 1, mmS: 1 }],
        impacts: impacts(ORDERS.ftf * F1 * 0.99),
        noiseG: 0.02,
        seed: 11,
      },
      { bearings: [BEARING] },
    );
    expect(codes(r)).toEqual(['bearing-cage']);
  });

  // Gear mesh 32 × 1× with 60 % amplitude modulation at 1× gives ±1× sidebands of 30 % (AM definition).
  it('when the mesh tone carries 1× sidebands, it names the gear mesh; a clean mesh gives nothing', () => {
    const gears = { gears: [{ name: 'pinion', teeth: 32 }] };
    const bad = run(
      {
        rpm: RPM,
        orders: [{ order: 1, mmS: 1 }],
        meshes: [{ hz: 32 * F1, g: 0.5, modHz: F1, depth: 0.6 }],
        noiseG: 0.01,
        seed: 12,
      },
      gears,
    );
    expect(codes(bad)).toEqual(['gear-mesh']);
    const sb = evidence(bad, 'gear-mesh', 'pinion GMF+1×')!;
    const gmf = evidence(bad, 'gear-mesh', 'pinion GMF')!;
    expect(Math.abs(sb.amplitude / gmf.amplitude - 0.3)).toBeLessThan(0.03);
    const clean = run(
      {
        rpm: RPM,
        orders: [{ order: 1, mmS: 1 }],
        meshes: [{ hz: 32 * F1, g: 0.5, modHz: F1, depth: 0.05 }],
        noiseG: 0.01,
        seed: 13,
      },
      gears,
    );
    expect(clean.diagnosis).toEqual([]);
  });

  it('when blade pass dominates the velocity, it names blade pass at blades × 1×', () => {
    const r = run(
      {
        rpm: RPM,
        orders: [
          { order: 1, mmS: 1 },
          { order: 6, mmS: 2.5 },
        ],
        noiseG: 0.005,
        seed: 14,
      },
      { blades: 6 },
    );
    expect(codes(r)).toEqual(['blade-pass']);
    expect(r.diagnosis[0]!.evidence[0]!.hz).toBeCloseTo(6 * F1, 0);
  });

  // 2 × 50 Hz = 100 Hz; at 1180 r/min the nearest shaft harmonics are far from it.
  it('when 2 × line frequency is resolved from the shaft harmonics, it names electrical', () => {
    const r = run(
      {
        rpm: 1180,
        orders: [{ order: 1, mmS: 1 }],
        hzTones: [{ hz: 100, mmS: 3 }],
        noiseG: 0.005,
        seed: 15,
      },
      { lineHz: 50 },
    );
    expect(codes(r)).toEqual(['electrical']);
    expect(r.diagnosis[0]!.evidence[0]!.hz).toBeCloseTo(100, 0);
  });

  // A two-pole motor at 2990 r/min: 2× = 99.67 Hz, 0.1 line from 100 Hz at Δf 3.125 Hz.
  it('when 2 × line frequency is not resolved from 2×, it says so and does not name electrical', () => {
    const r = run(
      {
        rpm: 2990,
        orders: [{ order: 1, mmS: 1 }],
        hzTones: [{ hz: 100, mmS: 3 }],
        noiseG: 0.005,
        seed: 16,
      },
      { lineHz: 50 },
    );
    expect(codes(r)).not.toContain('electrical');
    expect(r.notes.join(' ')).toMatch(/not resolved.*2×/);
    expect(r.diagnosis[0]?.summary ?? '').toMatch(/cannot be told from 2 × line frequency/);
  });

  // Belt frequency = 1× · π · pulley diameter / belt length (definition).
  it('when lines sit at the belt frequency and its harmonic, it names the belt', () => {
    const fb = ((2960 / 60) * Math.PI * 200) / 1600;
    const r = run(
      {
        rpm: 2960,
        orders: [{ order: 1, mmS: 1 }],
        hzTones: [
          { hz: fb, mmS: 2 },
          { hz: 2 * fb, mmS: 1.2 },
        ],
        noiseG: 0.005,
        seed: 17,
      },
      { belts: [{ name: 'fan', pulleyDiameterMm: 200, lengthMm: 1600 }] },
    );
    expect(codes(r)).toEqual(['belt']);
    expect(r.diagnosis[0]!.evidence[0]!.hz).toBeCloseTo(fb, 0);
  });

  it('when the speed is unknown, it says so and gives no hint', () => {
    const { input } = synthCapture({
      rpm: RPM,
      orders: [{ order: 1, mmS: 5 }],
      noiseG: 0.005,
      seed: 18,
    });
    delete input.speedRpm;
    const r = diagnose({ analysis: analyzeSnapshot(input), severityMmS: SEVERITY });
    expect(r.diagnosis).toEqual([]);
    expect(r.notes[0]).toMatch(/No running speed/);
    expect(() => diagnose({ analysis: analyzeSnapshot(input), severityMmS: 0 })).toThrow(
      /severityMmS/,
    );
  });
});
