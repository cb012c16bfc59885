/**
 * Where the spectrum's keyboard cursor goes on a key press: from peak to peak among the real
 * peaks in view (the peaks table's rule: above the stated noise floor), or one line at a
 * time, never outside the window shown. Pure, so the rule is tested without a browser.
 */
export type CursorMove = 'next' | 'previous' | 'next-line' | 'previous-line' | 'first' | 'last';

export interface CursorTrack {
  /** Positions of the real peaks in view, on the axis shown. */
  peaks: readonly number[];
  /** Line spacing on the axis shown. */
  step: number;
  /** The window shown. */
  from: number;
  to: number;
}

/** The move a key asks for (arrow keys, with Shift one line; Home and End), or null. */
export function cursorMoveOf(key: string, shift: boolean): CursorMove | null {
  switch (key) {
    case 'ArrowRight':
    case 'ArrowUp':
      return shift ? 'next-line' : 'next';
    case 'ArrowLeft':
    case 'ArrowDown':
      return shift ? 'previous-line' : 'previous';
    case 'Home':
      return 'first';
    case 'End':
      return 'last';
    default:
      return null;
  }
}

/**
 * The cursor's next position; `at` null is a cursor not placed yet (it starts on the first
 * or last peak, or line, in view). A move past the last peak stays where it is.
 */
export function moveCursor(at: number | null, move: CursorMove, t: CursorTrack): number | null {
  const peaks = t.peaks.filter((x) => x >= t.from && x <= t.to).sort((a, b) => a - b);
  const firstLine = Math.ceil(t.from / t.step - 1e-9) * t.step;
  const lastLine = Math.floor(t.to / t.step + 1e-9) * t.step;
  if (lastLine < firstLine) return at;
  const half = t.step / 2;
  switch (move) {
    case 'first':
      return peaks[0] ?? firstLine;
    case 'last':
      return peaks[peaks.length - 1] ?? lastLine;
    case 'next':
      if (at === null) return peaks[0] ?? firstLine;
      return peaks.find((x) => x > at + half) ?? at;
    case 'previous': {
      if (at === null) return peaks[peaks.length - 1] ?? lastLine;
      const before = peaks.filter((x) => x < at - half);
      return before[before.length - 1] ?? at;
    }
    case 'next-line':
    case 'previous-line': {
      const d = move === 'next-line' ? 1 : -1;
      const line =
        at === null ? (d > 0 ? firstLine : lastLine) : (Math.round(at / t.step) + d) * t.step;
      return Math.min(Math.max(line, firstLine), lastLine);
    }
  }
}
