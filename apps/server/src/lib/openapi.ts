/**
 * The pieces both OpenAPI documents share (ingest-openapi.ts and api-openapi.ts): zod → JSON
 * Schema, the one error body, an error answer narrowed to its codes, and the absolute server
 * URL a document names.
 */
import { isDeepStrictEqual } from 'node:util';
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

type Json = Record<string, unknown>;
type Io = 'input' | 'output';

/** `fooBarSchema` → `FooBar`. */
const componentName = (exportName: string) =>
  exportName[0]!.toUpperCase() + exportName.slice(1, -'Schema'.length);

/** `node` with every `$ref` string passed through `to`. */
function mapRefs(node: unknown, to: (ref: string) => string): unknown {
  if (Array.isArray(node)) return node.map((n) => mapRefs(n, to));
  if (!node || typeof node !== 'object') return node;
  return Object.fromEntries(
    Object.entries(node).map(([k, v]) => [
      k,
      k === '$ref' && typeof v === 'string' ? to(v) : mapRefs(v, to),
    ]),
  );
}

/** `$ref`s to `#/$defs/<id>` → `#/components/schemas/<id>`, everywhere in `node`. */
const refsToComponents = (node: unknown) =>
  mapRefs(node, (ref) => ref.replace(/^#\/\$defs\//, '#/components/schemas/'));

/**
 * `components.schemas` made of the contracts' named schemas: every exported `fooSchema` of the
 * given modules is the component `Foo`, declared once and named by `$ref` wherever an
 * operation uses it. A schema that reads differently as a request (defaults optional) than
 * as an answer has two components, `Foo` (answer) and `FooInput` (request).
 */
export class SchemaComponents {
  readonly schemas: Record<string, Json> = {};
  private readonly ids = {
    input: new WeakMap<z.ZodType, string>(),
    output: new WeakMap<z.ZodType, string>(),
  };

  /** `modules`: contract modules by their name (the prefix when two export one name). */
  constructor(modules: Record<string, Record<string, unknown>>) {
    const named = Object.entries(modules).flatMap(([module, exports]) =>
      Object.entries(exports)
        .filter(([name, v]) => name.endsWith('Schema') && v instanceof z.ZodType)
        .map(([name, v]) => ({ module, name: componentName(name), schema: v as z.ZodType })),
    );
    const taken = new Map<string, number>();
    for (const { name } of named) taken.set(name, (taken.get(name) ?? 0) + 1);
    for (const { module, name, schema } of named) {
      const id = taken.get(name)! > 1 ? componentName(`${module}-${name}Schema`) : name;
      const same = isDeepStrictEqual(jsonSchema(schema, 'input'), jsonSchema(schema, 'output'));
      this.ids.output.set(schema, id);
      this.ids.input.set(schema, same ? id : `${id}Input`);
    }
  }

  /** JSON Schema of `s` for `io`, its named parts (or itself) `$ref`s to components. */
  ref(s: z.ZodType, io: Io): Json {
    const ids = this.ids[io];
    const metadata = new (class extends z.core.$ZodRegistry<Json> {
      override get(schema: z.core.$ZodType) {
        const meta = z.globalRegistry.get(schema);
        const id = ids.get(schema as z.ZodType);
        return id ? { ...meta, id } : meta;
      }
    })();
    const {
      $schema: _ignored,
      $defs,
      ...root
    } = z.toJSONSchema(s, { io, unrepresentable: 'any', metadata }) as Json;
    for (const [id, def] of Object.entries(($defs ?? {}) as Record<string, Json>)) {
      const body = refsToComponents(def) as Json;
      const known = this.schemas[id];
      if (known && !isDeepStrictEqual(known, body))
        throw new Error(`two different schemas would be the component ${id}`);
      this.schemas[id] = body;
    }
    return refsToComponents(root) as Json;
  }

  /**
   * The schemas and `paths` once every operation is described: a request-only `FooInput`
   * whose answer twin `Foo` no operation uses is named `Foo`.
   */
  settle<T>(paths: T): { paths: T; schemas: Record<string, Json> } {
    const rename = new Map<string, string>();
    for (const name of Object.keys(this.schemas)) {
      const plain = name.slice(0, -'Input'.length);
      if (name.endsWith('Input') && !(plain in this.schemas)) rename.set(name, plain);
    }
    const prefix = '#/components/schemas/';
    const to = (ref: string) =>
      ref.startsWith(prefix) && rename.has(ref.slice(prefix.length))
        ? prefix + rename.get(ref.slice(prefix.length))!
        : ref;
    return {
      paths: mapRefs(paths, to) as T,
      schemas: Object.fromEntries(
        Object.entries(this.schemas).map(([name, s]) => [rename.get(name) ?? name, mapRefs(s, to)]),
      ) as Record<string, Json>,
    };
  }
}

/** `components.schemas.Error`: `{ error: { code, message, details? } }`. */
export const errorComponent = () => jsonSchema(errorBodySchema, 'output');
export const ERROR_REF = '#/components/schemas/Error';

/** An error answer in the one error shape; `description` says which codes and when. */
export const errorAnswer = (description: string) => ({
  description,
  content: { 'application/json': { schema: { $ref: ERROR_REF } } },
});

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
