export class AppError extends Error {
  constructor(
    public readonly code: string,
    message: string,
    public readonly status: number,
    public readonly fields?: Record<string, string>,
    public readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}

export const badRequest = (message: string, fields?: Record<string, string>, code = 'INVALID_INPUT') =>
  new AppError(code, message, 400, fields);
export const unauthorized = (message = 'Sign in to continue') => new AppError('UNAUTHENTICATED', message, 401);
export const forbidden = (message = 'You do not have permission to do this', code = 'FORBIDDEN') =>
  new AppError(code, message, 403);
export const notFound = (what = 'The resource') => new AppError('NOT_FOUND', `${what} was not found`, 404);
export const conflict = (code: string, message: string, fields?: Record<string, string>) =>
  new AppError(code, message, 409, fields);
export const gone = (code: string, message: string) => new AppError(code, message, 410);
