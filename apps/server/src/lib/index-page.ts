/**
 * The web app's page (index.html), answered per request with what its first screen would
 * otherwise ask for one after the other: the session (the signed-in user, or null) as a JSON
 * data block the app reads instead of asking `/auth/session`, and — for a signed-in user —
 * `<link rel=modulepreload>` of the screen's code (from the build's module map) and
 * `<link rel=preload as=fetch>` of its first API request. So the code, the session and the
 * data of a direct load start with the HTML instead of after the main script has run.
 *
 * The page is personal: it is sent with `Cache-Control: no-store`. Its head is sent before
 * the session is looked up, so the shell's scripts load meanwhile. A JSON data block is not
 * a script to the browser (the CSP's script-src does not apply to it); it is escaped so that
 * no value can end the element (`</script>`) or open a comment.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Request, RequestHandler } from 'express';
import type { Me, SessionResponse } from '@turnstone/contracts/auth';
import { formatDate } from '@turnstone/contracts/dates';
import { WEEKS_AHEAD_DEFAULT } from '@turnstone/contracts/review';
import type { Role } from '@turnstone/contracts/roles';

/** The id of the session's data block; apps/web/src/features/auth/api/get-me.ts reads it. */
export const SESSION_ELEMENT_ID = 'turnstone-session';

const page = (name: string) => `apps/web/src/app/routes/app/${name}.tsx`;
const api = (feature: string, name: string) => `apps/web/src/features/${feature}/api/${name}.ts`;

interface Screen {
  path: RegExp;
  /**
   * Source modules (paths in the repo) whose scripts the screen loads first: its page (the
   * router's lazy route, apps/web/src/app/router.tsx) and the query modules its route loader
   * imports (apps/web/src/app/route-data.ts), or the schema its first answer is checked with.
   */
  modules: string[];
  /**
   * Its first API requests where the address alone names them (the very URL the page asks,
   * or the preload is wasted), for the roles they admit.
   */
  data?: (m: RegExpExecArray, query: URLSearchParams, user: Me) => string[];
  dataRoles?: readonly Role[];
}

/**
 * The trend a point's page opens on: overall velocity (or the band the address names) over
 * the default period, which the page asks without times (trends/api/get-trend.ts,
 * trendParams); none when the address opens another view or period.
 */
function openingTrend(pointId: string, q: URLSearchParams): string[] {
  if (q.has('view') || (q.get('period') ?? '90d') !== '90d') return [];
  const band = q.get('band') ?? 'overall-velocity';
  return /^[a-z0-9-]{1,64}$/.test(band) ? [`/api/v1/points/${pointId}/trend?band=${band}`] : [];
}

const SCREENS: Screen[] = [
  {
    path: /^\/(?:fleet)?$/,
    modules: [page('fleet')],
    data: () => ['/api/v1/fleet'],
  },
  { path: /^\/alerts$/, modules: [page('alerts'), api('alerts', 'get-alerts')] },
  {
    path: /^\/limits$/,
    modules: [page('limits'), 'packages/contracts/src/limits.ts'],
    data: (_m, q) => {
      const id = q.get('point');
      return id && /^[1-9]\d{0,9}$/.test(id)
        ? [`/api/v1/points/${id}/limits`, `/api/v1/points/${id}/limits/history`]
        : [];
    },
  },
  {
    path: /^\/review$/,
    modules: [
      page('review'),
      api('review', 'get-review'),
      api('review', 'get-sites'),
      api('findings', 'get-findings'),
    ],
    // The review opened without a week (the navigation's link): this week, ending today in the
    // user's zone, four weeks ahead, every site, as get-review.ts (reviewParamsFromSearch) and
    // get-findings.ts ask it. A review of a chosen week or site is left to the page.
    data: (_m, q, user) =>
      q.toString() === ''
        ? [
            `/api/v1/review?weekEnding=${formatDate(new Date(), user.timeZone)}&weeksAhead=${WEEKS_AHEAD_DEFAULT}`,
            '/api/v1/sites',
            '/api/v1/findings',
          ]
        : [],
    dataRoles: ['planner', 'engineer', 'admin'],
  },
  {
    path: /^\/setup$/,
    modules: [page('setup'), api('setup', 'get-setup')],
    data: () => ['/api/v1/setup'],
    dataRoles: ['admin', 'engineer'],
  },
  {
    path: /^\/gateways$/,
    modules: [page('gateways'), api('gateways', 'get-gateways')],
    data: () => ['/api/v1/gateways', '/api/v1/sites'],
    dataRoles: ['admin'],
  },
  { path: /^\/audit$/, modules: [page('audit')] },
  { path: /^\/uploads$/, modules: [page('uploads')] },
  {
    path: /^\/users$/,
    modules: [page('users'), api('users', 'get-users')],
    data: () => ['/api/v1/users'],
    dataRoles: ['admin'],
  },
  { path: /^\/integrations$/, modules: [page('integrations')] },
  { path: /^\/mailbox$/, modules: [page('mailbox'), api('mailbox', 'get-mailbox')] },
  { path: /^\/account$/, modules: [page('account')] },
  {
    path: /^\/machines\/([1-9]\d{0,9})$/,
    modules: [page('machine'), api('machines', 'get-machine')],
    data: (m) => [`/api/v1/machines/${m[1]}`],
  },
  {
    path: /^\/points\/([1-9]\d{0,9})$/,
    modules: [
      page('point'),
      api('points', 'get-point'),
      api('points', 'get-analyses'),
      api('trends', 'get-trend'),
      api('points', 'get-quality-notices'),
      api('machines', 'get-machine'),
      'apps/web/src/features/points/lib/spectrum-opening.ts',
    ],
    // get-analyses.ts (POINT_PAGE_ANALYSES), get-quality-notices.ts and get-trend.ts ask these
    data: (m, q) => [
      `/api/v1/points/${m[1]}`,
      `/api/v1/points/${m[1]}/analyses?limit=200`,
      `/api/v1/quality-notices?pointId=${m[1]}&limit=10`,
      ...openingTrend(m[1]!, q),
    ],
  },
];

/** Every source module the screens name (a test checks the build still has each). */
export const screenModules = (): string[] => [...new Set(SCREENS.flatMap((s) => s.modules))];

/** What a direct load of this address needs first: its modules, and its data for `user`. */
export function firstScreen(
  pathname: string,
  query: URLSearchParams,
  user: Me,
): { modules: string[]; data: string[] } | null {
  for (const s of SCREENS) {
    const m = s.path.exec(pathname);
    if (!m) continue;
    const admitted = !s.dataRoles || s.dataRoles.includes(user.role);
    return { modules: s.modules, data: admitted ? (s.data?.(m, query, user) ?? []) : [] };
  }
  return null;
}

/** JSON that is safe inside an HTML element: no `<`, `>`, `&` or line separators as such. */
export function jsonForHtml(value: unknown): string {
  return JSON.stringify(value).replace(
    /[<>&\u2028\u2029]/g,
    (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`,
  );
}

/** dist/.vite/modules.json, written by the build (vite.config.ts, moduleMap). */
interface ModuleMap {
  /** Source module (path in the repo) → the script it is in. */
  modules: Record<string, string>;
  /** Script → the scripts it imports statically. */
  imports: Record<string, string[]>;
}

/** The scripts these modules need: theirs and everything those import, each once. */
function scriptsOf(map: ModuleMap, modules: string[]): string[] {
  const files: string[] = [];
  const visit = (file: string) => {
    if (files.includes(file)) return;
    files.push(file);
    map.imports[file]?.forEach(visit);
  };
  for (const m of modules) {
    const file = map.modules[m];
    if (file) visit(file);
  }
  return files;
}

interface Built {
  mtimeMs: number;
  html: string;
  map: ModuleMap;
}

export interface IndexPageOptions {
  /** The session as `/auth/session` answers it for this request. */
  session: (req: Request) => Promise<SessionResponse>;
}

export function indexPage(dist: string, options: IndexPageOptions): RequestHandler {
  const indexFile = join(dist, 'index.html');
  const mapFile = join(dist, '.vite', 'modules.json');
  let built: Built | null = null;
  // Read once per build (a rebuild while running, as `npm run dev` does not, is picked up).
  const load = (): Built => {
    const mtimeMs = statSync(indexFile).mtimeMs;
    if (built?.mtimeMs === mtimeMs) return built;
    const map: ModuleMap = existsSync(mapFile)
      ? (JSON.parse(readFileSync(mapFile, 'utf8')) as ModuleMap)
      : { modules: {}, imports: {} };
    built = { mtimeMs, html: readFileSync(indexFile, 'utf8'), map };
    return built;
  };

  return (req, res, next) => {
    let page: Built;
    try {
      page = load();
    } catch (err) {
      return next(err);
    }
    // The head (the shell's scripts and styles) goes at once; the session and the screen's
    // preloads follow in the body when the session is known (modulepreload and preload are
    // allowed there). The app's module script runs only once the document is parsed.
    const body = page.html.indexOf('<body>');
    const cut = body < 0 ? 0 : body + '<body>'.length;
    res.setHeader('Cache-Control', 'no-store');
    res.type('html');
    res.write(page.html.slice(0, cut));
    (res as { flush?: () => void }).flush?.();
    const send = (tags: string) => res.end(`\n${tags}${page.html.slice(cut)}`);
    options.session(req).then(
      (session) => {
        const tags = [
          `<script type="application/json" id="${SESSION_ELEMENT_ID}">${jsonForHtml(session)}</script>`,
        ];
        const query = new URLSearchParams(req.originalUrl.split('?')[1] ?? '');
        const screen = session.user ? firstScreen(req.path, query, session.user) : null;
        if (screen) {
          for (const file of scriptsOf(page.map, screen.modules)) {
            if (page.html.includes(`/${file}"`)) continue;
            tags.push(`<link rel="modulepreload" crossorigin href="/${file}">`);
          }
          for (const url of screen.data)
            tags.push(`<link rel="preload" href="${url}" as="fetch" crossorigin="anonymous">`);
        }
        send(tags.join('\n'));
      },
      // The session could not be told (the database away): the page goes without it, and
      // the app asks `/auth/session` itself, which shows that error with a retry.
      () => send(''),
    );
  };
}
