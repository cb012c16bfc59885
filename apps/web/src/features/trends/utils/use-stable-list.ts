import { useState } from 'react';

/**
 * `list`, or the list returned before when it holds the same items (by `same`, in order): a
 * memoised value for lists rebuilt on every render.
 */
export function useStableList<T>(list: T[], same: (a: T, b: T) => boolean): T[] {
  const [kept, setKept] = useState(list);
  const equal = kept.length === list.length && kept.every((k, i) => same(k, list[i]!));
  if (!equal) setKept(list);
  return equal ? kept : list;
}
