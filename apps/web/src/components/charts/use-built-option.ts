import { useState } from 'react';

/**
 * `build(input)`, built again only when one of the input's values changes (each compared with
 * Object.is, as useMemo compares its dependencies). A chart's option that stays the same
 * object across re-renders keeps the chart's zoom, so pass memoised arrays and objects.
 */
export function useBuiltOption<I extends object, O>(build: (input: I) => O, input: I): O {
  const [kept, setKept] = useState(() => ({ input, output: build(input) }));
  if (sameValues(kept.input, input)) return kept.output;
  // Stored during render, as React's "information from previous renders" pattern does.
  const next = { input, output: build(input) };
  setKept(next);
  return next.output;
}

function sameValues(a: object, b: object): boolean {
  const keys = Object.keys(a);
  return (
    keys.length === Object.keys(b).length &&
    keys.every((k) => Object.is(a[k as keyof typeof a], b[k as keyof typeof b]))
  );
}
