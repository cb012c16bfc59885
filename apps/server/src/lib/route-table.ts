/**
 * Every dashboard route is declared in a table with the roles it admits. The table is the
 * one place access is decided, and the role × route test walks it, so a route added
 * without a rule cannot slip through.
 */
import type { Request, Response, NextFunction, Router } from 'express';
import type { z } from 'zod';
import type { Role } from '@turnstone/contracts/roles';
import { forbidden, unauthenticated } from './app-error.ts';
import { parseQuery, refuseAnyQuery } from './query.ts';
import type { SessionUser } from './session-user.ts';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
export const ALL_ROLES: readonly Role[] = ['admin', 'engineer', 'planner', 'operator'];

/**
 * The contracts schemas a route already parses or produces, so the OpenAPI document of
 * `/api/v1` (api-openapi.ts) is generated from them. Give the very schema objects the
 * handler uses, never a copy.
 */
export type SuccessStatus = 200 | 201 | 202 | 204 | 302;

export interface RouteSchemas {
  /** Path parameters (`idParam`); without it each `:name` is documented as a string. */
  params?: z.ZodType;
  /** Query parameters (parsed with `parseQuery`: an unknown one is a 400). */
  query?: z.ZodType;
  /** The JSON request body. */
  body?: z.ZodType;
  /** A multipart/form-data body instead: its text fields, and the name of its file field. */
  form?: { fields: z.ZodType; file: string };
  /** The JSON body of the success answer. */
  response?: z.ZodType;
  /** Status of the success answer: 200 unless said (201 for a creation, 202 accepted, 204 without a body, 302 a redirect). */
  status?: SuccessStatus | readonly SuccessStatus[];
  /** Media type of a success answer that is not JSON (a CSV or WAV download). */
  produces?: string;
}

export interface RouteSpec {
  method: Method;
  /** Express path below the router's mount point, e.g. `/alerts/:id/acknowledge`. */
  path: string;
  /** `public`: no session needed. Otherwise the roles that may call it. */
  access: 'public' | readonly Role[];
  /** Short description, shown in the matrix test's names. */
  summary: string;
  /** What it takes and answers, for the OpenAPI document; routes without it are listed bare. */
  schemas?: RouteSchemas;
  /**
   * A creating POST takes an `Idempotency-Key` (features/idempotency) unless `refused`:
   * for an answer holding a secret shown once, which a replay would have to keep.
   */
  idempotency?: 'refused';
  handler: (req: Request, res: Response) => unknown;
}

/** One feature's routes under the tag that groups them in the OpenAPI document. */
export interface RouteGroup {
  tag: string;
  description: string;
  routes: RouteSpec[];
}

export type Authenticate = (req: Request) => Promise<void>;

export function mountRoutes(router: Router, specs: RouteSpec[], authenticate: Authenticate): void {
  for (const spec of specs) {
    const guard = async (req: Request, _res: Response, next: NextFunction) => {
      if (spec.access === 'public') return next();
      await authenticate(req);
      if (!req.user) throw unauthenticated();
      if (!spec.access.includes(req.user.role)) throw forbidden();
      next();
    };
    router[spec.method](spec.path, guard, async (req: Request, res: Response) => {
      // A route without a query schema takes no query parameters: one sent is a 400, so a
      // filter a client believes in (`?siteId=2` on a route without it) is never ignored.
      if (!spec.schemas?.query) refuseAnyQuery(req.query);
      await spec.handler(req, res);
    });
  }
}

export function requireUser(req: Request) {
  if (!req.user) throw unauthenticated();
  return req.user;
}

type Parsed<T> = T extends z.ZodType ? z.output<T> : undefined;

/** What a `serviceRoute` hands its service call: the caller and the parsed request. */
export interface RouteInput<S extends RouteSchemas> {
  /** The signed-in user (read on a public route it is a 401). */
  readonly user: SessionUser;
  params: Parsed<S['params']>;
  query: Parsed<S['query']>;
  body: Parsed<S['body']>;
}

/** The declared schemas parse params, query (unknown names are a 400) and body, in that order. */
function routeInput<S extends RouteSchemas>(schemas: S, req: Request): RouteInput<S> {
  const { params, query, body } = schemas;
  return {
    get user() {
      return requireUser(req);
    },
    params: params?.parse(req.params),
    query: query && parseQuery(query, req.query),
    body: body?.parse(req.body),
  } as RouteInput<S>;
}

/** A route whose answer is its service's result as JSON (or nothing, for a 204). */
export interface ServiceRouteSpec<S extends RouteSchemas> extends Omit<
  RouteSpec,
  'schemas' | 'handler'
> {
  schemas: S & { status?: 200 | 201 | 202 | 204 };
  /** Headers of the answer, set once the request parsed, before the service runs. */
  headers?: Record<string, string>;
  run: (input: RouteInput<S>) => unknown;
}

/**
 * The common route: the declared schemas parse the request, `run` calls the service, and
 * its result, parsed with the declared `response` schema, is the answer with the declared
 * status. The table is the one place an answer is held to its schema: what the service
 * returns beyond it (a stored secret, a column the contract does not name) is dropped, and
 * an answer that breaks it is a 500, never sent. Routes that answer otherwise (files,
 * redirects) use `fileRoute` or write their own handler.
 */
export function serviceRoute<const S extends RouteSchemas>(route: ServiceRouteSpec<S>): RouteSpec {
  const { run, headers, ...spec } = route;
  const { response, status = 200 } = route.schemas;
  return {
    ...spec,
    handler: async (req, res) => {
      const input = routeInput(route.schemas, req);
      for (const [name, value] of Object.entries(headers ?? {})) res.setHeader(name, value);
      const answer = await run(input);
      if (status === 204) res.status(204).end();
      else res.status(status).json(response ? response.parse(answer) : answer);
    },
  };
}

/** A file a `fileRoute` answers: its name for the download, and its text or its bytes. */
export type FileAnswer = { fileName: string } & ({ text: string } | { bytes: Uint8Array });

/** A route whose answer is a file download (a CSV, a WAV) rather than JSON. */
export interface FileRouteSpec<S extends RouteSchemas> extends Omit<
  RouteSpec,
  'schemas' | 'handler'
> {
  schemas: S & { produces: string };
  /** The Content-Type header (`produces` with its parameters, e.g. a charset). */
  contentType: string;
  run: (input: RouteInput<S>) => Promise<FileAnswer>;
}

/**
 * A download: the request is parsed as for `serviceRoute`, `run` makes the file, and the
 * answer is an attachment under the file's name (quoted, with RFC 6266's `filename*` beside
 * it for names beyond ASCII), private to the caller and never stored by a cache.
 */
export function fileRoute<const S extends RouteSchemas>(route: FileRouteSpec<S>): RouteSpec {
  const { run, contentType, ...spec } = route;
  return {
    ...spec,
    handler: async (req, res) => {
      const file = await run(routeInput(route.schemas, req));
      res.setHeader('Content-Type', contentType);
      res.setHeader(
        'Content-Disposition',
        `attachment; filename="${file.fileName}"; filename*=UTF-8''${encodeURIComponent(file.fileName)}`,
      );
      res.setHeader('Cache-Control', 'private, no-store');
      if ('text' in file) res.send(file.text);
      else res.send(Buffer.from(file.bytes.buffer, file.bytes.byteOffset, file.bytes.byteLength));
    },
  };
}
