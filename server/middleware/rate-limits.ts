import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { ApiErrorBody } from '../../shared/errors';

function tooMany(message: string): ApiErrorBody {
  return { error: { code: 'rate_limited', message } };
}

function emailOf(req: Request): string {
  const body: unknown = req.body;
  if (typeof body === 'object' && body !== null && 'email' in body) {
    const email = (body as { email: unknown }).email;
    if (typeof email === 'string') return email.trim().toLowerCase().slice(0, 254);
  }
  return '';
}

/** Failed sign-ins per address and e-mail: blunts password guessing without locking anyone out for long. */
export function loginLimiter(limit: number): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60 * 1000,
    limit,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${emailOf(req)}`,
    handler: (_req, res) => {
      res.status(429).json(tooMany('Too many attempts. Wait 15 minutes, then try again.'));
    },
  });
}

/** Requests that send e-mail or check tokens, per address. */
export function mailLimiter(limit: number): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60 * 1000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    handler: (_req, res) => {
      res.status(429).json(tooMany('Too many requests. Wait 15 minutes, then try again.'));
    },
  });
}
