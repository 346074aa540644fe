import { randomBytes, timingSafeEqual } from 'node:crypto';
import { parse } from 'cookie';
import type { RequestHandler } from 'express';
import { ApiError } from '../errors/api-error';

/** Angular's HttpClient reads this cookie and echoes it in the X-XSRF-TOKEN header. */
export const XSRF_COOKIE = 'XSRF-TOKEN';
export const XSRF_HEADER = 'x-xsrf-token';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function same(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/**
 * Double-submit CSRF protection: every response makes sure the browser holds a token cookie;
 * every state-changing request must send the same token in the header.
 */
export function csrfProtection(options: { secure: boolean }): RequestHandler {
  return (req, res, next) => {
    const cookies = parse(req.headers.cookie ?? '');
    let token = cookies[XSRF_COOKIE];
    if (!token || !/^[A-Za-z0-9_-]{20,100}$/.test(token)) {
      token = randomBytes(24).toString('base64url');
      res.cookie(XSRF_COOKIE, token, {
        httpOnly: false,
        sameSite: 'lax',
        secure: options.secure,
        path: '/',
      });
      if (!SAFE_METHODS.has(req.method)) {
        throw new ApiError('csrf_failed', 'Your page has expired. Reload it and try again.');
      }
    }
    if (!SAFE_METHODS.has(req.method)) {
      const header = req.get(XSRF_HEADER);
      if (!header || !same(header, token)) {
        throw new ApiError('csrf_failed', 'Your page has expired. Reload it and try again.');
      }
    }
    next();
  };
}
