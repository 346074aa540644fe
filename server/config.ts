import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, join, resolve } from 'node:path';

/** Everything the server reads from its environment, checked once at start. */
export interface Config {
  readonly port: number;
  readonly host: string;
  readonly databasePath: string;
  readonly uploadsDir: string;
  readonly publicUrl: string;
  readonly sessionSecret: string;
  readonly secureCookies: boolean;
  readonly smtpUrl: string | null;
  readonly mailFrom: string;
  readonly seedDemo: boolean;
  readonly logLevel: string;
  readonly clientDist: string;
  readonly loginRateLimit: number;
  readonly workers: number;
  readonly maxMegapixels: number;
  readonly uploadMaxFileMb: number;
  readonly uploadMaxFiles: number;
  readonly uploadMaxRequestMb: number;
  readonly jobRetryMs: number;
  readonly demoCacheDir: string;
}

function intFrom(
  env: NodeJS.ProcessEnv,
  key: string,
  fallback: number,
  min: number,
  max: number,
): number {
  const raw = env[key];
  if (raw === undefined || raw === '') return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new Error(`${key} must be an integer between ${min} and ${max}; got "${raw}".`);
  }
  return value;
}

function boolFrom(env: NodeJS.ProcessEnv, key: string, fallback: boolean): boolean {
  const raw = env[key];
  if (raw === undefined || raw === '') return fallback;
  if (['1', 'true', 'yes'].includes(raw.toLowerCase())) return true;
  if (['0', 'false', 'no'].includes(raw.toLowerCase())) return false;
  throw new Error(`${key} must be true or false; got "${raw}".`);
}

/** A session secret from the environment, or one generated once and kept beside the database. */
function sessionSecretFor(env: NodeJS.ProcessEnv, databasePath: string): string {
  const fromEnv = env['SESSION_SECRET'];
  if (fromEnv) {
    if (fromEnv.length < 32) throw new Error('SESSION_SECRET must have at least 32 characters.');
    return fromEnv;
  }
  if (databasePath === ':memory:') return randomBytes(32).toString('hex');
  const file = resolve(dirname(databasePath), 'session-secret');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dirname(file), { recursive: true });
  const secret = randomBytes(32).toString('hex');
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

/** Reads and checks the configuration; fails fast with a readable message on a bad value. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const port = intFrom(env, 'PORT', 3000, 0, 65535);
  const databasePath = env['DATABASE_PATH']
    ? resolve(env['DATABASE_PATH'])
    : resolve('data/maculo.sqlite');
  const publicUrl = (env['PUBLIC_URL'] ?? `http://localhost:${port}`).replace(/\/+$/, '');
  if (!/^https?:\/\//.test(publicUrl))
    throw new Error('PUBLIC_URL must start with http:// or https://.');
  const smtpUrl = env['SMTP_URL'] || null;
  if (smtpUrl && !/^smtps?:\/\//.test(smtpUrl))
    throw new Error('SMTP_URL must start with smtp:// or smtps://.');
  return Object.freeze({
    port,
    host: env['HOST'] ?? '0.0.0.0',
    databasePath,
    uploadsDir: resolve(env['UPLOADS_DIR'] ?? 'uploads'),
    publicUrl,
    sessionSecret: sessionSecretFor(env, databasePath),
    secureCookies: boolFrom(env, 'SECURE_COOKIES', publicUrl.startsWith('https://')),
    smtpUrl,
    mailFrom: env['MAIL_FROM'] ?? 'Maculo <no-reply@maculo.invalid>',
    seedDemo: boolFrom(env, 'SEED_DEMO', true),
    logLevel: env['LOG_LEVEL'] ?? 'info',
    clientDist: resolve(env['CLIENT_DIST'] ?? 'dist/maculo/browser'),
    loginRateLimit: intFrom(env, 'LOGIN_RATE_LIMIT', 10, 1, 100000),
    workers: intFrom(env, 'WORKERS', Math.max(1, Math.min(availableParallelism(), 8)), 1, 64),
    maxMegapixels: intFrom(env, 'MAX_MEGAPIXELS', 50, 1, 500),
    uploadMaxFileMb: intFrom(env, 'UPLOAD_MAX_FILE_MB', 60, 1, 10_000),
    uploadMaxFiles: intFrom(env, 'UPLOAD_MAX_FILES', 200, 1, 100_000),
    uploadMaxRequestMb: intFrom(env, 'UPLOAD_MAX_REQUEST_MB', 2000, 1, 100_000),
    jobRetryMs: intFrom(env, 'JOB_RETRY_MS', 1000, 1, 3_600_000),
    demoCacheDir: resolve(env['DEMO_CACHE_DIR'] ?? join(dirname(databasePath), 'demo-cache')),
  } satisfies Config);
}
