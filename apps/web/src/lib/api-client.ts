import type { ErrorBody } from '@turnstone/contracts/errors';
import type { z } from 'zod';

/** An error from the API (or from reaching it), carrying the server's code and message. */
export class ApiError extends Error {
  override readonly name = 'ApiError';
  constructor(
    /** HTTP status; 0 when the server could not be reached. */
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    /** Seconds from the Retry-After header (429, 503), when the server sent one. */
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

type UnauthenticatedHandler = () => void;
let unauthenticatedHandler: UnauthenticatedHandler | null = null;

/**
 * Registers what happens when any request answers 401 (the session ended or never existed):
 * the app provider uses it to send the user to sign-in. Returns an unregister function.
 */
export function setUnauthenticatedHandler(handler: UnauthenticatedHandler): () => void {
  unauthenticatedHandler = handler;
  return () => {
    if (unauthenticatedHandler === handler) unauthenticatedHandler = null;
  };
}

interface RequestOptions<S extends z.ZodType> {
  /**
   * Response schema; the body is parsed with it, so screens only see checked data. A promise
   * of one (a schema module being imported) lets the request start before zod has loaded.
   */
  schema?: S | Promise<S>;
  body?: unknown;
  signal?: AbortSignal;
  /**
   * When true a 401 is only thrown, not reported to the unauthenticated handler. Sign-in
   * uses it (a 401 there means wrong credentials) and so does the session check.
   */
  quiet401?: boolean;
}

function parseRetryAfter(value: string | null): number | undefined {
  if (!value) return undefined;
  const seconds = Number(value);
  if (Number.isFinite(seconds)) return Math.max(0, Math.round(seconds));
  const date = Date.parse(value);
  return Number.isNaN(date) ? undefined : Math.max(0, Math.round((date - Date.now()) / 1000));
}

async function readJson(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return undefined;
  }
}

/**
 * The error body's schema loads with the first error, not with the app: the shell carries
 * no zod. When even that cannot load, the error is told by its status alone.
 */
async function parseErrorBody(
  body: unknown,
): Promise<{ success: true; data: ErrorBody } | { success: false }> {
  try {
    const { errorBodySchema } = await import('@turnstone/contracts/errors');
    return errorBodySchema.safeParse(body);
  } catch {
    return { success: false };
  }
}

async function request<S extends z.ZodType>(
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE',
  url: string,
  options: RequestOptions<S> = {},
): Promise<z.output<S>> {
  // A schema still loading is awaited after the answer; a failure there is reported then.
  if (options.schema instanceof Promise) options.schema.catch(() => undefined);
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (options.body !== undefined) headers['Content-Type'] = 'application/json';

  let response: Response;
  try {
    response = await fetch(url, {
      method,
      headers,
      credentials: 'same-origin',
      body: options.body === undefined ? undefined : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(
      0,
      'network_error',
      'Could not reach the Turnstone server. Check the connection and try again.',
    );
  }

  if (!response.ok) {
    const parsed = await parseErrorBody(await readJson(response));
    const error = parsed.success
      ? new ApiError(
          response.status,
          parsed.data.error.code,
          parsed.data.error.message,
          parsed.data.error.details,
          parseRetryAfter(response.headers.get('Retry-After')),
        )
      : new ApiError(
          response.status,
          'http_error',
          `The server answered ${response.status}${response.statusText ? ` ${response.statusText}` : ''}.`,
          undefined,
          parseRetryAfter(response.headers.get('Retry-After')),
        );
    if (response.status === 401 && !options.quiet401) unauthenticatedHandler?.();
    throw error;
  }

  const json = response.status === 204 ? undefined : await readJson(response);
  if (!options.schema) return json as z.output<S>;
  const result = (await options.schema).safeParse(json);
  if (!result.success) {
    console.error(`Unexpected response from ${method} ${url}`, result.error.issues);
    throw new ApiError(
      response.status,
      'invalid_response',
      'The server sent data this version of the app does not understand. Reload the page; if it persists, tell your administrator.',
      result.error.issues,
    );
  }
  return result.data;
}

/** The one way the app talks to the API: cookie auth, JSON both ways, zod-checked answers. */
export const api = {
  get: <S extends z.ZodType>(url: string, options?: Omit<RequestOptions<S>, 'body'>) =>
    request('GET', url, options),
  post: <S extends z.ZodType>(url: string, options?: RequestOptions<S>) =>
    request('POST', url, options),
  put: <S extends z.ZodType>(url: string, options?: RequestOptions<S>) =>
    request('PUT', url, options),
  patch: <S extends z.ZodType>(url: string, options?: RequestOptions<S>) =>
    request('PATCH', url, options),
  delete: <S extends z.ZodType>(url: string, options?: RequestOptions<S>) =>
    request('DELETE', url, options),
};

/**
 * Field errors from a 400 `validation_failed` body, in either shape a zod-based server
 * sends: `{ fieldErrors: { email: ['…'] } }` (flattened) or an issue list `[{ path, message }]`.
 */
export function fieldErrorsOf(error: unknown): Record<string, string> {
  if (!isApiError(error) || error.status !== 400) return {};
  const details = error.details as
    | { fieldErrors?: Record<string, string[] | undefined> }
    | { path?: unknown[]; message?: string }[]
    | undefined;
  const out: Record<string, string> = {};
  if (Array.isArray(details)) {
    for (const issue of details) {
      const key = issue.path?.[0];
      if (typeof key === 'string' && issue.message && !out[key]) out[key] = issue.message;
    }
  } else if (details?.fieldErrors) {
    for (const [key, messages] of Object.entries(details.fieldErrors)) {
      if (messages?.[0]) out[key] = messages[0];
    }
  }
  return out;
}
