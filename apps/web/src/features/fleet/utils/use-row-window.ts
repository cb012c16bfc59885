import { useLayoutEffect, useMemo, useState, type RefObject } from 'react';

/** One rendered row: its index in the list, its top within the list and its height (px). */
export interface RowSlot {
  index: number;
  start: number;
  size: number;
}

/** The last index whose row starts at or above `y` (rows start at `starts[i]`). */
function rowAt(starts: readonly number[], count: number, y: number): number {
  let lo = 0;
  let hi = count - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (starts[mid]! <= y) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * The rows of a long list that are in view of its scroll container, plus `overscan` rows on
 * each side: only those are rendered, so a plant of thousands of machines stays fast. Each
 * row's height is given (the fleet tree's rows have one height per kind), so nothing is
 * measured and the positions are exact; the first screen needs no windowing library.
 *
 * `firstVisible` is the row at the top of the view; `scrollToIndex` scrolls as little as
 * needed to bring a row fully into view (as the keyboard moves through the list).
 */
export function useRowWindow(
  sizes: readonly number[],
  scrollRef: RefObject<HTMLElement | null>,
  overscan: number,
) {
  const starts = useMemo(() => {
    const out = [0];
    for (const size of sizes) out.push(out[out.length - 1]! + size);
    return out;
  }, [sizes]);
  // Before the container is measured: the window's height, which it cannot exceed.
  const [view, setView] = useState(() => ({ top: 0, height: window.innerHeight }));

  useLayoutEffect(() => {
    const el = scrollRef.current;
    if (!el) return;
    const read = () =>
      setView((v) =>
        v.top === el.scrollTop && v.height === el.clientHeight
          ? v
          : { top: el.scrollTop, height: el.clientHeight },
      );
    read();
    el.addEventListener('scroll', read, { passive: true });
    const resized = new ResizeObserver(read);
    resized.observe(el);
    return () => {
      el.removeEventListener('scroll', read);
      resized.disconnect();
    };
  }, [scrollRef]);

  const count = sizes.length;
  const totalSize = starts[count]!;
  const firstVisible = count === 0 ? 0 : rowAt(starts, count, view.top);
  const lastVisible = count === 0 ? -1 : rowAt(starts, count, view.top + view.height);
  const slots: RowSlot[] = [];
  const from = Math.max(0, firstVisible - overscan);
  const to = Math.min(count - 1, lastVisible + overscan);
  for (let index = from; index <= to; index++)
    slots.push({ index, start: starts[index]!, size: sizes[index]! });

  function scrollToIndex(index: number) {
    const el = scrollRef.current;
    if (!el || index < 0 || index >= count) return;
    const top = starts[index]!;
    const bottom = starts[index + 1]!;
    if (top < el.scrollTop) el.scrollTop = top;
    else if (bottom > el.scrollTop + el.clientHeight) el.scrollTop = bottom - el.clientHeight;
  }

  return { slots, totalSize, firstVisible, scrollToIndex };
}
