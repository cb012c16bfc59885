/**
 * The bearing rules, read from the envelope spectrum: lines at BPFO, BPFI, 2 × BSF and FTF
 * and their harmonics (with slip), inner race with 1× sidebands, and the stage from whether
 * the acceleration spectrum shows them too. Frequencies and slip: Randall & Antoni 2011
 * (MSSP 25:485–520); the rest common practice, no single source.
 */
import {
  bearingOrders,
  getWindow,
  type BearingGeometry,
  type SnapshotAnalysis,
} from '@turnstone/dsp';
import {
  clamp01,
  fmt,
  LINE_TOLERANCE,
  readPeak,
  type DiagnosisContext,
  type Lines,
  type Peak,
} from './diagnosis-peaks.ts';
import type { DiagnosisCode, DiagnosisHint } from './diagnosis-types.ts';

/**
 * Bearings run 1–2 % below their kinematic frequencies (rolling elements slip): envelope lines
 * are searched from 2.5 % below to 0.5 % above each harmonic. Source: Randall & Antoni 2011,
 * MSSP 25:485–520, §2.1 (slip 1–2 %).
 */
export const BEARING_SLIP_BELOW = 0.025;
/** See {@link BEARING_SLIP_BELOW}. */
export const BEARING_SLIP_ABOVE = 0.005;
/** Harmonics of each defect frequency read in the envelope spectrum. */
export const BEARING_HARMONICS = 4;
/** A bearing hint needs this many of its harmonics (including the fundamental, or 2 × BSF for balls). Common practice, no source. */
export const BEARING_MIN_LINES = 2;
/**
 * A cage (FTF) series has harmonics at every multiple of FTF, and BPFO = n · FTF: another
 * defect family whose lines all sit on FTF multiples is kept only when its lines are at least
 * this many times the strongest cage line. Common practice, no source.
 */
export const CAGE_FAMILY_DOMINANCE = 2;

/** Bearing defect hints of every bearing on the shaft (none without an envelope spectrum). */
export function bearingHints(
  ctx: DiagnosisContext,
  envelope: SnapshotAnalysis['spectra']['envelope'],
  bearings: readonly BearingGeometry[],
  notes: string[],
): DiagnosisHint[] {
  const { acceleration, f1, ev } = ctx;
  const hints: DiagnosisHint[] = [];
  if (envelope === null) {
    if (bearings.length > 0)
      notes.push('No envelope spectrum (record too short): no bearing hints.');
    return hints;
  }
  const env: Lines = {
    values: envelope.values,
    dfHz: envelope.dfHz,
    enbwBins: getWindow(envelope.window, 64).enbwBins,
    firstLine: 1,
  };
  const families: {
    bearing: string;
    lineHz: number[];
    strongest: number;
    hint: DiagnosisHint;
  }[] = [];
  for (const bearing of bearings) {
    const o = bearingOrders(bearing);
    const ratio = bearing.speedRatio ?? 1;
    const kinds: { code: DiagnosisCode; name: string; order: number; what: string }[] = [
      { code: 'bearing-outer-race', name: 'BPFO', order: o.bpfo, what: 'an outer race' },
      { code: 'bearing-inner-race', name: 'BPFI', order: o.bpfi, what: 'an inner race' },
      { code: 'bearing-rolling-element', name: 'BSF', order: o.bsf, what: 'a rolling element' },
      { code: 'bearing-cage', name: 'FTF', order: o.ftf, what: 'a cage' },
    ];
    for (const kind of kinds) {
      const f = kind.order * ratio * f1;
      const lines: { k: number; p: Peak }[] = [];
      for (let k = 1; k <= BEARING_HARMONICS; k++) {
        const centre = k * f * (1 - (BEARING_SLIP_BELOW - BEARING_SLIP_ABOVE) / 2);
        const tol =
          (k * f * (BEARING_SLIP_BELOW + BEARING_SLIP_ABOVE)) / 2 + LINE_TOLERANCE * env.dfHz;
        if (centre + tol > (env.values.length - 2) * env.dfHz) break;
        const p = readPeak(env, centre, tol);
        if (p?.present) lines.push({ k, p });
      }
      const key = kind.name === 'BSF' ? [1, 2] : [1];
      if (lines.length < BEARING_MIN_LINES || !lines.some((l) => key.includes(l.k))) continue;
      const evidence = lines.map((l) =>
        ev('envelope', l.p, `${bearing.name} ${kind.name}${l.k > 1 ? ` ×${l.k}` : ''}`),
      );
      let sidebands = 0;
      if (kind.name === 'BPFI') {
        for (const l of lines.slice(0, 2)) {
          for (const sign of [-1, 1]) {
            const p = readPeak(env, l.p.hz + sign * f1 * ratio, LINE_TOLERANCE * env.dfHz);
            if (p?.present) {
              sidebands++;
              evidence.push(
                ev(
                  'envelope',
                  p,
                  `${bearing.name} BPFI${l.k > 1 ? ` ×${l.k}` : ''}${sign < 0 ? '−' : '+'}1×`,
                ),
              );
            }
          }
        }
      }
      // Stage: envelope only (early) or also in the acceleration spectrum (later).
      let inSpectrum = 0;
      for (const l of lines) {
        const p = readPeak(acceleration, l.p.hz, LINE_TOLERANCE * acceleration.dfHz);
        const onShaft =
          p !== null &&
          Math.abs(p.hz / f1 - Math.round(p.hz / f1)) * f1 < LINE_TOLERANCE * acceleration.dfHz &&
          Math.round(p.hz / f1) <= 10;
        if (p?.present && !onShaft) {
          inSpectrum++;
          evidence.push(
            ev(
              'acceleration',
              p,
              `${bearing.name} ${kind.name}${l.k > 1 ? ` ×${l.k}` : ''} (spectrum)`,
            ),
          );
        }
      }
      const stage =
        inSpectrum > 0
          ? 'also visible in the acceleration spectrum (a later stage)'
          : 'seen in the envelope spectrum only (an early stage)';
      families.push({
        bearing: bearing.name,
        lineHz: lines.map((l) => l.p.hz),
        strongest: Math.max(...lines.map((l) => l.p.amplitude)),
        hint: {
          code: kind.code,
          confidence: clamp01(
            0.35 +
              (0.5 * lines.length) / BEARING_HARMONICS +
              0.05 * sidebands +
              (inSpectrum > 0 ? 0.1 : 0),
          ),
          summary: `${lines.length} envelope lines at ${bearing.name} ${kind.name} (${fmt(f)} Hz) and harmonics${sidebands ? ` with ${sidebands} 1× sidebands` : ''}: ${kind.what} defect is likely, ${stage}.`,
          evidence,
        },
      });
    }
    // A cage series covers every FTF multiple (BPFO = n · FTF): drop families that only echo it.
    const cage = families.find((b) => b.bearing === bearing.name && b.hint.code === 'bearing-cage');
    for (const b of families) {
      if (b.bearing !== bearing.name || b === cage) continue;
      const echo =
        cage !== undefined &&
        b.strongest < CAGE_FAMILY_DOMINANCE * cage.strongest &&
        b.lineHz.every((hz) => {
          const ftf = cage.lineHz[0]!; // the cage series always holds its fundamental
          const m = Math.round(hz / ftf);
          return (
            m >= 1 &&
            Math.abs(hz - m * ftf) <=
              (BEARING_SLIP_BELOW + BEARING_SLIP_ABOVE) * hz + LINE_TOLERANCE * env.dfHz
          );
        });
      if (!echo) hints.push(b.hint);
    }
    if (cage) hints.push(cage.hint);
    families.length = 0;
  }
  return hints;
}
