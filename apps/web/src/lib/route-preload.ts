/**
 * Loading a screen before it is opened: its code and its data, when the user shows the
 * intent to open it (pointer over or focus on a link) or when a screen knows the likely next
 * one (an alert's point). The router registers how (`setRoutePreloader`); features only name
 * the address, so they need not know the routes.
 */
/** Loads the screen at `href`: its code, and its data unless `data` is false. */
type Preloader = (href: string, data?: boolean) => void;

let preloader: Preloader | null = null;
let last = '';
let lastAt = 0;

export function setRoutePreloader(p: Preloader): void {
  preloader = p;
}

/**
 * Starts loading the screen at `href` (a same-origin path). The pointer passing over a link
 * fires many events: the same address within two seconds is asked once. Data already fresh
 * in the cache is not asked again (the queries' staleTime), code once loaded stays.
 */
export function preloadRoute(href: string): void {
  const now = Date.now();
  if (href === last && now - lastAt < 2000) return;
  last = href;
  lastAt = now;
  preloader?.(href);
}

/**
 * Preloads the screen of any in-app link the pointer rests on or the keyboard focuses,
 * wherever it is in the page. Returns a function that stops listening.
 */
export function preloadLinksOnIntent(root: Document = document): () => void {
  const onIntent = (event: Event) => {
    const link = (event.target as Element | null)?.closest?.('a[href]');
    if (!(link instanceof HTMLAnchorElement)) return;
    if (link.origin !== window.location.origin || link.target || link.hasAttribute('download'))
      return;
    if (link.pathname.startsWith('/api/')) return;
    preloadRoute(`${link.pathname}${link.search}`);
  };
  root.addEventListener('pointerover', onIntent, { passive: true });
  root.addEventListener('focusin', onIntent);
  return () => {
    root.removeEventListener('pointerover', onIntent);
    root.removeEventListener('focusin', onIntent);
  };
}

/**
 * Loads the code (not the data) of the screens the main navigation links to, one screen per
 * idle moment, once the page has loaded and `busy` (a screen's code or data on its way) is
 * over: the screen a user opens next from the navigation, or by an address (a point's limits),
 * then waits only for its data. Returns a function that stops it.
 */
export function preloadNavigationCode(busy: () => boolean, root: Document = document): () => void {
  const idle = (fn: () => void): (() => void) => {
    if (typeof window.requestIdleCallback === 'function') {
      const id = window.requestIdleCallback(fn, { timeout: 2000 });
      return () => window.cancelIdleCallback(id);
    }
    const id = window.setTimeout(fn, 200);
    return () => window.clearTimeout(id);
  };
  const done = new Set<string>();
  let cancel = () => {};
  // Pages without the navigation (sign-in) are looked at a few times, then left alone.
  let looks = 20;
  const next = () => {
    if (busy()) {
      cancel = idle(next);
      return;
    }
    const link = [...root.querySelectorAll<HTMLAnchorElement>('nav a[href]')].find(
      (a) => a.origin === window.location.origin && !done.has(a.pathname),
    );
    if (!link) {
      if (done.size === 0 && --looks > 0) cancel = idle(next);
      return;
    }
    done.add(link.pathname);
    preloader?.(link.pathname, false);
    cancel = idle(next);
  };
  const start = () => {
    cancel = idle(next);
  };
  if (root.readyState === 'complete') start();
  else window.addEventListener('load', start, { once: true });
  return () => {
    window.removeEventListener('load', start);
    cancel();
  };
}
