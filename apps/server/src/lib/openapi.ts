/**
 * The pieces both OpenAPI documents share (ingest-openapi.ts and api-openapi.ts): zod → JSON
 * Schema, the one error body, an error answer narrowed to its codes, and the absolute server
 * URL a document names.
 */
import type { Request } from 'express';
import { z } from 'zod';
import { errorBodySchema } from '@turnstone/contracts/errors';
import type { Config } from '../config.ts';

/** JSON Schema 2020-12 (OpenAPI 3.1's dialect) of a zod schema, without its `$schema`. */
export function jsonSchema(
  s: z.ZodType,
  io: 'input' | 'output' = 'input',
): Record<string, unknown> {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(s, {
    io,
    unrepresentable: 'any',
  }) as Record<string, unknown>;
  return rest;
}

/** `components.schemas.Error`: `{ error: { code, message, details? } }`. */
export const errorComponent = () => jsonSchema(errorBodySchema, 'output');
export const ERROR_REF = '#/components/schemas/Error';

/** An error answer whose `error.code` is one of `codes`. */
export function errorResponse(codes: readonly string[], description: string) {
  return {
    description: `${description} Codes: ${codes.join(', ')}.`,
    content: {
      'application/json': {
        schema: {
          allOf: [
            { $ref: ERROR_REF },
            {
              type: 'object',
              properties: {
                error: { type: 'object', properties: { code: { enum: [...codes] } } },
              },
            },
          ],
        },
      },
    },
  };
}

/**
 * The absolute origin a served document names as its server, so a client generated from it
 * needs no base URL: PUBLIC_URL when set, else the address the document was fetched from.
 */
export function documentOrigin(config: Pick<Config, 'PUBLIC_URL'>, req: Request): string {
  return config.PUBLIC_URL
    ? config.PUBLIC_URL.replace(/\/+$/, '')
    : `${req.protocol}://${req.get('host')}`;
}
