import type { Express, Router } from 'express';

export type RouteEntry = { method: string; path: string };

type Layer = { route?: { path: string | string[]; methods: Record<string, boolean> } };

/**
 * Mounts a router and records each of its routes (method + full path) in app.locals.routes, so the
 * RBAC test can check that every route the app serves is listed in its table.
 */
export function mount(app: Express, prefix: string, router: Router) {
  app.use(prefix, router);
  const table: RouteEntry[] = (app.locals.routes ??= []);
  for (const layer of (router as unknown as { stack: Layer[] }).stack) {
    if (!layer.route) continue;
    const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
    for (const p of paths) {
      for (const [method, on] of Object.entries(layer.route.methods)) {
        if (on && method !== '_all') table.push({ method: method.toUpperCase(), path: prefix + (p === '/' ? '' : p) || '/' });
      }
    }
  }
}

export function routesOf(app: Express): RouteEntry[] {
  return app.locals.routes ?? [];
}
