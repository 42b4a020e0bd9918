import type { Express } from 'express';

/** One registered route: upper-case method and full path (params as `:name`). */
export interface ApiRoute {
  method: string;
  path: string;
}

interface LayerLike {
  rawPath?: unknown;
  route?: { path: unknown; methods: Record<string, boolean> };
  handle?: { stack?: LayerLike[] };
}

function join(prefix: string, path: unknown): string {
  const part = typeof path === 'string' ? path : '';
  return `${prefix}${part === '/' ? '' : part}` || '/';
}

function walk(stack: LayerLike[], prefix: string, out: ApiRoute[]): void {
  for (const layer of stack) {
    if (layer.route) {
      for (const method of Object.keys(layer.route.methods)) {
        if (method !== '_all') out.push({ method: method.toUpperCase(), path: join(prefix, layer.route.path) });
      }
    } else if (layer.handle?.stack) {
      walk(layer.handle.stack, join(prefix, layer.rawPath), out);
    }
  }
}

/**
 * Every route under /api, read from Express's router stack (router 2.x keeps the mount path in
 * `rawPath`), so a test over all mutating routes covers routes added later automatically.
 */
export function listApiRoutes(app: Express): ApiRoute[] {
  const routes: ApiRoute[] = [];
  walk((app as unknown as { router: { stack: LayerLike[] } }).router.stack, '', routes);
  return routes.filter((route) => route.path.startsWith('/api/'));
}

/** A concrete URL for a route pattern: every `:param` becomes 1, every `*splat` becomes x. */
export function concretePath(path: string): string {
  return path.replace(/:[A-Za-z0-9_]+/g, '1').replace(/\*[A-Za-z0-9_]*/g, 'x');
}
