/**
 * Loading a screen before it is opened: its code and its data, when the user shows the
 * intent to open it (pointer over or focus on a link) or when a screen knows the likely next
 * one (an alert's point). The router registers how (`setRoutePreloader`); features only name
 * the address, so they need not know the routes.
 */
type Preloader = (href: string) => void;

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
