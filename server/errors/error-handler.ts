import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Logger } from 'pino';
import { ZodError } from 'zod';
import type { ApiErrorBody } from '../../shared/errors';
import { ApiError } from './api-error';
import { zodDetails } from '../middleware/validate';

interface HttpishError {
  type?: unknown;
  status?: unknown;
  statusCode?: unknown;
  code?: unknown;
}

function fromBodyParser(err: HttpishError): ApiError | null {
  if (err.type === 'entity.parse.failed') {
    return new ApiError('malformed_json', 'The request body is not valid JSON.');
  }
  if (err.type === 'entity.too.large') {
    return new ApiError('payload_too_large', 'The request body is larger than the server accepts.');
  }
  if (err.type === 'encoding.unsupported' || err.type === 'charset.unsupported') {
    return new ApiError(
      'bad_request',
      'The request body uses an encoding the server does not accept.',
    );
  }
  const status = Number(err.status ?? err.statusCode);
  if (Number.isInteger(status) && status >= 400 && status < 500) {
    return new ApiError('bad_request', 'The request could not be read.', undefined, status);
  }
  return null;
}

/** Turns anything thrown into the one API error shape; unknown errors become a generic 500. */
export function errorHandler(log: Logger): ErrorRequestHandler {
  return (err: unknown, req, res, next) => {
    if (res.headersSent) {
      next(err);
      return;
    }
    let apiError: ApiError | null = null;
    if (err instanceof ApiError) apiError = err;
    else if (err instanceof ZodError) {
      apiError = new ApiError('validation_failed', 'Some fields are not valid.', zodDetails(err));
    } else if (typeof err === 'object' && err !== null)
      apiError = fromBodyParser(err as HttpishError);

    if (!apiError) {
      log.error({ err, url: req.originalUrl, method: req.method }, 'unexpected error');
      apiError = new ApiError('internal', 'Something went wrong on the server. Please try again.');
    }
    const body: ApiErrorBody = { error: { code: apiError.code, message: apiError.message } };
    if (apiError.details !== undefined) body.error.details = apiError.details;
    res.status(apiError.status).json(body);
  };
}

/** JSON 404 for unknown API routes. */
export const apiNotFound: RequestHandler = (req, res) => {
  const body: ApiErrorBody = {
    error: { code: 'not_found', message: `There is no API route ${req.method} ${req.path}.` },
  };
  res.status(404).json(body);
};
