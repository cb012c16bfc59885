/**
 * Diagnosis hints against a library of generated captures (sums of tones at shaft orders,
 * damped-sine impact trains, amplitude-modulated gear mesh, Gaussian noise — built from
 * definitions, see diagnosis.test-support.ts), each run through the real analyzeSnapshot
 * and diagnose. Prints, per pattern, how many were named right, missed or wrongly named, and
 * the confusion table (pattern × codes named). Targets: ≥ 90 % of fault captures named right,
 * ≤ 5 % of healthy captures with any hint. Exit code 1 when a target is missed.
 */
import { analyzeSnapshot, bearingOrders, type BearingGeometry } from '@turnstone/dsp';
import {
  diagnose,
  isoZoneBoundaries,
  type DiagnosisCode,
  type DiagnosisComponents,
} from '@turnstone/condition';
import {
  synthCapture,
  type CaptureSpec,
  type OrderToneSpec,
} from '@turnstone/condition/diagnosis.test-support';
import { lcg32 } from '@turnstone/dsp/seeded-random';
import { diagnosisCodeSchema } from '@turnstone/contracts/points';

const PER_PATTERN = Number(process.env.DIAGNOSIS_BENCH_PER_PATTERN ?? 10);
const HEALTHY = 2 * PER_PATTERN;
const SEVERITY = isoZoneBoundaries(2, 'rigid').ab; // ISO 20816-3 A/B, group 2 rigid (from memory)
const FS = 25600;
const N = 65536;
const DF = FS / 8192; // Welch line spacing at the default 3200 lines to Fs/2.56

// Two ball bearings (n, d, D) sized like 6205 and 6309 (from memory).
const BEARINGS: BearingGeometry[] = [
  { name: 'DE', rollingElements: 9, ballDiameterMm: 7.94, pitchDiameterMm: 39.04 },
  { name: 'DE', rollingElements: 8, ballDiameterMm: 17.46, pitchDiameterMm: 72.39 },
];

const rand = lcg32(20261202);
const between = (lo: number, hi: number): number => lo + (hi - lo) * rand();
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)]!;

type Pattern = 'healthy' | DiagnosisCode;
const PATTERNS: Pattern[] = ['healthy', ...diagnosisCodeSchema.options];

interface Case {
  spec: CaptureSpec;
  components: DiagnosisComponents;
  direction: 'H' | 'V' | 'A';
}

/** 2 × line frequency resolved from the shaft harmonics up to 4× at this speed. */
function resolved(rpm: number, lineHz: number): boolean {
  const f1 = rpm / 60;
  return [1, 2, 3, 4].every((k) => Math.abs(2 * lineHz - k * f1) >= 6 * DF);
}

function makeCase(pattern: Pattern): Case {
  const lineHz = pick([50, 60]);
  let rpm = between(900, 3600);
  if (pattern === 'electrical') while (!resolved(rpm, lineHz)) rpm = between(900, 3600);
  const f1 = rpm / 60;
  const bearing = pick(BEARINGS);
  const o = bearingOrders(bearing);
  const teeth = Math.floor(between(20, 46));
  const blades = Math.floor(between(4, 10));
  const belt = {
    name: 'drive',
    pulleyDiameterMm: between(150, 300),
    lengthMm: between(1200, 2500),
  };
  const components: DiagnosisComponents = {
    bearings: [bearing],
    gears: [{ name: 'gear', teeth }],
    blades,
    belts: [belt],
    lineHz,
  };
  const noiseG = between(0.005, 0.03);
  // Healthy background on every capture: 1×, a little 2×, blade pass, a clean mesh.
  const base1 = between(0.3, 1.0);
  const orders: OrderToneSpec[] = [
    { order: 1, mmS: base1 },
    { order: 2, mmS: between(0.05, 0.25) },
    { order: blades, mmS: between(0.05, 0.2) },
  ];
  const spec: CaptureSpec = {
    rpm,
    fs: FS,
    n: N,
    orders,
    meshes: [{ hz: teeth * f1, g: between(0.05, 0.3), modHz: f1, depth: between(0, 0.04) }],
    noiseG,
    seed: Math.floor(rand() * 2 ** 31),
  };
  let direction: Case['direction'] = pick(['H', 'V'] as const);
  const impacts = (rateHz: number, extra: object = {}) => [
    {
      rateHz: rateHz * (1 - between(0.005, 0.02)),
      g: between(0.4, 2),
      resonanceHz: between(3000, 6000),
      damping: between(0.03, 0.08),
      ...extra,
    },
  ];
  switch (pattern) {
    case 'healthy':
      break;
    case 'unbalance': {
      const a1 = between(2, 8);
      orders[0] = { order: 1, mmS: a1 };
      orders[1] = { order: 2, mmS: a1 * between(0.05, 0.3) };
      orders.push({ order: 3, mmS: a1 * between(0.02, 0.1) });
      break;
    }
    case 'misalignment': {
      const a1 = between(1.5, 4);
      if (rand() < 0.3) {
        direction = 'A';
        orders[0] = { order: 1, mmS: a1 };
        orders[1] = { order: 2, mmS: a1 * between(0.5, 1.5) };
      } else {
        const a2 = a1 * between(1, 2.5);
        orders[0] = { order: 1, mmS: a1 };
        orders[1] = { order: 2, mmS: a2 };
        orders.push({ order: 3, mmS: a2 * between(0.1, 0.4) });
      }
      break;
    }
    case 'looseness': {
      const a1 = between(2, 5);
      orders[0] = { order: 1, mmS: a1 };
      const r = between(0.2, 0.45);
      for (let k = 2; k <= 10; k++) {
        if (k === blades) continue;
        orders.push({ order: k, mmS: (a1 * r) / Math.sqrt(k) });
      }
      for (const h of [0.5, 1.5, 2.5, 3.5]) {
        orders.push({ order: h, mmS: a1 * between(0.08, 0.2) });
      }
      break;
    }
    case 'bearing-outer-race':
      spec.impacts = impacts(o.bpfo * f1);
      break;
    case 'bearing-inner-race':
      spec.impacts = impacts(o.bpfi * f1, { modHz: f1, modDepth: between(0.3, 0.8) });
      break;
    case 'bearing-rolling-element':
      spec.impacts = impacts(2 * o.bsf * f1, { alternate: between(0.3, 0.7) });
      break;
    case 'bearing-cage':
      spec.impacts = impacts(o.ftf * f1);
      break;
    case 'gear-mesh':
      spec.meshes = [{ hz: teeth * f1, g: between(0.2, 1), modHz: f1, depth: between(0.3, 0.8) }];
      break;
    case 'blade-pass':
      orders[2] = { order: blades, mmS: between(1.5, 4) };
      break;
    case 'electrical':
      spec.hzTones = [{ hz: 2 * lineHz, mmS: between(2, 5) }];
      break;
    case 'belt': {
      const fb = (f1 * Math.PI * belt.pulleyDiameterMm) / belt.lengthMm;
      const a = between(1.5, 3);
      spec.hzTones = [
        { hz: fb, mmS: a },
        { hz: 2 * fb, mmS: a * between(0.5, 0.8) },
      ];
      break;
    }
  }
  return { spec, components, direction };
}

interface Row {
  n: number;
  right: number;
  missed: number;
  wrong: number;
  named: Map<string, number>;
}

const rows = new Map<Pattern, Row>();
const started = performance.now();
for (const pattern of PATTERNS) {
  const row: Row = { n: 0, right: 0, missed: 0, wrong: 0, named: new Map() };
  rows.set(pattern, row);
  const count = pattern === 'healthy' ? HEALTHY : PER_PATTERN;
  for (let i = 0; i < count; i++) {
    const c = makeCase(pattern);
    const analysis = analyzeSnapshot(synthCapture(c.spec).input);
    const codes = diagnose({
      analysis,
      components: c.components,
      direction: c.direction,
      severityMmS: SEVERITY,
    }).diagnosis.map((h) => h.code);
    row.n++;
    for (const code of codes) row.named.set(code, (row.named.get(code) ?? 0) + 1);
    const others = codes.filter((code) => code !== pattern);
    if (pattern !== 'healthy') {
      if (codes.includes(pattern)) row.right++;
      else row.missed++;
    }
    if (others.length > 0) row.wrong++;
  }
}
const seconds = (performance.now() - started) / 1000;

const codeCols: DiagnosisCode[] = PATTERNS.filter((p): p is DiagnosisCode => p !== 'healthy');
const short = (c: string): string =>
  c
    .replace('bearing-', 'b-')
    .replace('rolling-element', 'ball')
    .replace('outer-race', 'outer')
    .replace('inner-race', 'inner')
    .replace('misalignment', 'misalign')
    .replace('electrical', 'elec')
    .slice(0, 9);
console.log(
  `diagnosis bench: ${[...rows.values()].reduce((s, r) => s + r.n, 0)} captures (${N} samples at ${FS} Hz, 900–3600 r/min, noise 0.005–0.03 g), severity ${SEVERITY} mm/s, ${seconds.toFixed(1)} s`,
);
console.log(
  `${'pattern'.padEnd(24)} ${'n'.padStart(3)} ${'right'.padStart(5)} ${'missed'.padStart(6)} ${'wrong'.padStart(5)} | ${codeCols.map((c) => short(c).padStart(9)).join('')}`,
);
for (const [pattern, r] of rows) {
  console.log(
    `${pattern.padEnd(24)} ${String(r.n).padStart(3)} ${(pattern === 'healthy' ? '—' : String(r.right)).padStart(5)} ${(pattern === 'healthy' ? '—' : String(r.missed)).padStart(6)} ${String(r.wrong).padStart(5)} | ${codeCols.map((c) => String(r.named.get(c) ?? 0).padStart(9)).join('')}`,
  );
}
let faults = 0;
let right = 0;
let wrongFaults = 0;
for (const [pattern, r] of rows) {
  if (pattern === 'healthy') continue;
  faults += r.n;
  right += r.right;
  wrongFaults += r.wrong;
}
const healthy = rows.get('healthy')!;
const rightPct = (100 * right) / faults;
const healthyWrongPct = (100 * healthy.wrong) / healthy.n;
console.log(
  `named right ${right}/${faults} = ${rightPct.toFixed(1)} % (target ≥ 90 %); fault captures with another code too ${wrongFaults}/${faults}; healthy captures with a hint ${healthy.wrong}/${healthy.n} = ${healthyWrongPct.toFixed(1)} % (target ≤ 5 %)`,
);
console.log(
  'electrical captures are drawn at speeds where 2 × line frequency is ≥ 6 lines from 1×…4× (the analysis says "not resolved" otherwise).',
);
if (rightPct < 90 || healthyWrongPct > 5) process.exitCode = 1;
