import type { KeyboardEvent } from 'react';

/**
 * The arrow-key part of the WAI-ARIA Authoring Practices patterns for tabs and radio groups:
 * Left/Up and Right/Down move to the previous/next enabled item (wrapping), Home and End to
 * the first and last. Returns the index to move to, or null for any other key. The caller
 * focuses and activates it (tabs with automatic activation, radios check on focus).
 */
export function rovingTarget(
  e: KeyboardEvent,
  count: number,
  current: number,
  isDisabled: (i: number) => boolean = () => false,
): number | null {
  const step =
    e.key === 'ArrowRight' || e.key === 'ArrowDown'
      ? 1
      : e.key === 'ArrowLeft' || e.key === 'ArrowUp'
        ? -1
        : 0;
  let start: number;
  let dir: number;
  if (step !== 0) {
    start = current + step;
    dir = step;
  } else if (e.key === 'Home') {
    start = 0;
    dir = 1;
  } else if (e.key === 'End') {
    start = count - 1;
    dir = -1;
  } else return null;
  for (let k = 0; k < count; k++) {
    const i = (((start + dir * k) % count) + count) % count;
    if (!isDisabled(i)) {
      e.preventDefault();
      return i;
    }
  }
  return null;
}

/** Focuses the `index`-th element matching `selector` inside the event's current target. */
export function focusItem(e: KeyboardEvent<HTMLElement>, selector: string, index: number) {
  e.currentTarget.querySelectorAll<HTMLElement>(selector)[index]?.focus();
}
