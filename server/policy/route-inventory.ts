import type { Express } from 'express';
import { declaredSpecOf, type AnyRouteSpec } from '../http/route';

interface Layer {
  route?: { path: string; methods: Record<string, boolean>; stack: { handle: unknown }[] };
  handle?: { stack?: Layer[] };
}

export interface MountedRoute {
  /** The route's own path as Express holds it (relative to its router). */
  path: string;
  methods: string[];
  /** The declaration the route was mounted from, if any. */
  spec: AnyRouteSpec | undefined;
}

/**
 * Every route mounted in the app, at any depth of nested routers, with the declaration
 * it came from. A route added with a bare router.get(...) has no declaration: the
 * authorization-matrix test fails on it.
 */
export function listMountedRoutes(app: Express): MountedRoute[] {
  const found: MountedRoute[] = [];
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route) {
        const spec = layer.route.stack.map((entry) => declaredSpecOf(entry.handle)).find(Boolean);
        found.push({ path: layer.route.path, methods: Object.keys(layer.route.methods), spec });
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack);
  return found;
}
