import Papa from 'papaparse';

/** A waveform read from CSV text. */
/**
 * A CSV carries no ADC facts; unless told, every path that reads one (uploads, the
 * analyzer CLI) takes it as from a 24-bit, ±10 V front end (common practice for portable
 * data collectors, no source). These only matter to the quality checks: the values are volts.
 */
export const CSV_DEFAULT_BITS = 24;
/** Volts at full scale assumed for a CSV (see {@link CSV_DEFAULT_BITS}). */
export const CSV_DEFAULT_FULL_SCALE_V = 10;

export interface CsvRecording {
  values: Float64Array;
  /** From an evenly spaced time column, else null (the caller must know the rate). */
  sampleRateHz: number | null;
  /** The header row when the file has one. */
  header: string[] | null;
  columns: 1 | 2;
}

/** Options for {@link readCsv}. */
export interface ReadCsvOptions {
  /**
   * Largest allowed deviation of a time step from the mean step, as a fraction of it.
   * @default 0.01
   */
  timeJitter?: number;
}

function parseNumber(text: string): number {
  const t = text.trim();
  if (t === '' || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return NaN;
  return Number(t);
}

/**
 * Parses a CSV waveform: one column of values, or two columns time (s), value; an
 * optional header row; comma, semicolon or tab separated (detected by papaparse). Rejects
 * empty files, non-numeric or NaN values, mixed column counts, more than two columns and
 * an unevenly spaced or non-increasing time column, naming the line.
 *
 * Source: RFC 4180 (CSV); parsing by papaparse.
 */
export function readCsv(text: string, options: ReadCsvOptions = {}): CsvRecording {
  if (typeof text !== 'string') throw new TypeError('readCsv expects a string');
  const jitter = options.timeJitter ?? 0.01;
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: true });
  const rows = parsed.data;
  if (rows.length === 0) throw new Error('empty CSV: no rows');
  if (text.includes('\u0000')) throw new Error('not a CSV file: it contains binary data');
  let header: string[] | null = null;
  let firstLine = 1;
  const firstRow = rows[0]!;
  if (firstRow.some((cell) => Number.isNaN(parseNumber(cell)))) {
    if (firstRow.every((cell) => Number.isNaN(parseNumber(cell)) && cell.trim() !== '')) {
      header = firstRow.map((c) => c.trim());
      rows.shift();
      firstLine = 2;
    } else {
      const bad = firstRow.find((cell) => Number.isNaN(parseNumber(cell))) ?? '';
      throw new Error(`invalid CSV: line 1 has a non-numeric value "${bad.slice(0, 40)}"`);
    }
  }
  if (rows.length === 0) throw new Error('invalid CSV: no samples after the header');
  const columns = rows[0]!.length;
  if (header && header.length !== columns) {
    throw new Error(
      `invalid CSV: the header has ${header.length} columns but line 2 has ${columns}`,
    );
  }
  if (columns !== 1 && columns !== 2) {
    throw new Error(
      `invalid CSV: expected one column (value) or two (time, value), found ${columns}`,
    );
  }
  const n = rows.length;
  const values = new Float64Array(n);
  const times = columns === 2 ? new Float64Array(n) : null;
  for (let r = 0; r < n; r++) {
    const row = rows[r]!;
    const line = r + firstLine;
    if (row.length !== columns) {
      throw new Error(`invalid CSV: line ${line} has ${row.length} columns, expected ${columns}`);
    }
    for (let c = 0; c < columns; c++) {
      const v = parseNumber(row[c]!);
      if (!Number.isFinite(v)) {
        throw new Error(
          `invalid CSV: line ${line} has a non-numeric value "${row[c]!.trim().slice(0, 40)}"`,
        );
      }
      if (times && c === 0) times[r] = v;
      else values[r] = v;
    }
  }
  let sampleRateHz: number | null = null;
  if (times) {
    if (n < 2) throw new Error('invalid CSV: a time column needs at least two rows');
    const meanStep = (times[n - 1]! - times[0]!) / (n - 1);
    if (!(meanStep > 0)) throw new Error('invalid CSV: the time column does not increase');
    for (let i = 1; i < n; i++) {
      const step = times[i]! - times[i - 1]!;
      if (!(step > 0) || Math.abs(step - meanStep) > jitter * meanStep) {
        throw new Error(
          `invalid CSV: time column is not evenly spaced at line ${i + firstLine} (step ${step} s, mean ${meanStep} s)`,
        );
      }
    }
    sampleRateHz = 1 / meanStep;
  }
  return { values, sampleRateHz, header, columns: columns as 1 | 2 };
}
