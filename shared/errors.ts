/** Machine-readable error codes used in every API failure body. */
export type ApiErrorCode =
  | 'bad_request'
  | 'validation_failed'
  | 'malformed_json'
  | 'payload_too_large'
  | 'unauthenticated'
  | 'invalid_credentials'
  | 'forbidden'
  | 'csrf_failed'
  | 'not_found'
  | 'conflict'
  | 'gone'
  | 'rate_limited'
  | 'not_estimable'
  | 'unsupported'
  | 'internal';

/** The one shape of every API failure: `{"error": {"code", "message", "details"?}}`. */
export interface ApiErrorBody {
  error: {
    code: ApiErrorCode;
    message: string;
    details?: unknown;
  };
}

/** True when a parsed JSON value has the API error shape. */
export function isApiErrorBody(value: unknown): value is ApiErrorBody {
  if (typeof value !== 'object' || value === null || !('error' in value)) return false;
  const error = (value as { error: unknown }).error;
  return (
    typeof error === 'object' &&
    error !== null &&
    typeof (error as { code?: unknown }).code === 'string' &&
    typeof (error as { message?: unknown }).message === 'string'
  );
}
