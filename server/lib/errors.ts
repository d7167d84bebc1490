/** Every error a service means to show the caller is made here; the error middleware renders them. */
export class AppError extends Error {
  constructor(
    public status: number,
    public code: string,
    message: string,
    public fields?: Record<string, string>,
    public headers?: Record<string, string>,
    /** Extra members of the error body, e.g. `allowed` transitions on a 409. */
    public extra?: Record<string, unknown>,
  ) {
    super(message);
  }
}

export const errors = {
  invalid: (message: string, fields?: Record<string, string>) => new AppError(400, 'invalid', message, fields),
  field: (field: string, message: string) => new AppError(400, 'invalid', message, { [field]: message }),
  unauthenticated: () => new AppError(401, 'unauthenticated', 'Please sign in first.'),
  invalidCredentials: () => new AppError(401, 'invalid_credentials', 'That e-mail and password do not match an account.'),
  forbidden: (message = 'Your role in this studio does not allow that.') => new AppError(403, 'forbidden', message),
  csrf: () => new AppError(403, 'csrf', 'This form has expired. Reload the page and try again.'),
  notFound: (what = 'That') => new AppError(404, 'not_found', `${what} was not found.`),
  conflict: (message: string, code = 'conflict', extra?: Record<string, unknown>) => new AppError(409, code, message, undefined, undefined, extra),
  gone: (message: string) => new AppError(410, 'gone', message),
  tooLarge: (message = 'That is larger than we accept.') => new AppError(413, 'too_large', message),
  unsupported: (message: string) => new AppError(415, 'unsupported_media', message),
  unprocessable: (message: string, fields?: Record<string, string>) => new AppError(422, 'unprocessable', message, fields),
  throttled: (retryAfterSeconds: number) =>
    new AppError(
      429,
      'throttled',
      `Too many attempts. Try again in ${Math.max(1, Math.ceil(retryAfterSeconds / 60))} minute(s).`,
      undefined,
      { 'Retry-After': String(Math.max(1, Math.ceil(retryAfterSeconds))) },
    ),
};
