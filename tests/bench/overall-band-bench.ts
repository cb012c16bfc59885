// Overall velocity over the ideal ISO band, tone by tone: each tone is built from its
// definition (a sine of 0.05 g peak) and its expected velocity is v = a/(2πf) (RMS = peak/√2)
// when the tone lies inside the band, 0 outside. Prints what analyzeSnapshot reads as a
// percentage of the tone's own velocity RMS, for three capture set-ups (npm run bench).
import { analyzeSnapshot } from '@turnstone/dsp';

const G = 9806.65; // mm/s² per g (standard gravity, ISO 80000-3)
const AMP_G = 0.05;
const FREQS = [
  2, 2.5, 3, 4, 5, 6, 7, 8, 9, 9.5, 10.5, 11, 12, 15, 20, 50, 100, 500, 900, 990, 998, 1002, 1010,
];

interface Setup {
  name: string;
  fs: number;
  n: number;
  lines: number;
  rpm: number;
}
const SETUPS: Setup[] = [
  {
    name: '25.6 kHz × 65536 (2.56 s), 3200 lines, 1480 r/min',
    fs: 25600,
    n: 65536,
    lines: 3200,
    rpm: 1480,
  },
  {
    name: '2.56 kHz × 8192 (3.2 s), 1600 lines, 300 r/min',
    fs: 2560,
    n: 8192,
    lines: 1600,
    rpm: 300,
  },
  {
    name: '12.8 kHz × 8192 (0.64 s), 1600 lines, 1480 r/min',
    fs: 12800,
    n: 8192,
    lines: 1600,
    rpm: 1480,
  },
];

function toneCounts(f: number, fs: number, n: number): Int32Array {
  const countsPerG = 0.1 * 2 ** 23; // 100 mV/g into a 24-bit, ±1 V converter
  return Int32Array.from({ length: n }, (_, i) =>
    Math.round(AMP_G * countsPerG * Math.sin((2 * Math.PI * f * i) / fs + 0.3)),
  );
}

for (const s of SETUPS) {
  const rows: string[] = [];
  let band: [number, number] | null = null;
  for (const f of FREQS) {
    if (f >= s.fs / 2.56) continue;
    const r = analyzeSnapshot({
      samples: toneCounts(f, s.fs, s.n),
      encoding: 'int32',
      sampleRateHz: s.fs,
      adc: { bits: 24, fullScaleV: 1 },
      sensor: { sensitivityMvPerG: 100 },
      speedRpm: s.rpm,
      lines: s.lines,
    });
    band = r.overall.isoBandHz;
    const exact = (AMP_G * G) / (2 * Math.PI * f) / Math.SQRT2;
    const inside = f >= band[0] && f <= band[1];
    const pct = (100 * r.overall.velocityRmsMmS) / exact;
    const verdict = inside
      ? `error ${(pct - 100).toFixed(2).padStart(7)} %`
      : `counts ${pct.toFixed(2).padStart(6)} %`;
    rows.push(
      `${String(f).padStart(6)} Hz  ${inside ? 'inside ' : 'outside'}  expected ${(inside ? exact : 0).toFixed(3).padStart(8)}  read ${r.overall.velocityRmsMmS.toFixed(3).padStart(8)} mm/s  ${verdict}`,
    );
  }
  console.log(`\n${s.name}; ISO band ${band?.[0]}–${band?.[1]} Hz (0.05 g peak tones)`);
  for (const row of rows) console.log(row);
}
