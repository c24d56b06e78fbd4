// Typed application errors with stable codes, mapped to HTTP once, in the error middleware.
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: { path: string; message: string }[],
    readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (code: string, message: string, details?: { path: string; message: string }[]) =>
  new AppError(400, code, message, details);
export const unauthorized = (code = 'auth.required', message = 'Sign in to continue.') => new AppError(401, code, message);
export const forbidden = (code = 'auth.forbidden', message = 'Your account may not do this.') => new AppError(403, code, message);
export const notFound = (code = 'not_found', message = 'Not found.') => new AppError(404, code, message);
export const conflict = (code: string, message: string) => new AppError(409, code, message);
export const payloadTooLarge = (message: string) => new AppError(413, 'request.too_large', message);
