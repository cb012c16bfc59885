/**
 * The OpenAPI 3.1 document of the dashboard API `/api/v1`, generated from the route table:
 * every `RouteSpec` becomes an operation (its method, path, summary and roles), described
 * with the contracts schemas it declares (`RouteSpec.schemas`). Nothing here is written by
 * hand per route, so a route and its description cannot drift apart.
 */
import * as account from '@turnstone/contracts/account';
import * as alerts from '@turnstone/contracts/alerts';
import * as apiTokens from '@turnstone/contracts/api-tokens';
import * as audit from '@turnstone/contracts/audit';
import * as auth from '@turnstone/contracts/auth';
import * as findings from '@turnstone/contracts/findings';
import * as fleet from '@turnstone/contracts/fleet';
import * as gateways from '@turnstone/contracts/gateways';
import * as limits from '@turnstone/contracts/limits';
import * as machineAttention from '@turnstone/contracts/machine-attention';
import * as mail from '@turnstone/contracts/mail';
import * as paging from '@turnstone/contracts/paging';
import * as pins from '@turnstone/contracts/pins';
import * as points from '@turnstone/contracts/points';
import * as quality from '@turnstone/contracts/quality';
import * as retention from '@turnstone/contracts/retention';
import * as review from '@turnstone/contracts/review';
import * as roles from '@turnstone/contracts/roles';
import * as setup from '@turnstone/contracts/setup';
import * as trend from '@turnstone/contracts/trend';
import * as units from '@turnstone/contracts/units';
import * as uploads from '@turnstone/contracts/uploads';
import * as users from '@turnstone/contracts/users';
import * as waterfall from '@turnstone/contracts/waterfall';
import * as webhooks from '@turnstone/contracts/webhooks';
import { ALL_ROLES, type Method, type RouteGroup, type RouteSpec } from '../../lib/route-table.ts';
import { SchemaComponents, errorAnswer, errorComponent, jsonSchema } from '../../lib/openapi.ts';
import { COOKIE_NAME } from '../auth/session-token.ts';
import { IDEMPOTENCY_HEADER, takesIdempotencyKey } from '../idempotency/idempotent-route.ts';

const WRITES: readonly Method[] = ['post', 'put', 'patch', 'delete'];

/** `/alerts/:id/acknowledge` → `/alerts/{id}/acknowledge`. */
export const openApiPath = (path: string) => path.replace(/:(\w+)/g, '{$1}');

/** A stable, unique name per method and path: `get /alerts/:id` → `getAlertsById`. */
export function operationId(method: Method, path: string): string {
  const words = path
    .split('/')
    .filter(Boolean)
    .flatMap((seg) => (seg.startsWith(':') ? ['by', seg.slice(1)] : seg.split(/[^A-Za-z0-9]+/)))
    .filter(Boolean);
  return method + words.map((w) => w[0]!.toUpperCase() + w.slice(1)).join('');
}

/** The contract modules whose named schemas are the document's `components.schemas`. */
const CONTRACTS = {
  account,
  alerts,
  apiTokens,
  audit,
  auth,
  findings,
  fleet,
  gateways,
  limits,
  machineAttention,
  mail,
  paging,
  pins,
  points,
  quality,
  retention,
  review,
  roles,
  setup,
  trend,
  units,
  uploads,
  users,
  waterfall,
  webhooks,
};

/**
 * Every error answer an operation may give, declared once in `components.responses`; an
 * operation names the ones it gives by `$ref`.
 */
const ERROR_ANSWERS = {
  InvalidRequest:
    'Invalid request: `validation_failed` (details name each field: `[{ path, message }]`), `invalid_json`, `unknown_query_parameter`, `invalid_cursor`, or a rule of the operation.',
  Unauthenticated:
    '`unauthenticated`: no valid session; `invalid_token`: the bearer token is unknown or revoked.',
  Forbidden: '`forbidden`: the role may not do this, or the site is not yours.',
  ForbiddenWrite:
    '`forbidden`: the role may not do this, or the site is not yours. `cross_origin`: the Origin header names another host.',
  CrossOrigin: '`cross_origin`: the Origin header names another host.',
  NotFound: '`not_found`.',
  IdempotencyKeyInUse:
    '`idempotency_key_in_use`: a request with this Idempotency-Key is still being answered (Retry-After), or a rule of the operation.',
  IdempotencyKeyReused:
    '`idempotency_key_reused`: the Idempotency-Key was used for another request.',
  DatabaseUnavailable:
    '`db_unavailable`: the database is away; retry after the Retry-After seconds.',
  OtherError: 'Any other error, in the same shape.',
} as const;

const answer = (name: keyof typeof ERROR_ANSWERS) => ({
  $ref: `#/components/responses/${name}`,
});

const IDEMPOTENCY_PARAMETER = {
  name: IDEMPOTENCY_HEADER,
  in: 'header',
  required: false,
  description:
    'Makes the creation safe to retry: the same key with the same request is answered the first answer again (`Idempotent-Replayed: true`); with another request, 422. Kept 24 hours by default (IDEMPOTENCY_KEY_HOURS), per account.',
  schema: { type: 'string', minLength: 1, maxLength: 255, pattern: '^[\\x21-\\x7e]+$' },
};

function parameters(spec: RouteSpec) {
  const out: Record<string, unknown>[] = [];
  const params = spec.schemas?.params ? jsonSchema(spec.schemas.params) : null;
  const paramProps = (params?.properties ?? {}) as Record<string, Record<string, unknown>>;
  for (const [, name] of spec.path.matchAll(/:(\w+)/g)) {
    out.push({
      name,
      in: 'path',
      required: true,
      schema: paramProps[name!] ?? { type: 'string' },
    });
  }
  if (takesIdempotencyKey(spec)) out.push({ $ref: '#/components/parameters/IdempotencyKey' });
  if (spec.schemas?.query) {
    const q = jsonSchema(spec.schemas.query);
    const required = new Set((q.required as string[] | undefined) ?? []);
    for (const [name, schema] of Object.entries(
      (q.properties ?? {}) as Record<string, Record<string, unknown>>,
    )) {
      const { description, ...rest } = schema;
      out.push({
        name,
        in: 'query',
        required: required.has(name),
        ...(typeof description === 'string' ? { description } : {}),
        schema: rest,
      });
    }
  }
  return out;
}

function successAnswer(spec: RouteSpec, c: SchemaComponents) {
  const s = spec.schemas ?? {};
  const statuses = [s.status ?? 200].flat();
  const answer = (status: number) => {
    if (status === 204) return { description: 'Done; no body.' };
    if (status === 302) return { description: 'A redirect to the page (Location header).' };
    if (s.produces)
      return {
        description: `A file (${s.produces}).`,
        content: { [s.produces]: { schema: { type: 'string', format: 'binary' } } },
      };
    if (s.response)
      return {
        description: 'Success.',
        content: { 'application/json': { schema: c.ref(s.response, 'output') } },
      };
    return {
      description: 'Success: a JSON body not yet described by a schema.',
      content: { 'application/json': {} },
    };
  };
  return Object.fromEntries(statuses.map((status) => [String(status), answer(status)]));
}

function requestBody(s: NonNullable<RouteSpec['schemas']>, c: SchemaComponents) {
  if (s.body)
    return {
      requestBody: {
        required: true,
        content: { 'application/json': { schema: c.ref(s.body, 'input') } },
      },
    };
  if (s.form) {
    const fields = jsonSchema(s.form.fields, 'input');
    return {
      requestBody: {
        required: true,
        content: {
          'multipart/form-data': {
            schema: {
              ...fields,
              properties: {
                ...(fields.properties as object),
                [s.form.file]: { type: 'string', format: 'binary' },
              },
              required: [...((fields.required as string[] | undefined) ?? []), s.form.file],
            },
          },
        },
      },
    };
  }
  return {};
}

function operation(spec: RouteSpec, tag: string, c: SchemaComponents) {
  const isPublic = spec.access === 'public';
  const roles = isPublic ? [] : [...spec.access];
  const isWrite = WRITES.includes(spec.method);
  const s = spec.schemas ?? {};
  const responses: Record<string, unknown> = { ...successAnswer(spec, c) };
  if (s.body || s.form || s.query || s.params || spec.path.includes(':'))
    responses['400'] = answer('InvalidRequest');
  if (!isPublic) responses['401'] = answer('Unauthenticated');
  if (!isPublic || isWrite)
    responses['403'] = answer(isPublic ? 'CrossOrigin' : isWrite ? 'ForbiddenWrite' : 'Forbidden');
  if (spec.path.includes(':')) responses['404'] = answer('NotFound');
  if (takesIdempotencyKey(spec)) {
    responses['409'] ??= answer('IdempotencyKeyInUse');
    responses['422'] = answer('IdempotencyKeyReused');
  }
  responses['503'] = answer('DatabaseUnavailable');
  responses.default = answer('OtherError');
  const summary = spec.summary[0]!.toUpperCase() + spec.summary.slice(1);
  return {
    operationId: operationId(spec.method, spec.path),
    summary,
    description: isPublic
      ? 'No session needed.'
      : `Roles: ${roles.join(', ')}${roles.length === ALL_ROLES.length ? ' (every role)' : ''}.`,
    tags: [tag],
    'x-roles': isPublic ? 'public' : roles,
    ...(isPublic ? { security: [] } : {}),
    ...(parameters(spec).length ? { parameters: parameters(spec) } : {}),
    ...requestBody(s, c),
    responses,
  };
}

const DESCRIPTION = [
  'The API behind the Turnstone screens: fleet, alerts, points and their trends, findings, the audit log, setup.',
  '',
  `**Authentication**: a person's session cookie \`${COOKIE_NAME}\` that \`POST /auth/sign-in\` sets (HttpOnly, SameSite=Lax), or a service account's API token as \`Authorization: Bearer <token>\` (issued by an administrator on the API tokens screen or \`POST /api-tokens\`, with a role and sites; shown once; independent of any person's sessions; revocable). Each operation lists the roles it admits in \`x-roles\` (and its description); any other role gets 403 \`forbidden\`, no session 401 \`unauthenticated\`. Data of sites a user is not assigned to answers 403 or is left out of lists.`,
  '',
  "**Writes** (POST, PUT, PATCH, DELETE) must come from this server's own origin: a request whose `Origin` header names another host than `Host` (or `X-Forwarded-Host` behind a trusted proxy) gets 403 `cross_origin`. A client that sends no `Origin` (not a browser) is not affected.",
  '',
  '**Paging**: the alerts and findings lists answer a page with `nextCursor` (null on the last page); pass it back as `cursor`, with the same filters, for the next page. Cursors are opaque (at most 64 characters) and position by (time, id), newest first, so rows arriving meanwhile are neither repeated nor skipped within a walk; `since` keeps rows at or after an instant (alerts: last activity; findings: last change, `updatedAt`). The audit log pages the same way by its own `nextCursor` (newest first) and takes `since` (written at or after) as well as `from`/`to`. A cursor the server did not issue is a 400.',
  '',
  '**Retries**: creating POSTs take an `Idempotency-Key` header (see each operation): send the same key again when an answer was lost, and the first answer comes back instead of a second creation.',
  '',
  '**Errors** all have one shape, `{ "error": { "code", "message", "details"? } }` (`components.schemas.Error`). Query parameters an operation does not know are a 400 `unknown_query_parameter`, never ignored.',
  '',
  'This document is generated from the server\'s route table and its zod schemas; an operation whose success answer says "not yet described" has no schema declared yet.',
].join('\n');

let cached: { paths: object; tags: object[]; schemas: object } | null = null;

/** The document, with `serverUrl` (absolute) as its server. */
export function apiOpenApi(groups: () => RouteGroup[], serverUrl: string): object {
  if (!cached) {
    const paths: Record<string, Record<string, unknown>> = {};
    const tags: object[] = [];
    const components = new SchemaComponents(CONTRACTS);
    for (const group of groups()) {
      tags.push({ name: group.tag, description: group.description });
      for (const spec of group.routes) {
        const p = (paths[openApiPath(spec.path)] ??= {});
        p[spec.method] = operation(spec, group.tag, components);
      }
    }
    cached = { tags, ...components.settle(paths) };
  }
  return {
    openapi: '3.1.0',
    info: { title: 'Turnstone dashboard API', version: '1.0.0', description: DESCRIPTION },
    servers: [{ url: serverUrl, description: 'This Turnstone server' }],
    tags: cached.tags,
    components: {
      securitySchemes: {
        apiToken: {
          type: 'http',
          scheme: 'bearer',
          description:
            "A service account's API token (`tst_…`), issued by an administrator with a role and sites.",
        },
        sessionCookie: {
          type: 'apiKey',
          in: 'cookie',
          name: COOKIE_NAME,
          description: 'The session a person gets by signing in (POST /auth/sign-in).',
        },
      },
      parameters: { IdempotencyKey: IDEMPOTENCY_PARAMETER },
      responses: Object.fromEntries(
        Object.entries(ERROR_ANSWERS).map(([name, text]) => [name, errorAnswer(text)]),
      ),
      schemas: { Error: errorComponent(), ...cached.schemas },
    },
    security: [{ sessionCookie: [] }, { apiToken: [] }],
    paths: cached.paths,
  };
}
