import type { ErrorRequestHandler, RequestHandler } from 'express';
import { AppError, NotFound, PayloadTooLarge, ValidationError } from '../lib/errors';

interface HttpLikeError {
  status?: number;
  statusCode?: number;
  type?: string;
  expose?: boolean;
}

/** Maps anything thrown to an AppError. Unknown errors become a bare 500: no message, no stack. */
export function toAppError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  const http = (error ?? {}) as HttpLikeError;
  // body-parser errors
  if (http.type === 'entity.parse.failed') return new ValidationError('The request body is not valid JSON.', undefined, 'invalid_json');
  if (http.type === 'entity.too.large') return new PayloadTooLarge();
  const status = http.status ?? http.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500 && http.expose !== false) {
    return new AppError(status, 'bad_request', 'The request cannot be handled.');
  }
  return new AppError(500, 'internal', 'Something went wrong on our side. Please try again.');
}

/** Answers unknown /api routes (and everything else the web app does not serve) with JSON. */
export const notFoundHandler: RequestHandler = (_req, _res, next) => {
  next(new NotFound('not_found', 'There is nothing here.'));
};

/** The one place errors become responses: `{ error: { code, message, details? } }`, never HTML. */
export const errorHandler: ErrorRequestHandler = (error, req, res, next) => {
  const appError = toAppError(error);
  if (appError.status >= 500) req.log?.error({ err: error }, 'request failed');
  else req.log?.debug({ code: appError.code, status: appError.status }, 'request refused');
  if (res.headersSent) {
    // A streaming handler failed half-way: all we can do is cut the connection.
    next(error);
    return;
  }
  res.status(appError.status).json({
    error: { code: appError.code, message: appError.message, ...(appError.details ? { details: appError.details } : {}) },
  });
};
