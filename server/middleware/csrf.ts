import { randomBytes, timingSafeEqual } from 'node:crypto';
import { parse } from 'cookie';
import type { Request, RequestHandler, Response } from 'express';
import { ApiError } from '../errors/api-error';

/** Angular's HttpClient reads this cookie and echoes it in the X-XSRF-TOKEN header. */
export const XSRF_COOKIE = 'XSRF-TOKEN';
export const XSRF_HEADER = 'x-xsrf-token';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const TOKEN_SHAPE = /^[A-Za-z0-9_-]{20,100}$/;

function same(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

function tokenOf(req: Request): string | undefined {
  const token = parse(req.headers.cookie ?? '')[XSRF_COOKIE];
  return token && TOKEN_SHAPE.test(token) ? token : undefined;
}

function issue(res: Response, secure: boolean): void {
  res.cookie(XSRF_COOKIE, randomBytes(24).toString('base64url'), {
    httpOnly: false,
    sameSite: 'lax',
    secure,
    path: '/',
  });
}

/** Makes sure every browser holds a token cookie: pages and API answers alike hand one out. */
export function xsrfCookie(options: { secure: boolean }): RequestHandler {
  return (req, res, next) => {
    if (!tokenOf(req)) issue(res, options.secure);
    next();
  };
}

/**
 * Double-submit CSRF check: every state-changing API request must echo the cookie's token in the
 * X-XSRF-TOKEN header, which a page on another site cannot read or set.
 */
export function csrfProtection(): RequestHandler {
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const token = tokenOf(req);
    const header = req.get(XSRF_HEADER);
    if (!token || !header || !same(header, token)) {
      throw new ApiError('csrf_failed', 'Your page has expired. Reload it and try again.');
    }
    next();
  };
}
