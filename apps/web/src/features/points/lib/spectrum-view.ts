/**
 * Where the spectrum view opens: which measure and which span, from the band in alert when
 * the point is opened from one (`?band=`), else from what the user last chose (remembered per
 * user in this browser), else velocity over 0–40 orders of the running speed.
 */
import type { FaultFrequencyItem, PointBand } from '@turnstone/contracts/points';

export type Measure = 'acceleration' | 'velocity' | 'envelope';
export type Axis = 'hz' | 'order';

/** The spectrum to fetch for a measure on an axis: acceleration in orders is the stored order spectrum. */
export function kindFor(measure: Measure, axis: Axis) {
  return measure === 'acceleration' && axis === 'order' ? 'order' : measure;
}

/** Orders shown when nothing else decides: 1× to its 40th harmonic. Common practice, no source. */
export const DEFAULT_SPAN_ORDERS = 40;
/** Margin around a band's own range, as a fraction of its width on each side. */
export const BAND_MARGIN = 0.25;

/** A span in orders of running speed (turned into Hz with the capture's speed) or in Hz. */
export type Span =
  { unit: 'order'; from: number; to: number } | { unit: 'hz'; from: number; to: number };

export interface SpectrumStart {
  measure: Measure;
  span: Span;
  /** Why it opens there, said under the chart. */
  reason: string;
}

/** What a user chose last, kept per user. */
export interface RememberedView {
  measure: Measure;
  spanOrders: number;
}

/** The measure a band is read on: velocity (and displacement) bands on velocity, etc. */
export function measureOfBand(band: Pick<PointBand, 'spectrum'>): Measure {
  if (band.spectrum === 'envelope') return 'envelope';
  if (band.spectrum === 'acceleration') return 'acceleration';
  return 'velocity';
}

const faultOrders: Record<string, number> = { '1x': 1, '2x': 2, '3x': 3 };

/** The band's range widened by {@link BAND_MARGIN} of its width each side (not below 0). */
function withMargin(unit: 'hz' | 'order', from: number, to: number): Span {
  const m = (to - from) * BAND_MARGIN;
  return { unit, from: Math.max(0, from - m), to: to + m };
}

/**
 * The view a band in alert opens: its measure, and its range with a margin — an overall
 * velocity band over 0–40 orders (the 1× family where its problems show), a fault window from
 * 0 to past its last harmonic (so 1× stays in view beside it).
 */
export function startForBand(
  band: Pick<PointBand, 'spectrum' | 'kind' | 'range' | 'name'>,
  faults: readonly FaultFrequencyItem[],
): SpectrumStart {
  const measure = measureOfBand(band);
  const reason = `Opened on ${band.name}`;
  const r = band.range;
  const orders: Span = { unit: 'order', from: 0, to: DEFAULT_SPAN_ORDERS };
  if (!r) return { measure, span: orders, reason };
  switch (r.kind) {
    case 'overall':
      // Overall acceleration over its own Hz span; overall velocity over the first 40 orders.
      return {
        measure,
        span:
          measure !== 'velocity' && r.fromHz !== null && r.toHz !== null
            ? { unit: 'hz', from: r.fromHz, to: r.toHz }
            : orders,
        reason,
      };
    case 'hz':
      return { measure, span: withMargin('hz', r.fromHz, r.toHz), reason };
    case 'order':
      return { measure, span: withMargin('order', r.fromOrder, r.toOrder), reason };
    case 'fault': {
      const order = faultOrders[r.fault] ?? faults.find((f) => f.kind === r.fault)?.order ?? null;
      if (order === null) return { measure, span: orders, reason };
      const last = order * Math.max(1, r.harmonics);
      const half =
        r.halfWidthUnit === 'order'
          ? r.halfWidth
          : r.halfWidthUnit === 'percent'
            ? (last * r.halfWidth) / 100
            : 0;
      return {
        measure,
        span: { unit: 'order', from: 0, to: (last + half) * (1 + BAND_MARGIN) },
        reason,
      };
    }
  }
}

/** The span on the chart's axis, clipped to [0, xMax]; null when it cannot be placed (no speed). */
export function spanOnAxis(
  span: Span,
  axis: Axis,
  shaftHz: number | null,
  xMax: number,
): [number, number] | null {
  let { from, to } = span;
  if (span.unit !== axis) {
    if (!shaftHz) return null;
    const f = span.unit === 'order' ? shaftHz : 1 / shaftHz;
    from *= f;
    to *= f;
  }
  from = Math.max(0, from);
  to = Math.min(xMax, to);
  return to > from ? [from, to] : null;
}

const storageKey = (userId: number) => `turnstone.spectrum-view.${userId}`;
const measures: readonly Measure[] = ['acceleration', 'velocity', 'envelope'];

/** The view this user last chose in this browser, or null (nothing kept, or unreadable). */
export function readRemembered(
  storage: Pick<Storage, 'getItem'>,
  userId: number,
): RememberedView | null {
  try {
    const raw = storage.getItem(storageKey(userId));
    if (!raw) return null;
    const v = JSON.parse(raw) as Partial<RememberedView>;
    if (!measures.includes(v.measure as Measure)) return null;
    if (typeof v.spanOrders !== 'number' || !(v.spanOrders > 0) || v.spanOrders > 1000) return null;
    return { measure: v.measure as Measure, spanOrders: v.spanOrders };
  } catch {
    return null;
  }
}

export function writeRemembered(
  storage: Pick<Storage, 'setItem'>,
  userId: number,
  view: RememberedView,
): void {
  try {
    storage.setItem(storageKey(userId), JSON.stringify(view));
  } catch {
    // A full or blocked storage only loses the remembered view.
  }
}

/** Where the view opens: the band in alert, else the user's last view, else velocity 0–40 orders. */
export function spectrumStart(
  band: Pick<PointBand, 'spectrum' | 'kind' | 'range' | 'name'> | null,
  faults: readonly FaultFrequencyItem[],
  remembered: RememberedView | null,
): SpectrumStart {
  if (band) return startForBand(band, faults);
  if (remembered)
    return {
      measure: remembered.measure,
      span: { unit: 'order', from: 0, to: remembered.spanOrders },
      reason: 'Opened on your last measure and span',
    };
  return {
    measure: 'velocity',
    span: { unit: 'order', from: 0, to: DEFAULT_SPAN_ORDERS },
    reason: `Opened on velocity, 0–${DEFAULT_SPAN_ORDERS} orders of running speed`,
  };
}
