import type { ZodError, ZodType } from 'zod';
import { ApiError } from '../errors/api-error';

/** One readable line per problem: where it is and what is wrong. */
export function zodDetails(err: ZodError): { path: string; message: string }[] {
  return err.issues.map((issue) => {
    const path = issue.path.map(String).join('.');
    let message = issue.message;
    if (issue.code === 'unrecognized_keys') {
      message = `Unknown field${issue.keys.length > 1 ? 's' : ''}: ${issue.keys.join(', ')}.`;
    } else if (issue.code === 'invalid_type' && message.startsWith('Invalid input')) {
      message = `Expected ${issue.expected}.`;
    }
    return { path: path || '(body)', message };
  });
}

function summary(details: { path: string; message: string }[]): string {
  const first = details[0];
  if (!first) return 'The request is not valid.';
  const prefix = first.path === '(body)' ? '' : `${first.path}: `;
  const more =
    details.length > 1
      ? ` (and ${details.length - 1} more problem${details.length > 2 ? 's' : ''})`
      : '';
  return `${prefix}${first.message}${more}`;
}

/** Parses a value with a zod schema or throws a 400 in the API error shape. */
export function parseWith<T>(schema: ZodType<T>, value: unknown, what = 'request'): T {
  const result = schema.safeParse(value ?? {});
  if (result.success) return result.data;
  const details = zodDetails(result.error);
  throw new ApiError('validation_failed', summary(details), { [what]: details });
}
