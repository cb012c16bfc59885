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

/** Tones at shaft orders, each given as [order, velocity in mm/s RMS]. */
const velocityOrders = (...tones: [order: number, mmS: number][]) =>
  tones.map(([order, mmS]) => ({ order, mmS }));

/** An impact train ringing a 4 kHz resonance (ζ = 0.05) at `rateHz`. */
const impacts = (rateHz: number, extra: object = {}) => [
  { rateHz, g: 1, resonanceHz: 4000, damping: 0.05, ...extra },
];

/** Belt frequency = 1× · π · pulley diameter / belt length (definition): a 200 mm pulley, 1600 mm belt at 2960 r/min. */
const BELT_HZ = ((2960 / 60) * Math.PI * 200) / 1600;

/** Bearing lines 1 % below the kinematic frequencies (slip, Randall & Antoni 2011 §2.1). */
const BPFO = ORDERS.bpfo * F1 * 0.99;
/** See {@link BPFO}. */
const BPFI = ORDERS.bpfi * F1 * 0.99;

/**
 * Captures that make exactly the hints `codes` (none when empty), read from `direction`
 * (horizontal unless given); where given, the first hint's evidence holds a line labelled
 * `label`, its first evidence line sits at `firstHz`, and `check` asserts the rest.
 */
const HINT_CASES: {
  title: string;
  spec: CaptureSpec;
  components?: DiagnosisComponents;
  direction?: DiagnosisInput['direction'];
  codes: string[];
  label?: string;
  firstHz?: number;
  check?: (r: ReturnType<typeof run>) => void;
}[] = [
  // Common practice, no source: a sound machine shows a dominant 1× below the A/B boundary,
  // a clean gear mesh, blade pass and noise — none of it is a hint.
  {
    title: 'when a healthy machine is captured, it gives no hint',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 0.9], [2, 0.2], [6, 0.2]),
      meshes: [{ hz: 32 * F1, g: 0.3, modHz: F1, depth: 0.05 }],
      hzTones: [{ hz: 100, mmS: 0.2 }],
      noiseG: 0.02,
      seed: 1,
    },
    components: {
      bearings: [BEARING],
      gears: [{ name: 'pinion', teeth: 32 }],
      blades: 6,
      lineHz: 50,
    },
    codes: [],
    check: (r) => {
      expect(r.analysis.overall.velocityRmsMmS).toBeLessThan(SEVERITY);
      expect(r.diagnosis).toEqual([]);
      expect(r.notes.join(' ')).toMatch(/below 1\.4 mm\/s/);
    },
  },
  // v = a/(2πf) builds 4 mm/s RMS at 1×; unbalance pattern: common practice, no source.
  {
    title: 'when 1× dominates a radial reading above A/B, it names unbalance with the 1× peak',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 4], [2, 0.4], [3, 0.2]),
      noiseG: 0.005,
      seed: 2,
    },
    codes: ['unbalance'],
    check: (r) => {
      const e = evidence(r, 'unbalance', '1×')!;
      expect(e.hz).toBeCloseTo(F1, 0);
      expect(e.order).toBeCloseTo(1, 2);
      expect(Math.abs(e.amplitude / 4 - 1)).toBeLessThan(0.03);
      expect(e.spectrum).toBe('velocity');
    },
  },
  // The severity gate (ISO 20816-3 A/B boundary): the unbalance pattern at 1 mm/s says nothing.
  {
    title: 'when the unbalance pattern stays below the A/B boundary, it gives no hint',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 1.0], [2, 0.1]),
      noiseG: 0.005,
      seed: 3,
    },
    codes: [],
  },
  // Misalignment: 2× above 50 % of 1× (here 175 %), common practice, no source.
  {
    title: 'when 2× is large against 1×, it names misalignment with 1×, 2× and 3×',
    spec: {
      rpm: 2960,
      orders: velocityOrders([1, 2], [2, 3.5], [3, 0.8]),
      noiseG: 0.005,
      seed: 4,
    },
    codes: ['misalignment'],
    label: '3×',
    check: (r) => {
      const e2 = evidence(r, 'misalignment', '2×')!;
      expect(e2.hz).toBeCloseTo((2 * 2960) / 60, 0);
      expect(Math.abs(e2.amplitude / 3.5 - 1)).toBeLessThan(0.03);
    },
  },
  // High axial 1×/2×: common practice, no source. On an axial point 1× is not unbalance.
  {
    title: 'when an axial reading is high at 1× and 2×, it names misalignment and not unbalance',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 2.5], [2, 1.2]),
      noiseG: 0.005,
      seed: 5,
    },
    direction: 'A',
    codes: ['misalignment'],
    check: (r) => {
      // the same capture read as horizontal is unbalance (1× dominant, 2× < 1×, radial)
      const h = diagnose({ analysis: r.analysis, severityMmS: SEVERITY, direction: 'H' });
      expect(codes(h)).toContain('unbalance');
    },
  },
  // Looseness: long series of harmonics and half orders, common practice, no source.
  {
    title: 'when 1× carries a long series of harmonics and half orders, it names looseness',
    spec: {
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
    },
    codes: ['looseness'],
    check: (r) => {
      const labels = r.diagnosis[0]!.evidence.map((e) => e.label);
      expect(labels).toEqual(expect.arrayContaining(['1×', '3×', '10×', '1.5×', '2.5×', '3.5×']));
    },
  },
  // A mix of unbalance (1× 5 mm/s) and misalignment (2× at 70 % of 1×): both, unbalance first.
  {
    title: 'when unbalance and misalignment mix, it gives both in order of their weight',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 5], [2, 3.5]),
      noiseG: 0.005,
      seed: 7,
    },
    codes: ['unbalance', 'misalignment'],
    check: (r) => {
      expect(r.diagnosis[0]!.confidence).toBeGreaterThan(r.diagnosis[1]!.confidence);
    },
  },
  // Bearing lines 1 % below kinematic BPFO (slip, Randall & Antoni 2011 §2.1).
  {
    title:
      'when impacts repeat at BPFO, it names the outer race with envelope lines at BPFO harmonics',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 1]),
      impacts: impacts(BPFO),
      noiseG: 0.02,
      seed: 8,
    },
    components: { bearings: [BEARING] },
    codes: ['bearing-outer-race'],
    label: 'DE BPFO ×2',
    check: (r) => {
      const e = evidence(r, 'bearing-outer-race', 'DE BPFO')!;
      expect(e.spectrum).toBe('envelope');
      expect(Math.abs(e.hz / BPFO - 1)).toBeLessThan(0.005);
    },
  },
  {
    title: 'when impacts at BPFI are modulated by 1×, it names the inner race with 1× sidebands',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 1]),
      impacts: impacts(BPFI, { modHz: F1, modDepth: 0.6 }),
      noiseG: 0.02,
      seed: 9,
    },
    components: { bearings: [BEARING] },
    codes: ['bearing-inner-race'],
    check: (r) => {
      const lo = evidence(r, 'bearing-inner-race', 'DE BPFI−1×')!;
      const hi = evidence(r, 'bearing-inner-race', 'DE BPFI+1×')!;
      expect(Math.abs(lo.hz - (BPFI - F1))).toBeLessThan(0.5);
      expect(Math.abs(hi.hz - (BPFI + F1))).toBeLessThan(0.5);
    },
  },
  // A spall on a ball strikes both races once per ball turn: impacts at 2 × BSF, unequal
  // strikes put a line at BSF too (Randall & Antoni 2011 §2.1).
  {
    title: 'when impacts repeat at 2 × BSF, it names the rolling elements',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 1]),
      impacts: impacts(2 * ORDERS.bsf * F1 * 0.99, { alternate: 0.5 }),
      noiseG: 0.02,
      seed: 10,
    },
    components: { bearings: [BEARING] },
    codes: ['bearing-rolling-element'],
    label: 'DE BSF ×2',
  },
  // FTF series; BPFO = 9 · FTF sits on it and must not be named as well.
  {
    title: 'when impacts repeat at FTF, it names the cage and not the outer race it echoes',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 1]),
      impacts: impacts(ORDERS.ftf * F1 * 0.99),
      noiseG: 0.02,
      seed: 11,
    },
    components: { bearings: [BEARING] },
    codes: ['bearing-cage'],
  },
  // Blade pass = blades × 1× (definition); its share threshold: common practice, no source.
  {
    title: 'when blade pass dominates the velocity, it names blade pass at blades × 1×',
    spec: {
      rpm: RPM,
      orders: velocityOrders([1, 1], [6, 2.5]),
      noiseG: 0.005,
      seed: 14,
    },
    components: { blades: 6 },
    codes: ['blade-pass'],
    firstHz: 6 * F1,
  },
  // 2 × 50 Hz = 100 Hz; at 1180 r/min the nearest shaft harmonics are far from it.
  {
    title: 'when 2 × line frequency is resolved from the shaft harmonics, it names electrical',
    spec: {
      rpm: 1180,
      orders: velocityOrders([1, 1]),
      hzTones: [{ hz: 100, mmS: 3 }],
      noiseG: 0.005,
      seed: 15,
    },
    components: { lineHz: 50 },
    codes: ['electrical'],
    firstHz: 100,
  },
  // Belt frequency = 1× · π · pulley diameter / belt length (definition).
  {
    title: 'when lines sit at the belt frequency and its harmonic, it names the belt',
    spec: {
      rpm: 2960,
      orders: velocityOrders([1, 1]),
      hzTones: [
        { hz: BELT_HZ, mmS: 2 },
        { hz: 2 * BELT_HZ, mmS: 1.2 },
      ],
      noiseG: 0.005,
      seed: 17,
    },
    components: { belts: [{ name: 'fan', pulleyDiameterMm: 200, lengthMm: 1600 }] },
    codes: ['belt'],
    firstHz: BELT_HZ,
  },
];

describe('diagnose', () => {
  for (const c of HINT_CASES)
    it(c.title, () => {
      const r = run(c.spec, c.components, c.direction ? { direction: c.direction } : {});
      const { codes: expected, label, firstHz } = c;
      expect(codes(r)).toEqual(expected);
      if (label !== undefined) expect(evidence(r, expected[0]!, label)).toBeDefined();
      if (firstHz !== undefined) expect(r.diagnosis[0]!.evidence[0]!.hz).toBeCloseTo(firstHz, 0);
      c.check?.(r);
    });

  // Gear mesh 32 × 1× with 60 % amplitude modulation at 1× gives ±1× sidebands of 30 % (AM definition).
  it('when the mesh tone carries 1× sidebands, it names the gear mesh; a clean mesh gives nothing', () => {
    // A 32-tooth pinion's mesh tone, amplitude-modulated at 1× to `depth`.
    const mesh = (depth: number, seed: number) =>
      run(
        {
          rpm: RPM,
          orders: velocityOrders([1, 1]),
          meshes: [{ hz: 32 * F1, g: 0.5, modHz: F1, depth }],
          noiseG: 0.01,
          seed,
        },
        { gears: [{ name: 'pinion', teeth: 32 }] },
      );
    const bad = mesh(0.6, 12);
    expect(codes(bad)).toEqual(['gear-mesh']);
    const sb = evidence(bad, 'gear-mesh', 'pinion GMF+1×')!;
    const gmf = evidence(bad, 'gear-mesh', 'pinion GMF')!;
    expect(Math.abs(sb.amplitude / gmf.amplitude - 0.3)).toBeLessThan(0.03);
    const clean = mesh(0.05, 13);
    expect(clean.diagnosis).toEqual([]);
  });

  // A two-pole motor at 2990 r/min: 2× = 99.67 Hz, 0.1 line from 100 Hz at Δf 3.125 Hz.
  it('when 2 × line frequency is not resolved from 2×, it says so and does not name electrical', () => {
    const r = run(
      {
        rpm: 2990,
        orders: velocityOrders([1, 1]),
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

  it('when the speed is unknown, it says so and gives no hint', () => {
    const { input } = synthCapture({
      rpm: RPM,
      orders: velocityOrders([1, 5]),
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
