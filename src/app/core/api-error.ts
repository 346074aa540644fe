import { HttpErrorResponse } from '@angular/common/http';
import { isApiErrorBody } from '../../../shared/errors';

/** A sentence for the person in front of the screen, from whatever an HTTP call threw. */
export function apiErrorMessage(
  err: unknown,
  fallback = 'Something went wrong. Please try again.',
): string {
  if (err instanceof HttpErrorResponse) {
    if (isApiErrorBody(err.error)) return err.error.error.message;
    if (err.status === 0)
      return 'The server cannot be reached. Check your connection and try again.';
    return fallback;
  }
  if (err instanceof Error && err.message) return err.message;
  return fallback;
}

/** Field problems a validation error carries, as `path: message` lines. */
export function apiErrorDetails(err: unknown): string[] {
  if (!(err instanceof HttpErrorResponse) || !isApiErrorBody(err.error)) return [];
  const details = err.error.error.details;
  if (typeof details !== 'object' || details === null) return [];
  const lines: string[] = [];
  for (const list of Object.values(details)) {
    if (!Array.isArray(list)) continue;
    for (const item of list) {
      if (typeof item === 'object' && item && 'message' in item) {
        const path = 'path' in item && item.path !== '(body)' ? `${String(item.path)}: ` : '';
        lines.push(`${path}${String(item.message)}`);
      }
    }
  }
  return lines;
}

/** The API error code of a failed call, if it has one. */
export function apiErrorCode(err: unknown): string | null {
  return err instanceof HttpErrorResponse && isApiErrorBody(err.error)
    ? err.error.error.code
    : null;
}
