import { z } from 'zod';
import {
  ingestBatchResponseSchema,
  MAX_BATCH,
  snapshotInSchema,
} from '@turnstone/contracts/ingest';
import { errorBodySchema } from '@turnstone/contracts/errors';

const schema = (s: z.ZodType) => {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(s, {
    io: 'input',
    unrepresentable: 'any',
  }) as Record<string, unknown>;
  return rest;
};

let cached: object | null = null;

/** OpenAPI 3.1 description of the ingest API, generated from the shared zod schemas. */
export function ingestOpenApi(): object {
  if (cached) return cached;
  const err = (description: string) => ({
    description,
    content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } },
  });
  const retry = {
    'Retry-After': { schema: { type: 'integer' }, description: 'Seconds to wait before retrying.' },
  };
  cached = {
    openapi: '3.1.0',
    info: {
      title: 'Turnstone ingest API',
      version: '1.0.0',
      description:
        'Field gateways post vibration snapshots here. Delivery may repeat: a repeated uid with the same content answers 200 and stores nothing new; the same uid with other content answers 409.',
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
      schemas: {
        Snapshot: schema(snapshotInSchema),
        Batch: {
          type: 'object',
          required: ['snapshots'],
          properties: {
            snapshots: {
              type: 'array',
              minItems: 1,
              maxItems: MAX_BATCH,
              items: { $ref: '#/components/schemas/Snapshot' },
            },
          },
        },
        BatchResult: schema(ingestBatchResponseSchema),
        Error: schema(errorBodySchema),
      },
    },
    security: [{ gatewayKey: [] }],
    paths: {
      '/snapshots': {
        post: {
          summary: 'Submit one snapshot or a batch',
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
            '201': { description: 'Accepted and queued for analysis.' },
            '200': {
              description:
                'A repeat of a stored snapshot (nothing new stored), or a batch with one result per item.',
              content: {
                'application/json': { schema: { $ref: '#/components/schemas/BatchResult' } },
              },
            },
            '400': err('Invalid body; details name the fields.'),
            '401': err('Missing, unknown or revoked API key.'),
            '403': err('The point belongs to another site.'),
            '404': err('Unknown point tag.'),
            '409': err('The uid is stored with other content.'),
            '413': err('Body larger than 16 MiB.'),
            '429': { ...err('Faster than the gateway rate.'), headers: retry },
            '503': { ...err('Database unavailable; retry later.'), headers: retry },
          },
        },
      },
    },
  };
  return cached;
}
