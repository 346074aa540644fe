import { ApiError } from '../errors/api-error';

/** Encodes a keyset position (the sort key values of the last row) as an opaque cursor. */
export function encodeCursor(values: (string | number)[]): string {
  return Buffer.from(JSON.stringify(values)).toString('base64url');
}

/** Decodes a cursor made by encodeCursor; a tampered one is a 400. */
export function decodeCursor(cursor: string, arity: number): (string | number)[] {
  try {
    const parsed: unknown = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8'));
    if (
      Array.isArray(parsed) &&
      parsed.length === arity &&
      parsed.every((v) => typeof v === 'string' || typeof v === 'number')
    ) {
      return parsed as (string | number)[];
    }
  } catch {
    // fall through to the error below
  }
  throw new ApiError(
    'bad_request',
    'The page cursor is not valid. Start again from the first page.',
  );
}
