import { createHash, randomBytes } from 'node:crypto';

/** A new opaque id: 20 lowercase hex characters. */
export function newId(): string {
  return randomBytes(10).toString('hex');
}

/** A secret token for links in e-mails (URL-safe, 256 bits). */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

/** SHA-256 of a token in hex: what the database keeps instead of the token. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** The current time as ISO 8601 UTC with whole seconds (`2026-03-14T04:42:07Z`). */
export function nowIso(date: Date = new Date()): string {
  return date.toISOString().replace(/\.\d{3}Z$/, 'Z');
}
