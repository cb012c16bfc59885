/**
 * What the charts' values tables list, as plain functions: the waveform's samples of a window
 * thinned to a readable count, and a spectrum's largest peaks in a band.
 */

/** Rows of the values table at most; a longer window is thinned to this many. */
export const WAVEFORM_TABLE_ROWS = 200;

export interface WaveformRow {
  /** Sample number, from 0 at the start of the capture. */
  index: number;
  value: number;
}

/**
 * The samples of the window [first, last] for the values table: all of them when there are
 * at most `maxRows`, else the window cut into `maxRows` equal runs and, of each run, the
 * sample of largest magnitude — so peaks and impacts survive the thinning (a plain every-nth
 * pick would step over them). Also says how many samples each row stands for.
 */
export function waveformRows(
  values: ArrayLike<number>,
  first: number,
  last: number,
  maxRows = WAVEFORM_TABLE_ROWS,
): { rows: WaveformRow[]; perRow: number } {
  const lo = Math.max(0, first);
  const hi = Math.min(values.length - 1, last);
  const count = hi - lo + 1;
  if (count <= 0) return { rows: [], perRow: 1 };
  if (count <= maxRows) {
    const rows: WaveformRow[] = [];
    for (let i = lo; i <= hi; i++) rows.push({ index: i, value: values[i]! });
    return { rows, perRow: 1 };
  }
  const rows: WaveformRow[] = [];
  for (let r = 0; r < maxRows; r++) {
    const a = lo + Math.floor((r * count) / maxRows);
    const b = lo + Math.floor(((r + 1) * count) / maxRows) - 1;
    let best = a;
    for (let i = a + 1; i <= b; i++) if (Math.abs(values[i]!) > Math.abs(values[best]!)) best = i;
    rows.push({ index: best, value: values[best]! });
  }
  return { rows, perRow: count / maxRows };
}

/** Peaks per spectrum in the values table. */
export const WATERFALL_TABLE_PEAKS = 3;

/** A peak as drawn: the line's position on the axis and its value. */
export interface WaterfallPeak {
  x: number;
  value: number;
}

/**
 * The `count` largest local maxima of one spectrum between `from` and `to` on its axis,
 * largest first: the lines' own values, as drawn (no interpolation between lines). A local
 * maximum as scipy.signal.find_peaks defines it: above the line before it and above the line
 * after it, where a flat top of equal lines counts once, at its middle (the left one of two).
 * Line 0 (DC) and the last line are never peaks.
 */
export function largestPeaks(
  values: ArrayLike<number>,
  step: number,
  from: number,
  to: number,
  count = WATERFALL_TABLE_PEAKS,
): WaterfallPeak[] {
  const first = Math.max(1, Math.ceil(from / step - 1e-9));
  const last = Math.min(values.length - 2, Math.floor(to / step + 1e-9));
  const found: number[] = [];
  // From the first line that could start a flat top reaching into the band.
  let k = 1;
  while (k <= last) {
    const v = values[k]!;
    if (values[k - 1]! < v) {
      let ahead = k + 1;
      while (ahead < values.length - 1 && values[ahead] === v) ahead++;
      if (values[ahead]! < v) {
        const mid = Math.floor((k + ahead - 1) / 2);
        if (mid >= first && mid <= last) found.push(mid);
      }
      k = ahead;
    } else k++;
  }
  found.sort((a, b) => values[b]! - values[a]! || a - b);
  return found.slice(0, count).map((i) => ({ x: i * step, value: values[i]! }));
}
