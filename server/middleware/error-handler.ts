import type { ErrorRequestHandler, RequestHandler } from 'express';
import { MulterError } from 'multer';
import { ZodError } from 'zod';
import { ERROR_STATUS, type ErrorBody, type ErrorCode } from '@shared/errors';
import { HttpError } from '../lib/http-error';
import type { Logger } from '../lib/logger';
import { zodDetails } from './validate';

const CODE_OF_STATUS = new Map(
  Object.entries(ERROR_STATUS).map(([code, status]) => [status, code as ErrorCode]),
);
const STATUS_MESSAGE: Record<number, string> = {
  400: 'The request is not valid.',
  403: 'This file cannot be served.',
  404: 'There is no such file.',
  413: 'The request is larger than allowed.',
  415: 'This content type is not supported.',
};

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError('NOT_FOUND', `No API route for ${req.method} ${req.path}`));
};

/** Maps anything thrown to an HttpError: the one converter. */
export function toHttpError(err: unknown): HttpError {
  if (err instanceof HttpError) return err;
  if (err instanceof ZodError)
    return new HttpError('VALIDATION_FAILED', 'The request is not valid.', zodDetails(err, 'body'));
  if (err instanceof MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE')
      return new HttpError('PAYLOAD_TOO_LARGE', 'The file is larger than allowed.');
    return new HttpError(
      'VALIDATION_FAILED',
      `Upload refused: ${err.message}${err.field ? ` (field "${err.field}")` : ''}.`,
    );
  }
  const e = err as { type?: string; status?: number; statusCode?: number; message?: string };
  // body-parser and raw-body errors carry a `type`
  if (e && typeof e === 'object') {
    if (e.type === 'entity.parse.failed')
      return new HttpError('VALIDATION_FAILED', 'The request body is not valid JSON.');
    if (e.type === 'entity.too.large')
      return new HttpError('PAYLOAD_TOO_LARGE', 'The request body is larger than allowed.');
    if (e.type === 'charset.unsupported' || e.type === 'encoding.unsupported')
      return new HttpError('UNSUPPORTED_MEDIA_TYPE', 'The request body encoding is not supported.');
    // http-errors from Express's own parts (express.static: a missing file, a path with .., a range
    // past the end): a 4xx stays the client's, in our shape
    const status = e.status ?? e.statusCode;
    if (typeof status === 'number' && status >= 400 && status < 500)
      return new HttpError(
        CODE_OF_STATUS.get(status) ?? 'VALIDATION_FAILED',
        STATUS_MESSAGE[status] ?? 'The request cannot be served as asked.',
      );
  }
  return new HttpError('INTERNAL', 'Something went wrong on our side. The error has been logged.');
}

export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const httpError = toHttpError(err);
    // 503 is the server refusing on purpose (busy, shutting down): no stack to log
    if (httpError.status >= 500 && httpError.code !== 'UNAVAILABLE')
      logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
    if (res.headersSent) return res.end();
    const body: ErrorBody = { error: { code: httpError.code, message: httpError.message } };
    if (httpError.details?.length) body.error.details = httpError.details;
    if (httpError.headers) res.set(httpError.headers);
    // whatever a handler had set up for its answer (a file's type, say), the error is JSON
    res.removeHeader('Content-Disposition');
    res.type('json').status(httpError.status).json(body);
  };
}
