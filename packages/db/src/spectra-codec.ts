/**
 * The stored form of an analysis's spectra: all of them in one BLOB (`analyses.spectra`),
 * one 16-bit logarithmic amplitude code per line, deflated. The one encoder (the worker's
 * writer) and the one decoder (every reader) live here.
 *
 * Code of a line of amplitude v in a spectrum whose largest line is `ref`:
 *   0                                        for v = 0 (and for v below the floor),
 *   65535 − round(20·log10(ref / v) / STEP)  otherwise, STEP = 0.01 dB,
 * so codes 1 … 65535 cover 655.34 dB below the spectrum's own largest line. Decoding gives
 * ref · 10^(−(65535 − code)·STEP / 20). Rounding to the nearest code is off by at most half
 * a step, 0.005 dB, so for every line above the floor the relative error is at most
 * 10^(0.005/20) − 1 = 5.758e-4 (0.058 %), plus float32 rounding of the decoded value
 * (2^−24). Lines more than 655.34 dB below the spectrum's largest decode as 0. Amplitude
 * levels in dB (20·log10 of a field-quantity ratio): ISO 80000-3 / IEC 60027-3.
 *
 * Layout (little-endian): byte 0 format version (1, or 2 with a detail); the rest deflated
 * (RFC 1951):
 *   byte mask of the spectra present (bit 0 acceleration, 1 velocity, 2 envelope, 3 order),
 *   per present spectrum: uint32 lines, float64 ref;
 *   per present spectrum: the high bytes then the low bytes of its codes' zig-zagged
 *   differences from the previous line (neighbouring lines differ little, so the high bytes
 *   are mostly 0 and deflate well);
 *   format 2 only: the detail, UTF-8 JSON, to the end. The detail is what only a capture that
 *   keeps its spectra needs (the server's stored-summary.ts says what: the spectra's axes,
 *   peaks, fault frequencies); it lives and goes with the spectra, so retention thinning
 *   (which clears this column) takes it too, and it deflates with them.
 *
 * Rows written before this column existed hold float32 BLOBs in four columns;
 * {@link storedSpectrum} reads either.
 */
import { deflateRawSync, inflateRawSync } from 'node:zlib';

export const SPECTRUM_KINDS = ['acceleration', 'velocity', 'envelope', 'order'] as const;
export type SpectrumKind = (typeof SPECTRUM_KINDS)[number];

/** A set of spectra to store: any may be absent (no envelope for a short record, no order without a speed). */
export type SpectraIn = Partial<Record<SpectrumKind, ArrayLike<number> | null | undefined>>;
export type SpectraOut = Record<SpectrumKind, Float32Array | null>;

/** Quantisation step of the log code, dB. */
export const SPECTRA_STEP_DB = 0.01;
/** Range below a spectrum's largest line that keeps its relative precision, dB (65534 steps). */
export const SPECTRA_RANGE_DB = 65534 * SPECTRA_STEP_DB;
/** Worst-case relative error of a decoded line above the floor: half a step, plus float32 rounding. */
export const SPECTRA_MAX_RELATIVE_ERROR = 10 ** (SPECTRA_STEP_DB / 2 / 20) - 1 + 2 ** -24;

const FORMAT = 1;
const FORMAT_WITH_DETAIL = 2;
const TOP = 65535;
const HEADER_BYTES = 12;

/**
 * One analysis's spectra (and, when given, its detail: any JSON value) → the stored BLOB.
 * Throws RangeError on NaN, infinite or negative lines.
 */
export function encodeSpectra(spectra: SpectraIn, detail?: unknown): Buffer {
  let mask = 0;
  const present: { lines: number; ref: number; codes: Uint16Array }[] = [];
  SPECTRUM_KINDS.forEach((kind, bit) => {
    const values = spectra[kind];
    if (values === null || values === undefined) return;
    mask |= 1 << bit;
    present.push(encodeOne(kind, values));
  });
  const headerSize = 1 + HEADER_BYTES * present.length;
  const codeBytes = present.reduce((s, p) => s + 2 * p.lines, 0);
  const body = Buffer.alloc(headerSize + codeBytes);
  body[0] = mask;
  let at = 1;
  for (const p of present) {
    body.writeUInt32LE(p.lines, at);
    body.writeDoubleLE(p.ref, at + 4);
    at += HEADER_BYTES;
  }
  for (const p of present) {
    const n = p.lines;
    let prev = 0;
    for (let i = 0; i < n; i++) {
      const c = p.codes[i]!;
      const d = ((c - prev) << 16) >> 16; // signed 16-bit difference (wraps)
      prev = c;
      const z = ((d << 1) ^ (d >> 15)) & 0xffff;
      body[at + i] = z >>> 8;
      body[at + n + i] = z & 0xff;
    }
    at += 2 * n;
  }
  if (detail === undefined) return Buffer.concat([Buffer.from([FORMAT]), deflateRawSync(body)]);
  const json = Buffer.from(JSON.stringify(detail), 'utf8');
  return Buffer.concat([
    Buffer.from([FORMAT_WITH_DETAIL]),
    deflateRawSync(Buffer.concat([body, json])),
  ]);
}

function encodeOne(
  kind: SpectrumKind,
  values: ArrayLike<number>,
): { lines: number; ref: number; codes: Uint16Array } {
  const n = values.length;
  let ref = 0;
  for (let i = 0; i < n; i++) {
    const v = values[i]!;
    if (!(v >= 0) || v === Number.POSITIVE_INFINITY)
      throw new RangeError(
        `${kind} spectrum line ${i} is ${v}: stored spectra hold finite amplitudes ≥ 0`,
      );
    if (v > ref) ref = v;
  }
  const codes = new Uint16Array(n);
  if (ref > 0) {
    const perDecade = 20 / SPECTRA_STEP_DB;
    const logRef = Math.log10(ref);
    for (let i = 0; i < n; i++) {
      const v = values[i]!;
      if (v === 0) continue;
      // Non-negative and below 2^31 for any finite doubles: | 0 rounds like Math.round.
      const c = TOP - (((logRef - Math.log10(v)) * perDecade + 0.5) | 0);
      codes[i] = c < 1 ? 0 : c;
    }
  }
  return { lines: n, ref, codes };
}

/**
 * The stored BLOB → the spectra (float32, as the API sends them); with `only`, the others
 * stay null (a reader of one spectrum skips decoding the rest). Throws on a damaged BLOB.
 */
export function decodeSpectra(blob: Uint8Array, only?: SpectrumKind): SpectraOut {
  return decodeBlob(blob, only).spectra;
}

/**
 * The detail stored with the spectra (format 2), parsed from JSON; undefined for a BLOB
 * written without one (format 1: that analysis keeps its detail in its summary).
 */
export function decodeSpectraDetail(blob: Uint8Array): unknown {
  return decodeBlob(blob, 'none').detail;
}

function decodeBlob(
  blob: Uint8Array,
  only?: SpectrumKind | 'none',
): { spectra: SpectraOut; detail: unknown } {
  if (blob.length < 1 || (blob[0] !== FORMAT && blob[0] !== FORMAT_WITH_DETAIL))
    throw new RangeError(`stored spectra: unknown format ${blob[0] ?? 'of an empty BLOB'}`);
  const body = inflateRawSync(blob.subarray(1));
  const out: SpectraOut = { acceleration: null, velocity: null, envelope: null, order: null };
  const mask = body[0]!;
  const kinds = SPECTRUM_KINDS.filter((_, bit) => mask & (1 << bit));
  let at = 1;
  const heads = kinds.map(() => {
    const head = { lines: body.readUInt32LE(at), ref: body.readDoubleLE(at + 4) };
    at += HEADER_BYTES;
    return head;
  });
  const total = heads.reduce((s, h) => s + 2 * h.lines, at);
  const withDetail = blob[0] === FORMAT_WITH_DETAIL;
  if (withDetail ? total > body.length : total !== body.length)
    throw new RangeError(`stored spectra: ${body.length} bytes where the header says ${total}`);
  const detail = withDetail
    ? (JSON.parse(body.subarray(total).toString('utf8')) as unknown)
    : undefined;
  const factor = levelFactors();
  kinds.forEach((kind, k) => {
    const { lines: n, ref } = heads[k]!;
    if (only !== undefined && kind !== only) {
      at += 2 * n;
      return;
    }
    const values = new Float32Array(n);
    let c = 0;
    for (let i = 0; i < n; i++) {
      const z = (body[at + i]! << 8) | body[at + n + i]!;
      c = (c + ((z >>> 1) ^ -(z & 1))) & 0xffff;
      values[i] = ref * factor[c]!;
    }
    at += 2 * n;
    out[kind] = values;
  });
  return { spectra: out, detail };
}

let factors: Float64Array | null = null;

/** 10^(−(65535 − code)·STEP/20) for every code, 0 for code 0: one multiplication a line. */
function levelFactors(): Float64Array {
  if (!factors) {
    factors = new Float64Array(TOP + 1);
    for (let c = 1; c <= TOP; c++) factors[c] = 10 ** ((-(TOP - c) * SPECTRA_STEP_DB) / 20);
  }
  return factors;
}

/** The column of a row written before `analyses.spectra` existed (float32 little-endian). */
export const legacySpectrumColumn = {
  acceleration: 'accelSpectrum',
  velocity: 'velocitySpectrum',
  envelope: 'envelopeSpectrum',
  order: 'orderSpectrum',
} as const satisfies Record<SpectrumKind, string>;

/** What a reader selects from `analyses` to read a spectrum of either form. */
export interface StoredSpectraRow {
  spectra: Buffer | null;
  accelSpectrum?: Buffer | null;
  velocitySpectrum?: Buffer | null;
  envelopeSpectrum?: Buffer | null;
  orderSpectrum?: Buffer | null;
}

/**
 * One spectrum of a stored analysis: from the compact BLOB, or, for rows written before it,
 * from the old float32 column. Null when the analysis has no such spectrum.
 */
export function storedSpectrum(row: StoredSpectraRow, kind: SpectrumKind): Float32Array | null {
  return readSpectrum(kind, row.spectra, row[legacySpectrumColumn[kind]]);
}

/** {@link storedSpectrum} from the two columns a reader selected: the compact BLOB and `kind`'s old one. */
export function readSpectrum(
  kind: SpectrumKind,
  compact: Uint8Array | null | undefined,
  legacy: Uint8Array | null | undefined,
): Float32Array | null {
  if (compact) return decodeSpectra(compact, kind)[kind];
  return float32Of(legacy);
}

/**
 * {@link readSpectrum} as base64 of little-endian float32, the form the API sends: an old
 * float32 column is already that and is sent as stored (whole values only), not copied
 * through an array.
 */
export function readSpectrumBase64(
  kind: SpectrumKind,
  compact: Uint8Array | null | undefined,
  legacy: Uint8Array | null | undefined,
): string | null {
  if (compact) return base64Of(decodeSpectra(compact, kind)[kind]);
  if (!legacy) return null;
  const whole = legacy.byteLength - (legacy.byteLength % 4);
  return Buffer.from(legacy.buffer, legacy.byteOffset, whole).toString('base64');
}

/** Float32 values as base64 of their little-endian bytes. */
export function base64Of(values: Float32Array | null): string | null {
  return values
    ? Buffer.from(values.buffer, values.byteOffset, values.byteLength).toString('base64')
    : null;
}

/** A little-endian float32 BLOB → its values (copied: a Buffer may sit at any byte offset). */
export function float32Of(blob: Uint8Array | null | undefined): Float32Array | null {
  if (!blob) return null;
  const copy = new Uint8Array(blob.byteLength - (blob.byteLength % 4));
  copy.set(blob.subarray(0, copy.byteLength));
  return new Float32Array(copy.buffer);
}
