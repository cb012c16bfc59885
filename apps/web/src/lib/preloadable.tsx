import { lazy, type ComponentType } from 'react';

/**
 * A view whose code loads on demand, like `React.lazy`, with a `preload` to ask for it early
 * (on the intent to open it, or once the page has settled). Once the code is here the view
 * renders it directly: `lazy` would still suspend on its first render, and React holds a
 * Suspense fallback on screen for up to 300 ms before it shows what came, which a view whose
 * code was preloaded would wait for nothing.
 */
export function preloadable<M, P extends object>(
  load: () => Promise<M>,
  pick: (m: M) => ComponentType<P>,
): { View: ComponentType<P>; preload: () => Promise<unknown> } {
  let loaded: ComponentType<P> | null = null;
  const preload = () =>
    load().then((m) => {
      loaded = pick(m);
      return m;
    });
  const Lazy = lazy(() => preload().then((m) => ({ default: pick(m) })));
  function View(props: P) {
    const Loaded = loaded;
    return Loaded ? <Loaded {...props} /> : <Lazy {...props} />;
  }
  return { View, preload };
}
