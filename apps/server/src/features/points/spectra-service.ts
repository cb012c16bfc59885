/**
 * Stored spectra of a point's captures: one spectrum with its peaks and fault frequencies, and
 * the waterfall of recent captures. Spectra are stored in one compact BLOB per analysis (or,
 * for rows written before it, four float32 BLOBs), read through `@turnstone/db/spectra-codec`
 * and sent to the browser as base64 of float32. Their axes, peaks and fault frequencies are
 * the analysis's stored detail (stored-summary.ts), kept with the spectra.
 */

import type { Spectrum, SpectrumKind } from '@turnstone/contracts/points';
import type { Waterfall } from '@turnstone/contracts/waterfall';
import { base64Of, readSpectrumBase64, storedSpectrum } from '@turnstone/db/spectra-codec';

import { AppError } from '../../lib/app-error.ts';
import type { AppContext } from '../../lib/context.ts';
import { accessiblePoint } from '../places/point-access.ts';
import { type SessionUser } from '../../lib/session-user.ts';

import * as repo from './points-repository.ts';
import { readStoredDetail, readStoredSummary } from './stored-summary.ts';
import { accessibleAnalysis } from './points-service.ts';

const iso = (d: Date) => d.toISOString();

/** 1× in Hz from a capture's stored speed: measured Hz first, else r/min ÷ 60; null unknown. */
function shaftHzOf(speed: { rpm: number | null; hz: number | null }): number | null {
  return speed.hz ?? (speed.rpm ? speed.rpm / 60 : null);
}

/** Largest local maxima of a stored spectrum (line values, no interpolation), largest first. */
export function simplePeaks(
  values: Float32Array,
  count = 10,
): { index: number; amplitude: number }[] {
  const found: { index: number; amplitude: number }[] = [];
  for (let i = 2; i < values.length - 1; i++) {
    const v = values[i]!;
    if (v > values[i - 1]! && v >= values[i + 1]!) found.push({ index: i, amplitude: v });
  }
  return found.sort((a, b) => b.amplitude - a.amplitude).slice(0, count);
}

/**
 * 410 for a capture whose spectra the tiered retention cleared, naming the nearest capture of
 * the same point that still has them (`details.nearest`, or null when there is none).
 */
async function thinnedError(
  ctx: AppContext,
  analysis: { id: number; pointId: number; takenAt: Date; spectraThinnedAt: Date | null },
): Promise<AppError> {
  const near = await repo.nearestWholeAnalysis(
    ctx.db,
    analysis.pointId,
    analysis.takenAt,
    analysis.id,
  );
  const nearest = near ? { analysisId: near.id, takenAt: iso(near.takenAt) } : null;
  return new AppError(
    'spectrum_thinned',
    `The spectra of this capture were removed by the retention policy (older captures keep one per hour, then one per day)${
      nearest
        ? `; the nearest capture of this point with its spectra was taken at ${nearest.takenAt}.`
        : '.'
    } Its overall values and band values are kept.`,
    410,
    { nearest, thinnedAt: analysis.spectraThinnedAt ? iso(analysis.spectraThinnedAt) : null },
  );
}

export async function spectrum(
  ctx: AppContext,
  user: SessionUser,
  analysisId: number,
  kind: SpectrumKind,
): Promise<Spectrum> {
  const { analysis } = await accessibleAnalysis(ctx, user, analysisId);
  if (analysis.spectraThinnedAt) throw await thinnedError(ctx, analysis);
  const summary = readStoredSummary(analysis.summary);
  const detail = readStoredDetail(analysis);
  const meta = detail.spectra?.[kind] ?? null;
  const values = storedSpectrum(analysis, kind);
  if (!meta || !values)
    throw new AppError(
      'spectrum_unavailable',
      kind === 'order'
        ? 'This capture has no order spectrum: its running speed was not known.'
        : `This capture has no ${kind} spectrum.`,
      404,
    );
  const axis = kind === 'order' ? 'order' : 'hz';
  const speed = summary.speed ?? { rpm: analysis.speedRpm, hz: null, source: analysis.speedSource };
  const shaftHz = shaftHzOf(speed);
  const step = axis === 'order' ? (meta.dOrder ?? 0) : (meta.dfHz ?? 0);
  const peaks =
    kind === 'acceleration' && detail.peaks
      ? detail.peaks.map((p) => ({ hz: p.hz, order: p.order, amplitude: p.amplitude }))
      : simplePeaks(values).map((p) => {
          const x = p.index * step;
          return axis === 'order'
            ? { hz: shaftHz ? x * shaftHz : null, order: x, amplitude: p.amplitude }
            : { hz: x, order: shaftHz ? x / shaftHz : null, amplitude: p.amplitude };
        });
  return {
    analysisId: analysis.id,
    takenAt: iso(analysis.takenAt),
    kind,
    unit: meta.unit,
    scale: meta.scale,
    axis,
    dfHz: axis === 'hz' ? step : null,
    dOrder: axis === 'order' ? step : null,
    lines: values.length,
    values: base64Of(values)!,
    peaks,
    faultFrequencies: (detail.faultFrequencies ?? []).map((f) => ({
      name: f.name,
      kind: f.kind,
      hz: f.hz,
      order: f.order,
    })),
    speed: { rpm: speed.rpm, hz: shaftHz, source: speed.source },
  };
}

export async function waterfall(
  ctx: AppContext,
  user: SessionUser,
  pointId: number,
  kind: SpectrumKind,
  limit: number,
): Promise<Waterfall> {
  await accessiblePoint(ctx.db, user, pointId);
  const rows = await repo.recentSpectra(ctx.db, pointId, kind, limit);
  const axis = kind === 'order' ? 'order' : 'hz';
  let unit = kind === 'velocity' ? 'mm/s' : 'g';
  let scale: Waterfall['scale'] = 'rms';
  const items: Waterfall['items'] = [];
  for (const r of rows) {
    const summary = readStoredSummary(r.summary);
    const meta = readStoredDetail(r).spectra?.[kind];
    const values = meta ? readSpectrumBase64(kind, r.spectra, r.legacy) : null;
    if (!meta || !values) continue;
    unit = meta.unit;
    scale = meta.scale;
    items.push({
      analysisId: r.id,
      takenAt: iso(r.takenAt),
      step: (axis === 'order' ? meta.dOrder : meta.dfHz) ?? 0,
      values,
      shaftHz: shaftHzOf(summary.speed ?? { rpm: r.speedRpm, hz: null }),
    });
  }
  return { kind, unit, scale, axis, items };
}
