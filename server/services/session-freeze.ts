/** The data freeze of an analysis: a SHA-256 of a canonical serialisation of its inputs. */
import { createHash } from 'node:crypto';
import type { SessionInputs } from '../../shared/analyses';

/**
 * JSON with object keys sorted at every depth and no whitespace, so equal values always give the
 * same text whatever order their keys were built in. Undefined members are left out, as JSON does.
 */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map((v) => canonicalJson(v ?? null)).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value) ?? 'null';
}

/** SHA-256 (hex) of a text. */
export function sha256Hex(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

/** The freeze hash of a session's inputs. */
export function freezeHash(inputs: SessionInputs): string {
  return sha256Hex(canonicalJson(inputs));
}
