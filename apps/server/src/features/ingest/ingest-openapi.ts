import {
  ingestBatchResponseSchema,
  ingestBodySchema,
  ingestResultSchema,
  snapshotInSchema,
} from '@turnstone/contracts/ingest';
import { errorComponent, errorResponse, jsonSchema as schema } from '../../lib/openapi.ts';

/**
 * Every error code the ingest endpoint answers with, by status. The conformance test
 * (tests/api/ingest-contract.test.ts) meets each of them for real.
 */
export const INGEST_ERROR_CODES = {
  400: ['validation_failed', 'invalid_json', 'bad_request'],
  401: ['unauthenticated', 'invalid_api_key', 'revoked_api_key'],
  404: ['unknown_point'],
  409: ['uid_conflict'],
  413: ['payload_too_large'],
  415: ['unsupported_media_type', 'unsupported_encoding'],
  429: ['rate_limited'],
  500: ['internal'],
  503: ['db_unavailable'],
} as const;

let base: Record<string, unknown> | null = null;

/**
 * OpenAPI 3.1 description of the ingest API, generated from the shared zod schemas, with
 * `serverUrl` (absolute: where the document was fetched, or PUBLIC_URL) as its server.
 */
export function ingestOpenApi(serverUrl: string): object {
  base ??= buildDocument();
  return { ...base, servers: [{ url: serverUrl, description: 'This Turnstone server' }] };
}

/**
 * The batch envelope as contracts' ingestBodySchema checks it (1 to MAX_BATCH items, nothing
 * beside `snapshots`), its items named as the Snapshot each one is then checked against on
 * its own (the envelope takes them as unknown, so one bad item does not refuse the batch).
 */
function batchComponent(): Record<string, unknown> {
  const [envelope] = ingestBodySchema.options;
  const batch = schema(envelope) as { properties: { snapshots: Record<string, unknown> } };
  batch.properties.snapshots.items = { $ref: '#/components/schemas/Snapshot' };
  return batch;
}

function buildDocument(): Record<string, unknown> {
  const h = (name: string) => ({ $ref: `#/components/headers/${name}` });
  const rate = { RateLimit: h('RateLimit'), 'RateLimit-Policy': h('RateLimit-Policy') };
  const err = (status: keyof typeof INGEST_ERROR_CODES, description: string) =>
    errorResponse(INGEST_ERROR_CODES[status], description);
  const json = (ref: string) => ({ 'application/json': { schema: { $ref: ref } } });
  return {
    openapi: '3.1.0',
    info: {
      title: 'Turnstone ingest API',
      version: '1.1.0',
      description: [
        'Field gateways post vibration snapshots here.',
        '',
        '**Delivery** may repeat: a repeated uid with the same content answers 200 and stores nothing new; the same uid with other content answers 409. Retry network errors, 429 and 503 with the same uid and body (after the Retry-After seconds).',
        '',
        "**Forward compatibility**: a snapshot field this version does not know (from newer gateway firmware) is accepted and ignored — not stored — and named in the answer's `ignoredFields`. Known fields are checked strictly. A change to a known field's meaning gets a new path (`/api/ingest/v2`), never a new meaning under v1. Clients must ignore answer fields they do not know.",
        '',
        '**Bodies** are `application/json` (UTF-8), optionally compressed with `Content-Encoding: gzip`, `deflate` or `br`; at most 16 MiB after decompression.',
        '',
        '**Rate**: each gateway may make INGEST_MAX_PER_MIN requests per minute (6000 unless configured); every answer to an authenticated request carries the `RateLimit` and `RateLimit-Policy` headers (IETF draft-ietf-httpapi-ratelimit-headers-07).',
      ].join('\n'),
    },
    servers: [{ url: '/api/ingest/v1' }],
    components: {
      securitySchemes: {
        gatewayKey: {
          type: 'http',
          scheme: 'bearer',
          description: 'The gateway API key shown once when the gateway was created.',
        },
      },
      headers: {
        'Retry-After': {
          description: 'Whole seconds to wait before retrying (RFC 9110 §10.2.3).',
          required: true,
          schema: { type: 'integer', minimum: 1 },
        },
        RateLimit: {
          description:
            "The gateway's budget now: `limit=N, remaining=N, reset=S` (S: seconds until the window resets).",
          required: true,
          schema: {
            type: 'string',
            pattern: '^limit=\\d+, remaining=\\d+, reset=\\d+$',
          },
        },
        'RateLimit-Policy': {
          description: 'The budget: `N;w=S` — N requests per window of S seconds.',
          required: true,
          schema: { type: 'string', pattern: '^\\d+;w=\\d+$' },
        },
        'WWW-Authenticate': {
          description:
            'The authentication scheme (RFC 6750 §3): Bearer, with the error for a bad key.',
          required: true,
          schema: { type: 'string', pattern: '^Bearer realm="turnstone-ingest"' },
        },
      },
      schemas: {
        Snapshot: schema(snapshotInSchema),
        Batch: batchComponent(),
        SnapshotResult: {
          type: 'object',
          description: 'The answer to one snapshot posted alone.',
          required: ['uid', 'status', 'snapshotId'],
          properties: {
            uid: { type: 'string' },
            status: { type: 'string', enum: ['created', 'duplicate'] },
            snapshotId: {
              type: 'integer',
              description: 'The stored snapshot (the earlier one, for a duplicate).',
            },
            ignoredFields: {
              type: 'array',
              items: { type: 'string' },
              description: 'Fields of the snapshot this version does not know: not stored.',
            },
          },
        },
        BatchItemResult: schema(ingestResultSchema, 'output'),
        BatchResult: schema(ingestBatchResponseSchema, 'output'),
        Error: errorComponent(),
      },
    },
    security: [{ gatewayKey: [] }],
    paths: {
      '/snapshots': {
        post: {
          operationId: 'submitSnapshots',
          summary: 'Submit one snapshot or a batch',
          description:
            'One snapshot object answers 201 (stored) or 200 (a repeat) with its snapshotId; a batch `{ "snapshots": [...] }` answers 200 with one result per item, each with its own httpStatus.',
          parameters: [
            {
              name: 'Content-Encoding',
              in: 'header',
              required: false,
              description: 'Compression of the request body.',
              schema: { type: 'string', enum: ['gzip', 'deflate', 'br', 'identity'] },
            },
          ],
          requestBody: {
            required: true,
            content: {
              'application/json': {
                schema: {
                  oneOf: [
                    { $ref: '#/components/schemas/Snapshot' },
                    { $ref: '#/components/schemas/Batch' },
                  ],
                },
              },
            },
          },
          responses: {
            '201': {
              description: 'Stored and queued for analysis.',
              headers: rate,
              content: json('#/components/schemas/SnapshotResult'),
            },
            '200': {
              description:
                'A repeat of a stored snapshot (nothing new stored), or a batch with one result per item.',
              headers: rate,
              content: {
                'application/json': {
                  schema: {
                    oneOf: [
                      { $ref: '#/components/schemas/SnapshotResult' },
                      { $ref: '#/components/schemas/BatchResult' },
                    ],
                  },
                },
              },
            },
            '400': { ...err(400, 'Invalid body; details name the fields.'), headers: rate },
            '401': {
              ...err(401, 'Missing, unknown or revoked API key.'),
              headers: { 'WWW-Authenticate': h('WWW-Authenticate') },
            },
            '404': {
              ...err(404, "No point of the gateway's site has the tag."),
              headers: rate,
            },
            '409': { ...err(409, 'The uid is stored with other content.'), headers: rate },
            '413': { ...err(413, 'Body larger than 16 MiB.'), headers: rate },
            '415': {
              ...err(
                415,
                'The body is not application/json, or its Content-Encoding or charset is not supported.',
              ),
              headers: rate,
            },
            '429': {
              ...err(429, 'Faster than the gateway rate; Retry-After is the time to the reset.'),
              headers: { 'Retry-After': h('Retry-After'), ...rate },
            },
            '500': err(500, 'A fault on the server; the message names the request id.'),
            '503': {
              ...err(503, 'The database is unavailable or did not answer in time; retry later.'),
              headers: { 'Retry-After': h('Retry-After') },
            },
          },
        },
      },
    },
  };
}
