/**
 * Query strings are checked like bodies, and a parameter the route does not know is a 400,
 * not silently ignored: `GET /findings?alertId=31` must not answer every finding as if it
 * were filtered. The parameters a route knows are the properties of its zod schema.
 */
import { z } from 'zod';
import { AppError } from './app-error.ts';

const known = new WeakMap<z.ZodType, ReadonlySet<string> | null>();

/** The parameter names of `schema` (null when it is no plain object, e.g. a union). */
function namesOf(schema: z.ZodType): ReadonlySet<string> | null {
  if (!known.has(schema)) {
    const json = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as {
      type?: string;
      properties?: Record<string, unknown>;
    };
    known.set(schema, json.properties ? new Set(Object.keys(json.properties)) : null);
  }
  return known.get(schema)!;
}

export function parseQuery<T extends z.ZodType>(schema: T, query: unknown): z.output<T> {
  refuseUnknown(namesOf(schema), query);
  return schema.parse(query);
}

/** For a route that takes no query parameters at all: any one given is a 400. */
export function refuseAnyQuery(query: unknown): void {
  refuseUnknown(new Set(), query);
}

function refuseUnknown(names: ReadonlySet<string> | null, query: unknown): void {
  if (names && query && typeof query === 'object') {
    const unknown = Object.keys(query).filter((k) => !names.has(k));
    if (unknown.length > 0)
      throw new AppError(
        'unknown_query_parameter',
        `Unknown query parameter${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}. Known: ${[...names].join(', ') || 'none'}.`,
        400,
        unknown.map((k) => ({ path: k, message: 'unknown query parameter' })),
      );
  }
}
