// Command-line analyzer: npm run analyze -- <file.wav|file.csv> [options]
// Reads a WAV or CSV recording, runs analyzeSnapshot and prints a summary or JSON.
// Bad files and bad arguments: one line on stderr, exit code 2.
import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import { parseArgs } from 'node:util';
import {
  analyzeSnapshot,
  CSV_DEFAULT_BITS,
  CSV_DEFAULT_FULL_SCALE_V,
  parseWindowName,
  readCsv,
  wavCapture,
  type SnapshotAnalysis,
  type SnapshotInput,
} from '../src/index.ts';
import {
  DIAGNOSIS_OPTIONS,
  DIAGNOSIS_USAGE,
  formatDiagnosis,
  machineOf,
  parseDiagnosisFlags,
  runDiagnosis,
} from './diagnosis-options.ts';

const USAGE = `usage: npm run analyze -- <file.wav|file.csv> [--rpm N] [--sensitivity MV_PER_G] [--bits N]
       [--full-scale VOLTS] [--fmax HZ] [--lines N] [--window hann|flattop|hamming|rect]
       [--rate HZ] [--unit g|volts] [--json]
${DIAGNOSIS_USAGE}
WAV: --full-scale is the volts at the container's full scale (PCM) and at 1.0 (float), default 1;
     --bits defaults to the file's valid bits (24 for float). Uploads read WAV the same way.
CSV: values in g (or volts with --unit volts); --bits and --full-scale default to 24 and 10.`;

class UsageError extends Error {}

function number(value: string | undefined, flag: string, integer = false): number | undefined {
  if (value === undefined) return undefined;
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n) || n <= 0 || (integer && !Number.isInteger(n))) {
    throw new UsageError(
      `--${flag} needs a positive ${integer ? 'whole ' : ''}number, got "${value}"`,
    );
  }
  return n;
}

function buildInput(
  file: string,
  bytes: Uint8Array,
  flags: Record<string, string | boolean | undefined>,
): SnapshotInput {
  const sensitivityMvPerG = number(flags.sensitivity as string | undefined, 'sensitivity') ?? 100; // common practice
  const fullScaleFlag = number(flags['full-scale'] as string | undefined, 'full-scale');
  const bitsFlag = number(flags.bits as string | undefined, 'bits', true);
  const rpm = number(flags.rpm as string | undefined, 'rpm');
  const fmaxHz = number(flags.fmax as string | undefined, 'fmax');
  const lines = number(flags.lines as string | undefined, 'lines', true);
  const window = flags.window === undefined ? undefined : parseWindowName(String(flags.window));
  const common = {
    sensor: { sensitivityMvPerG },
    ...(rpm === undefined ? {} : { speedRpm: rpm }),
    ...(fmaxHz === undefined ? {} : { fmaxHz }),
    ...(lines === undefined ? {} : { lines }),
    ...(window === undefined ? {} : { window }),
  };
  const isRiff = bytes.length >= 4 && String.fromCharCode(...bytes.subarray(0, 4)) === 'RIFF';
  if (isRiff || /\.wav$/i.test(file)) {
    // The same reading as uploads: full scale of the container, float 1.0 = full scale.
    const wav = wavCapture(bytes, {
      ...(fullScaleFlag === undefined ? {} : { fullScaleV: fullScaleFlag }),
      ...(bitsFlag === undefined ? {} : { bits: bitsFlag }),
    });
    return {
      samples: wav.samples,
      encoding: wav.encoding,
      sampleRateHz: wav.sampleRateHz,
      adc: wav.adc,
      ...common,
    };
  }
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new Error('not a WAV or CSV file (binary content)');
  }
  const csv = readCsv(text);
  const rate = number(flags.rate as string | undefined, 'rate') ?? csv.sampleRateHz;
  if (rate === null || rate === undefined) {
    throw new UsageError('the CSV has no time column: give the sample rate with --rate HZ');
  }
  const unit = (flags.unit as string | undefined) ?? 'g';
  if (unit !== 'g' && unit !== 'volts')
    throw new UsageError(`--unit must be g or volts, got "${unit}"`);
  // Values in g become volts at the sensor's sensitivity; the analysis treats float samples as volts.
  const perValue = unit === 'g' ? sensitivityMvPerG / 1000 : 1;
  const samples = Float64Array.from(csv.values, (v) => v * perValue);
  return {
    samples,
    encoding: 'float32',
    sampleRateHz: rate,
    adc: {
      bits: bitsFlag ?? CSV_DEFAULT_BITS,
      fullScaleV: fullScaleFlag ?? CSV_DEFAULT_FULL_SCALE_V,
    },
    ...common,
  };
}

/** The --json document (the analysis' shape, with a few more fields). */
export function toJson(result: SnapshotAnalysis): unknown {
  const a = result.spectra.acceleration;
  return {
    sampleRateHz: result.sampleRateHz,
    samples: result.sampleCount,
    durationS: result.durationS,
    quality: {
      verdict: result.quality.verdict,
      bitsUsed: result.quality.bitsUsed,
      snrDb: result.quality.snrDb,
      findings: result.quality.findings.map((f) => ({
        code: f.code,
        severity: f.severity,
        message: f.message,
        value: f.value,
      })),
    },
    overall: {
      accelRmsG: result.overall.accelRmsG,
      accelPeakG: result.overall.accelPeakG,
      velocityRmsMmS: result.overall.velocityRmsMmS,
      displacementPkPkUm: result.overall.displacementPkPkUm,
      crestFactor: result.overall.crestFactor,
      kurtosis: result.overall.kurtosis,
      accelBandHz: result.overall.accelBandHz,
      isoBandHz: result.overall.isoBandHz,
    },
    speed: result.speed,
    spectrum: {
      unit: 'g',
      scale: 'rms',
      window: a.window,
      dfHz: a.dfHz,
      lines: a.values.length - 1,
      fmaxHz: result.fmaxHz,
      averages: a.averages,
      peaks: result.peaks,
    },
  };
}

function fmt(v: number | null, digits = 4): string {
  return v === null ? '—' : Number(v.toPrecision(digits)).toString();
}

function summary(file: string, r: SnapshotAnalysis): string {
  const o = r.overall;
  const out = [
    `${basename(file)}: ${r.sampleCount} samples at ${fmt(r.sampleRateHz, 6)} Hz (${fmt(r.durationS)} s)`,
    `quality: ${r.quality.verdict} — ${fmt(r.quality.bitsUsed, 3)} bits used, ideal SNR ${fmt(r.quality.snrDb, 4)} dB`,
    ...r.quality.findings.map((f) => `  [${f.severity}] ${f.code}: ${f.message}`),
    `overall: ${fmt(o.accelRmsG)} g RMS, ${fmt(o.accelPeakG)} g peak, crest factor ${fmt(o.crestFactor, 3)}, kurtosis ${fmt(o.kurtosis, 3)} (${fmt(o.accelBandHz[0])}–${fmt(o.accelBandHz[1], 6)} Hz)`,
    `         ${fmt(o.velocityRmsMmS)} mm/s RMS, ${fmt(o.displacementPkPkUm)} µm pk-pk (${o.isoBandHz[0]}–${fmt(o.isoBandHz[1])} Hz)`,
    `speed: ${r.speed.rpm === null ? 'unknown' : `${fmt(r.speed.rpm, 5)} r/min (${r.speed.source})`}`,
    `spectrum: ${r.spectra.acceleration.values.length - 1} lines to ${fmt(r.fmaxHz, 5)} Hz, Δf ${fmt(r.spectra.acceleration.dfHz)} Hz, ${r.spectra.acceleration.window}, ${r.spectra.acceleration.averages} averages`,
    '  peak        Hz      order     g RMS',
    ...r.peaks.map(
      (p, i) =>
        `  ${String(i + 1).padStart(4)}  ${p.hz.toFixed(2).padStart(10)}  ${(p.order === null ? '—' : p.order.toFixed(3)).padStart(9)}  ${p.amplitude.toExponential(3).padStart(10)}`,
    ),
  ];
  return out.join('\n');
}

function main(argv: string[]): number {
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      options: {
        rpm: { type: 'string' },
        sensitivity: { type: 'string' },
        bits: { type: 'string' },
        'full-scale': { type: 'string' },
        fmax: { type: 'string' },
        lines: { type: 'string' },
        window: { type: 'string' },
        rate: { type: 'string' },
        unit: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
        ...DIAGNOSIS_OPTIONS,
      },
    });
  } catch (error) {
    process.stderr.write(`analyze: ${(error as Error).message}\n${USAGE}\n`);
    return 2;
  }
  if (parsed.values.help) {
    process.stdout.write(`${USAGE}\n`);
    return 0;
  }
  const [file, ...rest] = parsed.positionals;
  if (!file || rest.length > 0) {
    process.stderr.write(`analyze: give exactly one file\n${USAGE}\n`);
    return 2;
  }
  let bytes: Uint8Array;
  try {
    bytes = new Uint8Array(readFileSync(file));
  } catch (error) {
    process.stderr.write(
      `analyze: ${file}: ${(error as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : (error as Error).message}\n`,
    );
    return 2;
  }
  try {
    const diagnosis = parseDiagnosisFlags(parsed.values);
    const input = buildInput(file, bytes, parsed.values as Record<string, string | boolean>);
    const result = analyzeSnapshot({ ...input, machine: machineOf(diagnosis) });
    const hints = runDiagnosis(diagnosis, result);
    process.stdout.write(
      parsed.values.json
        ? `${JSON.stringify({ ...(toJson(result) as object), diagnosis: hints.diagnosis, diagnosisNotes: hints.notes }, null, 2)}\n`
        : `${[summary(file, result), ...formatDiagnosis(hints)].join('\n')}\n`,
    );
    return 0;
  } catch (error) {
    const message = (error as Error).message.replace(/\s+/g, ' ');
    process.stderr.write(`analyze: ${file}: ${message}\n`);
    return 2;
  }
}

process.exitCode = main(process.argv.slice(2));
