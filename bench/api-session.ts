/**
 * A signed-in API client for benchmarks: keeps cookies like a browser and echoes the XSRF token on
 * state-changing requests, as the Angular client does.
 */

/** One signed-in user talking to the real server over HTTP. */
export class ApiSession {
  private readonly cookies = new Map<string, string>();

  constructor(readonly base: string) {}

  /** The Cookie header this session sends. */
  get cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  }

  /** Only the session cookie (what a GET needs). */
  get sessionCookie(): string {
    const sid = this.cookies.get('maculo.sid');
    if (!sid) throw new Error('not signed in');
    return `maculo.sid=${sid}`;
  }

  private remember(res: Response): void {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair!.indexOf('=');
      if (eq > 0) this.cookies.set(pair!.slice(0, eq).trim(), pair!.slice(eq + 1).trim());
    }
  }

  private headers(extra: Record<string, string> = {}): Record<string, string> {
    const xsrf = this.cookies.get('XSRF-TOKEN');
    return {
      cookie: this.cookieHeader,
      ...(xsrf ? { 'x-xsrf-token': decodeURIComponent(xsrf) } : {}),
      ...extra,
    };
  }

  /** Any request; cookies from the answer are kept. */
  async request(path: string, init: RequestInit = {}): Promise<Response> {
    const res = await fetch(`${this.base}${path}`, {
      ...init,
      headers: this.headers((init.headers as Record<string, string> | undefined) ?? {}),
    });
    this.remember(res);
    return res;
  }

  /** GET with a JSON answer; throws on a non-2xx status. */
  async getJson(path: string): Promise<{ body: unknown; headers: Headers }> {
    const res = await this.request(path);
    const body: unknown = await res.json();
    if (!res.ok) throw new Error(`GET ${path}: ${res.status} ${JSON.stringify(body)}`);
    return { body, headers: res.headers };
  }

  /** POST of a JSON body; throws on a non-2xx status. */
  async postJson(path: string, payload: unknown): Promise<unknown> {
    const res = await this.request(path, {
      method: 'POST',
      body: JSON.stringify(payload),
      headers: { 'content-type': 'application/json' },
    });
    const body: unknown = res.status === 204 ? null : await res.json();
    if (!res.ok) throw new Error(`POST ${path}: ${res.status} ${JSON.stringify(body)}`);
    return body;
  }

  /** Fetches the XSRF cookie, then signs in through the real login route. */
  async signIn(email: string, password: string): Promise<this> {
    await (await this.request('/api/health')).arrayBuffer();
    await this.postJson('/api/auth/login', { email, password });
    return this;
  }
}

/** Narrows an unknown JSON value to a record. */
export function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Reads a field that must be an array. */
export function arrayField(value: unknown, key: string): unknown[] {
  const field = isRecord(value) ? value[key] : undefined;
  if (!Array.isArray(field)) throw new Error(`expected an array in "${key}"`);
  return field;
}

/** Reads a field that must be a string. */
export function stringField(value: unknown, key: string): string {
  const field = isRecord(value) ? value[key] : undefined;
  if (typeof field !== 'string') throw new Error(`expected a string in "${key}"`);
  return field;
}
