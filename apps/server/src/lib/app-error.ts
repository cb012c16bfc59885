/** The one error type services throw; the error middleware turns it into a JSON answer. */
export class AppError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly httpStatus: number,
    readonly details?: unknown,
    options?: { cause?: unknown; headers?: Record<string, string> },
  ) {
    super(message, { cause: options?.cause });
    this.headers = options?.headers;
  }
  readonly headers?: Record<string, string>;
}

export const notFound = (what: string) => new AppError('not_found', `${what} was not found.`, 404);
export const forbidden = (message = 'Your role does not allow this.') =>
  new AppError('forbidden', message, 403);
export const unauthenticated = (message = 'Sign in to continue.') =>
  new AppError('unauthenticated', message, 401);
