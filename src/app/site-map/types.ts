import type { ComponentType } from 'react';
import type { RouteObject } from 'react-router-dom';
import type { Role } from '@shared/schemas/auth';

/** A route module: `export function Component()` in a file under src/app/routes/, loaded on first visit. */
export type LazyPage = () => Promise<{ Component: ComponentType }>;

export type PublicPage = {
  /** Path below `/`, without a leading slash; '' is the home page. */
  path: string;
  lazy: LazyPage;
  /** The page itself, bundled into the entry instead of loaded on first visit (only the mission page, where most visitors land). */
  eager?: ComponentType;
  /** Present when the page gets a link in the public header, ordered by `order`. */
  nav?: { label: string; order: number };
  children?: RouteObject[];
};

export type MySupportPage = {
  /** Path below `/my-support`, without a leading slash; '' is the area's first page. */
  path: string;
  label: string;
  order: number;
  lazy: LazyPage;
  children?: RouteObject[];
};

export type ConsoleSection = {
  id: string;
  /** Path below `/console`, without a leading slash. */
  path: string;
  title: string;
  /** Who sees the section in navigation and may open it (the server checks again on every call). */
  roles: readonly Role[];
  /** One sentence for the console overview. */
  summary: string;
  /** What someone with the role does here, shown on the generic landing page until `lazy` is given. */
  duties: readonly string[];
  /** The section's own landing page; without it a landing page is built from title, summary and duties. */
  lazy?: LazyPage;
  /** Pages under /console/<path>/…, guarded by the section's roles. */
  children?: RouteObject[];
};
