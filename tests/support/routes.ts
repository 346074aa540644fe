import type { Express } from 'express';
import type { AccessRule } from '../../server/middleware/access';

/** One API route as registered in the Express app. */
export interface RegisteredRoute {
  method: string;
  path: string;
  access: AccessRule | null;
}

interface LayerLike {
  rawPath?: unknown;
  handle?: { stack?: LayerLike[]; access?: AccessRule };
  route?: { path: string; methods: Record<string, boolean>; stack: LayerLike[] };
}

function join(prefix: string, path: unknown): string {
  const part = typeof path === 'string' && path !== '/' ? path : '';
  return `${prefix}${part}`.replace(/\/+/g, '/');
}

function walk(stack: LayerLike[], prefix: string, out: RegisteredRoute[]): void {
  for (const layer of stack) {
    if (layer.route) {
      const guard =
        layer.route.stack.map((l) => l.handle?.access).find((a) => a !== undefined) ?? null;
      for (const method of Object.keys(layer.route.methods)) {
        if (method === '_all') continue;
        out.push({
          method: method.toUpperCase(),
          path: join(prefix, layer.route.path),
          access: guard,
        });
      }
    } else if (layer.handle?.stack) {
      walk(layer.handle.stack, join(prefix, layer.rawPath), out);
    }
  }
}

/** Every route the app registered, read from the app's own router (not a hand-written list). */
export function registeredRoutes(app: Express): RegisteredRoute[] {
  const router = (app as unknown as { router: { stack: LayerLike[] } }).router;
  const out: RegisteredRoute[] = [];
  walk(router.stack, '', out);
  return out.filter((r) => r.path.startsWith('/api/'));
}

/** A concrete URL for a route: `:slug` becomes the project, other parameters a well-formed id. */
export function fillPath(path: string, slug: string): string {
  return path
    .replace(':slug', slug)
    .replace(/:token/g, 'x'.repeat(43))
    .replace(/:[A-Za-z]+/g, '0123456789abcdef0123');
}
