import type { Express } from 'express';

interface Layer {
  rawPath?: string | string[];
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

/**
 * Every route registered on the app, read from Express's own router stacks,
 * as "METHOD /full/path" (mount paths joined). Used by the authorization matrix
 * so that a route added later cannot be left out of it.
 */
export function listRoutes(app: Express, under = '/api'): string[] {
  const found: string[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const [method, on] of Object.entries(layer.route.methods)) {
          // A router mounted at its resource prefix serves the prefix itself as '/'.
          const full = layer.route.path === '/' && prefix ? prefix : `${prefix}${layer.route.path}`;
          if (on && method !== '_all') found.push(`${method.toUpperCase()} ${full}`);
        }
      } else if (layer.handle?.stack) {
        const mount = typeof layer.rawPath === 'string' && layer.rawPath !== '/' ? layer.rawPath : '';
        walk(layer.handle.stack, prefix + mount);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return [...new Set(found)].filter((r) => r.split(' ')[1].startsWith(under)).sort();
}
