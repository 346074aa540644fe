import type { ApiErrorCode } from '../../shared/errors';

const STATUS: Record<ApiErrorCode, number> = {
  bad_request: 400,
  validation_failed: 400,
  malformed_json: 400,
  payload_too_large: 400,
  unauthenticated: 401,
  invalid_credentials: 401,
  forbidden: 403,
  csrf_failed: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  rate_limited: 429,
  not_estimable: 422,
  unsupported: 415,
  internal: 500,
};

/** An error meant for the API client: it carries a code, a status and a readable message. */
export class ApiError extends Error {
  readonly status: number;

  constructor(
    readonly code: ApiErrorCode,
    message: string,
    readonly details?: unknown,
    status?: number,
  ) {
    super(message);
    this.name = 'ApiError';
    this.status = status ?? STATUS[code];
  }
}

/** 404 for a thing that does not exist (or that the caller may not know exists). */
export function notFound(what: string): ApiError {
  return new ApiError('not_found', `${what} was not found.`);
}

/** 403 with a reason the person can act on. */
export function forbidden(message: string): ApiError {
  return new ApiError('forbidden', message);
}
