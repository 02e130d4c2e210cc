import {
  ERROR_STATUS,
  staleVersionDetails,
  type ErrorCode,
  type ErrorDetail,
  type StaleVersion,
} from '@shared/errors';

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

/**
 * 409: `sentVersion` of `subject` ("The plan", "This station") is no longer current. The message
 * says which version is and who changed it; the details say the same for the client to read.
 */
export function staleVersion(subject: string, sentVersion: number, stale: StaleVersion): HttpError {
  const { currentVersion, changedBy, changedAt } = stale;
  const now = changedBy
    ? `it is now version ${currentVersion}, last changed by ${changedBy}${changedAt ? ` at ${changedAt}` : ''}`
    : `the current version is ${currentVersion}${changedAt ? ` (saved at ${changedAt})` : ''}`;
  return conflict(
    `${subject} was changed since you loaded it: you had version ${sentVersion}, ${now}. Reload it and make your change again; nothing was saved.`,
    staleVersionDetails(sentVersion, stale),
  );
}
/** 503: the server cannot take this now; `Retry-After` tells the client when to try again. */
export const unavailable = (message: string, retryAfterSeconds = 1) =>
  new HttpError('UNAVAILABLE', message, undefined, { 'Retry-After': String(retryAfterSeconds) });
