import { describe, expect, it } from 'vitest';
import { cursorMoveOf, moveCursor } from './cursor-keys.ts';

// Positions expected by hand from the inputs (common practice, no source). Keys follow the
// WAI-ARIA Authoring Practices slider pattern: Right/Up increase, Left/Down decrease,
// Home/End go to the ends.
const track = { peaks: [74.25, 24.75, 49.5, 300], step: 0.25, from: 10, to: 100 };

describe('keyboard cursor moves', () => {
  it('maps arrow keys to peak moves, with Shift to line moves, and Home/End to the ends', () => {
    expect(cursorMoveOf('ArrowRight', false)).toBe('next');
    expect(cursorMoveOf('ArrowUp', false)).toBe('next');
    expect(cursorMoveOf('ArrowLeft', false)).toBe('previous');
    expect(cursorMoveOf('ArrowDown', true)).toBe('previous-line');
    expect(cursorMoveOf('ArrowRight', true)).toBe('next-line');
    expect(cursorMoveOf('Home', false)).toBe('first');
    expect(cursorMoveOf('End', false)).toBe('last');
    expect(cursorMoveOf('a', false)).toBeNull();
  });

  it('walks the peaks in view in order of position, and stays at the last one', () => {
    expect(moveCursor(null, 'next', track)).toBe(24.75);
    expect(moveCursor(24.75, 'next', track)).toBe(49.5);
    expect(moveCursor(49.5, 'next', track)).toBe(74.25);
    // 300 is outside the window shown: the cursor stays on the last peak in view.
    expect(moveCursor(74.25, 'next', track)).toBe(74.25);
    expect(moveCursor(74.25, 'previous', track)).toBe(49.5);
    expect(moveCursor(24.75, 'previous', track)).toBe(24.75);
    expect(moveCursor(null, 'previous', track)).toBe(74.25);
    // From between two peaks: the next one up, the next one down.
    expect(moveCursor(30, 'next', track)).toBe(49.5);
    expect(moveCursor(30, 'previous', track)).toBe(24.75);
    expect(moveCursor(60, 'first', track)).toBe(24.75);
    expect(moveCursor(20, 'last', track)).toBe(74.25);
  });

  it('moves one line with Shift, inside the window shown', () => {
    expect(moveCursor(24.75, 'next-line', track)).toBe(25);
    expect(moveCursor(24.75, 'previous-line', track)).toBe(24.5);
    expect(moveCursor(100, 'next-line', track)).toBe(100);
    expect(moveCursor(10, 'previous-line', track)).toBe(10);
    expect(moveCursor(null, 'next-line', track)).toBe(10);
  });

  it('without peaks in view, moves along lines to the window ends', () => {
    const flat = { ...track, peaks: [] };
    expect(moveCursor(null, 'next', flat)).toBe(10);
    expect(moveCursor(null, 'last', flat)).toBe(100);
    expect(moveCursor(50, 'next', flat)).toBe(50);
  });
});
