import { ERROR_STATUS, type ErrorCode, type ErrorDetail } from '@shared/errors';

/** The one error type routes and services throw; the error handler turns it into the error body. */
export class HttpError extends Error {
  readonly status: number;
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly details?: ErrorDetail[],
    /** response headers sent with the error body (e.g. Retry-After) */
    readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.status = ERROR_STATUS[code];
  }
}

export const badRequest = (message: string, details?: ErrorDetail[]) =>
  new HttpError('VALIDATION_FAILED', message, details);
export const notFound = (what: string) => new HttpError('NOT_FOUND', `${what} not found`);
export const forbidden = (message = 'Your role does not allow this.') => new HttpError('FORBIDDEN', message);
export const conflict = (message: string, details?: ErrorDetail[]) =>
  new HttpError('CONFLICT', message, details);
export const unauthenticated = (message = 'Sign in to continue.') =>
  new HttpError('UNAUTHENTICATED', message);
/** 503: the server cannot take this now; `Retry-After` tells the client when to try again. */
export const unavailable = (message: string, retryAfterSeconds = 1) =>
  new HttpError('UNAVAILABLE', message, undefined, { 'Retry-After': String(retryAfterSeconds) });
