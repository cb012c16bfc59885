import type { RequestListener } from 'node:http';
import express, { Router, type Request, type Response, type NextFunction } from 'express';
import cookieParser from 'cookie-parser';
import helmet from 'helmet';
import compression from 'compression';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { AppContext } from './lib/context.ts';
import { precompressedAssets } from './lib/precompressed-assets.ts';
import { indexPage } from './lib/index-page.ts';
import { AppError } from './lib/app-error.ts';
import { apiNotFound, errorMiddleware } from './lib/error-middleware.ts';
import { mountRoutes, type RouteGroup, type RouteSpec } from './lib/route-table.ts';
import { webDist } from './lib/web-build.ts';
import { trackRequest } from './lib/request-log.ts';
import { hostCheck } from './lib/allowed-hosts.ts';
import { readRouting } from './lib/read-routing.ts';
import {
  authRouter,
  authRoutes,
  createAuthenticate,
  sessionOf,
} from './features/auth/auth-router.ts';
import { fleetRoutes } from './features/fleet/fleet-router.ts';
import { healthRouter } from './features/health/health-router.ts';
import { metricsRouter } from './features/metrics/metrics-router.ts';
import { gatewayRoutes } from './features/gateways/gateways-router.ts';
import { retentionRoutes } from './features/retention/retention-router.ts';
import { ingestRouter } from './features/ingest/ingest-router.ts';
import { ingestEndpoint } from './features/ingest/ingest-endpoint.ts';
import { uploadRoutes } from './features/uploads/uploads-router.ts';
import { alertRoutes } from './features/alerts/alerts-router.ts';
import { limitRoutes } from './features/limits/limits-router.ts';
import { setupRoutes } from './features/setup/setup-router.ts';
import { auditRoutes } from './features/audit/audit-router.ts';
import { pointRoutes } from './features/points/points-router.ts';
import { machineRoutes } from './features/machines/machines-router.ts';
import { reviewRoutes } from './features/review/review-router.ts';
import { findingRoutes } from './features/findings/findings-router.ts';
import { qualityRoutes } from './features/quality/quality-router.ts';
import { userLinkRoutes, userRoutes } from './features/users/users-router.ts';
import { accountRoutes } from './features/account/account-router.ts';
import { mailboxRoutes } from './features/mailbox/mailbox-router.ts';
import { apiTokenRoutes } from './features/api-tokens/api-tokens-router.ts';
import { userFromApiToken } from './features/api-tokens/api-tokens-service.ts';
import { idempotentHandler, isCreating } from './features/idempotency/idempotent-route.ts';
import { webhookRoutes } from './features/webhooks/webhooks-router.ts';
import { apiDocsRoutes } from './features/api-docs/api-docs-router.ts';

/** The feature routes below /api/v1, by feature (auth mounts its own, behind its rate limiters). */
function featureRouteGroups(ctx: AppContext): RouteGroup[] {
  return [
    { tag: 'fleet', description: 'Sites and the fleet tree.', routes: fleetRoutes(ctx) },
    { tag: 'gateways', description: 'Field gateways and their keys.', routes: gatewayRoutes(ctx) },
    {
      tag: 'retention',
      description: 'The retention policy in force (read-only).',
      routes: retentionRoutes(ctx),
    },
    { tag: 'uploads', description: 'Captures uploaded by hand.', routes: uploadRoutes(ctx) },
    { tag: 'alerts', description: 'Alerts and their acknowledgement.', routes: alertRoutes(ctx) },
    { tag: 'limits', description: 'Alarm limits and templates.', routes: limitRoutes(ctx) },
    {
      tag: 'points',
      description: 'Machines, points, analyses, trends, spectra and waveforms.',
      routes: [...pointRoutes(ctx), ...machineRoutes(ctx)],
    },
    { tag: 'setup', description: 'Sites, areas, machines and points.', routes: setupRoutes(ctx) },
    { tag: 'audit', description: 'The audit log.', routes: auditRoutes(ctx) },
    { tag: 'review', description: 'The weekly review.', routes: reviewRoutes(ctx) },
    { tag: 'findings', description: 'Follow-ups and work orders.', routes: findingRoutes(ctx) },
    {
      tag: 'quality',
      description: 'Data-quality notices and their review.',
      routes: qualityRoutes(ctx),
    },
    {
      tag: 'users',
      description: 'Accounts and their site links.',
      routes: [...userRoutes(ctx), ...userLinkRoutes(ctx)],
    },
    {
      tag: 'api-tokens',
      description: 'API tokens of service accounts (Authorization: Bearer).',
      routes: apiTokenRoutes(ctx),
    },
    {
      tag: 'webhooks',
      description: 'Outgoing webhooks: alert and finding events posted to a receiver, signed.',
      routes: webhookRoutes(ctx),
    },
    {
      tag: 'account',
      description: "The signed-in person's own account.",
      routes: accountRoutes(ctx),
    },
    {
      tag: 'mailbox',
      description: 'Mail the product sent (the local mailbox).',
      routes: mailboxRoutes(ctx),
    },
    {
      tag: 'api',
      description: 'This description of the API.',
      routes: apiDocsRoutes(ctx, () => dashboardRouteGroups(ctx)),
    },
  ];
}

/** Who is calling: a session cookie (auth) or an API token (api-tokens looks the token up). */
const authenticateFor = (ctx: AppContext) =>
  createAuthenticate(ctx, (token) => userFromApiToken(ctx, token));

/** Every dashboard route below /api/v1 by feature: the OpenAPI document's source. */
export function dashboardRouteGroups(ctx: AppContext): RouteGroup[] {
  return [
    {
      tag: 'auth',
      description: 'Sign-in, sign-out and the session.',
      routes: authRoutes(ctx, authenticateFor(ctx)),
    },
    ...featureRouteGroups(ctx),
  ];
}

/** Every dashboard route below /api/v1: the access table the role × route test walks. */
export function dashboardRoutes(ctx: AppContext): RouteSpec[] {
  return dashboardRouteGroups(ctx).flatMap((g) => g.routes);
}

/**
 * Cookie-authenticated writes must come from our own origin (OWASP ASVS 5.0 3.5): a
 * browser always sends Origin on cross-site POST/PUT/PATCH/DELETE, so compare it to Host.
 */
function sameOriginWrites(req: Request, _res: Response, next: NextFunction) {
  if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
  const origin = req.get('origin');
  if (!origin) return next();
  let host: string;
  try {
    host = new URL(origin).host;
  } catch {
    return next(new AppError('cross_origin', 'The request came from another origin.', 403));
  }
  const forwarded = req.app.get('trust proxy') ? req.get('x-forwarded-host') : undefined;
  if (host !== (forwarded ?? req.get('host'))) {
    return next(new AppError('cross_origin', 'The request came from another origin.', 403));
  }
  next();
}

export function createApp(ctx: AppContext) {
  const app = express();
  app.disable('x-powered-by');
  // Checked and converted in config.ts (a value Express refuses would fail only here).
  if (ctx.config.TRUST_PROXY !== undefined) app.set('trust proxy', ctx.config.TRUST_PROXY);
  app.use((req, res, next) => {
    req.requestId = trackRequest(ctx.log, req, res, () => req.path);
    next();
  });
  // The gateways' machine-to-machine API comes before the browser middleware: helmet's
  // page headers (CSP, frame and referrer policy…) mean nothing to a gateway and gzip does
  // not pay for answers of a hundred bytes. (Its POST never reaches Express: httpHandler.)
  app.use('/api/ingest/v1', ingestRouter(ctx.config));
  // Browser-facing routes answer only to the names this server is known by (gateways
  // authenticate with a key, which a rebound page does not have).
  app.use(hostCheck(ctx.config));
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // React and ECharts set style attributes; no external style source is allowed.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
        },
      },
      strictTransportSecurity: ctx.config.COOKIE_SECURE,
    }),
  );

  app.use(compression());

  const authenticate = authenticateFor(ctx);
  const api = Router();
  api.use(express.json({ limit: '1mb' }));
  api.use(cookieParser());
  api.use(sameOriginWrites);
  if (ctx.config.DATABASE_REPLICA_URLS.length > 0) api.use(readRouting(ctx.config));
  api.use(authRouter(ctx, authenticate));
  mountRoutes(
    api,
    featureRouteGroups(ctx)
      .flatMap((g) => g.routes)
      .map((spec) =>
        isCreating(spec) ? { ...spec, handler: idempotentHandler(ctx, spec) } : spec,
      ),
    authenticate,
  );
  app.use('/api', healthRouter(ctx));
  app.use(metricsRouter(ctx, authenticate));
  app.use('/api/v1', api);
  app.use('/api', apiNotFound);

  if (existsSync(join(webDist, 'index.html'))) {
    // Built assets carry a content hash in their name: a changed file gets a new name, so
    // browsers keep them for a year without asking again. They go as the build compressed
    // them (lib/precompressed-assets.ts). A missing one is a 404 (not the
    // page), so a stale tab's script import fails plainly instead of parsing HTML.
    app.use(
      '/assets',
      precompressedAssets(join(webDist, 'assets')),
      express.static(join(webDist, 'assets'), { index: false, immutable: true, maxAge: '365d' }),
      (_req: Request, res: Response) => {
        res.status(404).json({ error: { code: 'not_found', message: 'No such asset.' } });
      },
    );
    app.use(express.static(webDist, { index: false, maxAge: '1h' }));
    // The page carries the session and starts the first screen's code and data with itself.
    app.get(/.*/, cookieParser(), indexPage(webDist, { session: sessionOf(ctx, authenticate) }));
  }
  app.use((_req, res) => {
    res.status(404).json({ error: { code: 'not_found', message: 'Not found.' } });
  });
  app.use(errorMiddleware(ctx.log));
  return app;
}

/**
 * The server's request listener: gateways' snapshot posts go to the ingest endpoint on
 * node:http directly (the hot path, see ingest-endpoint.ts), everything else to Express.
 */
export function httpHandler(ctx: AppContext): RequestListener {
  const app = createApp(ctx);
  const ingest = ingestEndpoint(ctx);
  return (req, res) => {
    if (!ingest(req, res)) app(req, res);
  };
}
