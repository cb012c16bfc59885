// The command-line analyzer, run for real on files written to a temporary folder.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { writeWav } from '@turnstone/dsp';

const root = resolve(fileURLToPath(new URL('.', import.meta.url)), '../..');
const tsx = join(root, 'node_modules', '.bin', 'tsx');
const dir = mkdtempSync(join(tmpdir(), 'turnstone-analyze-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function analyze(...args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(tsx, [join(root, 'packages/dsp/bin/analyze.ts'), ...args], {
    encoding: 'utf8',
    cwd: root,
  });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

function file(name: string, content: Uint8Array | string): string {
  const path = join(dir, name);
  writeFileSync(path, content);
  return path;
}

// Each case starts tsx (a second or more on a busy machine), hence the generous timeout.
describe('npm run analyze', { timeout: 60_000 }, () => {
  // Calculus of a sinusoid (v = a/2πf, d = a/(2πf)², RMS = peak/√2), g₀ = 9.80665 m/s²:
  // 1 g peak at 100 Hz → 0.7071 g RMS, 15.6078 mm/s peak (11.04 RMS), 49.681 µm pk-pk.
  // Defaults: 100 mV/g, 1.0 V full scale, so 0.1 × 2^15 counts of a 16-bit WAV is 1 g.
  it('when a 16-bit WAV of a 1 g 100 Hz tone is analysed with --json, the documented shape and values come out', () => {
    const x = Array.from({ length: 65536 }, (_, i) =>
      Math.round(3276.8 * Math.sin((2 * Math.PI * 100 * i) / 25600)),
    );
    const r = analyze(file('tone.wav', writeWav(x, 25600, 'int16')), '--json', '--rpm', '1500');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(Object.keys(j)).toEqual(
      expect.arrayContaining([
        'sampleRateHz',
        'samples',
        'quality',
        'overall',
        'speed',
        'spectrum',
      ]),
    );
    expect(j.sampleRateHz).toBe(25600);
    expect(j.samples).toBe(65536);
    expect(j.quality.verdict).toBe('ok');
    expect(j.quality.bitsUsed).toBeCloseTo(Math.log2(6553), 1);
    expect(j.overall.accelRmsG).toBeCloseTo(0.7071, 3);
    expect(j.overall.velocityRmsMmS).toBeCloseTo(11.04, 1);
    expect(j.overall.displacementPkPkUm).toBeCloseTo(49.68, 0);
    // each overall value comes with its band: acceleration high-passed at the ISO band's
    // lower edge up to Fmax (fs / 2.56), velocity and displacement over the ISO band
    expect(j.overall.accelBandHz).toEqual([10, 10000]);
    expect(j.overall.isoBandHz).toEqual([10, 1000]);
    expect(j.speed).toEqual({ rpm: 1500, hz: 25, source: 'rpm' });
    expect(j.spectrum).toMatchObject({ unit: 'g', window: 'hann', dfHz: 3.125 });
    expect(j.spectrum.peaks).toHaveLength(10);
    expect(j.spectrum.peaks[0].hz).toBeCloseTo(100, 2);
    expect(j.spectrum.peaks[0].order).toBeCloseTo(4, 3);
    expect(j.spectrum.peaks[0].amplitude).toBeCloseTo(0.7071, 3);
  });

  it('when a CSV in g with a time column is analysed, the rate comes from the time column', () => {
    const rows = ['t,g'];
    for (let i = 0; i < 8192; i++)
      rows.push(`${i / 5120},${0.5 * Math.sin((2 * Math.PI * 60 * i) / 5120)}`);
    const r = analyze(
      file('tone.csv', rows.join('\n')),
      '--json',
      '--window',
      'flattop',
      '--lines',
      '800',
    );
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.sampleRateHz).toBeCloseTo(5120, 6);
    expect(j.spectrum.window).toBe('flattop');
    expect(j.spectrum.lines).toBe(800);
    expect(j.overall.accelPeakG).toBeCloseTo(0.5, 3);
    expect(j.spectrum.peaks[0].amplitude).toBeCloseTo(0.5 / Math.SQRT2, 3);
  });

  it('when no option asks for JSON, a readable summary is printed', () => {
    const x = Array.from({ length: 4096 }, (_, i) => Math.round(1000 * Math.sin(i / 7)));
    const r = analyze(file('plain.wav', writeWav(x, 8192, 'int16')));
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/quality: /);
    expect(r.stdout).toMatch(/mm\/s RMS/);
  });

  it.each([
    [
      'not a WAV or CSV',
      'junk.wav',
      new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13]),
      /not a WAV file/,
    ],
    [
      'truncated',
      'cut.wav',
      writeWav(new Array(1000).fill(5), 8000, 'int16').subarray(0, 500),
      /claims 2000 bytes/,
    ],
    ['empty', 'empty.csv', '', /empty CSV/],
    ['NaN', 'nan.csv', '1\n2\nNaN\n', /line 3/],
    ['binary', 'blob.dat', new Uint8Array([0xff, 0xfe, 0x00, 0x81, 0xc3]), /binary/],
    ['missing rate', 'norate.csv', '1\n2\n3\n', /--rate/],
  ])(
    'when the file is %s, one line goes to stderr and the exit code is 2',
    (_what, name, content, message) => {
      const r = analyze(file(name, content));
      expect(r.status).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(message);
    },
  );

  // v = a/(2πf): 4 mm/s RMS at 1× (24.667 Hz) is 0.0894 g peak; 1× dominant above the
  // ISO 20816-3 A/B boundary is the unbalance pattern (common practice, no source).
  it('when --rpm and components are given, the JSON has a diagnosis with evidence and the summary lists it', () => {
    const f = 1480 / 60;
    const g = (mmS: number, hz: number) => (Math.SQRT2 * mmS * 1e-3 * 2 * Math.PI * hz) / 9.80665;
    const rows = Array.from({ length: 65536 }, (_, i) =>
      (
        g(4, f) * Math.cos((2 * Math.PI * f * i) / 25600) +
        g(0.4, 2 * f) * Math.cos((4 * Math.PI * f * i) / 25600)
      ).toFixed(7),
    );
    const csv = file('unbalance.csv', `accel_g\n${rows.join('\n')}\n`);
    const flags = [
      '--rate',
      '25600',
      '--rpm',
      '1480',
      '--bearing',
      '9,7.94,39.04,0',
      '--line-hz',
      '50',
    ];
    const j = JSON.parse(analyze(csv, '--json', ...flags).stdout);
    expect(j.diagnosis.map((h: { code: string }) => h.code)).toEqual(['unbalance']);
    const e = j.diagnosis[0].evidence[0];
    expect(e.label).toBe('1×');
    expect(Math.abs(e.amplitude / 4 - 1)).toBeLessThan(0.03);
    expect(Object.keys(j.diagnosis[0]).sort()).toEqual([
      'code',
      'confidence',
      'evidence',
      'summary',
    ]);
    const text = analyze(csv, ...flags).stdout;
    expect(text).toMatch(/unbalance \(confidence/);
    expect(text).toMatch(/1×\s+24\.\d+ Hz/);
    const bad = analyze(csv, ...flags, '--iso-group', '3');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--iso-group must be 1 or 2/);
  });

  it('when the file does not exist or a flag is bad, the exit code is 2', () => {
    expect(analyze(join(dir, 'absent.wav')).status).toBe(2);
    const wav = file(
      'ok.wav',
      writeWav(
        new Array(1024).fill(0).map((_, i) => i % 50),
        8000,
        'int16',
      ),
    );
    const bad = analyze(wav, '--window', 'kaiser');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/unknown window/);
    expect(analyze(wav, '--bits', 'x').status).toBe(2);
  });
});
