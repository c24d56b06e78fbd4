import { Component as ReactComponent, lazy, Suspense, type ComponentType, type ReactNode } from 'react';
import { Outlet, useLocation, type RouteObject } from 'react-router-dom';
import { PageSpinner } from '@/components/ui/spinner';
import { NotFoundPage } from './routes/not-found';
import { CaughtErrorContext, RouteError } from './routes/route-error';
import type { LazyPage } from './site-map/types';

// The routes are plain route objects rendered with useRoutes (React Router's declarative mode): the data router
// (loaders, actions, fetchers) is used nowhere and would cost about 18 KB gzip on every page. A route's `lazy`
// module loads through React.lazy, and `errorElement` becomes an error boundary around the route's element.

export const notFound: RouteObject = { path: '*', Component: NotFoundPage };

export function pageRoute(page: { path: string; lazy: LazyPage; eager?: ComponentType; children?: RouteObject[] }): RouteObject {
  const load: Pick<RouteObject, 'lazy' | 'Component'> = page.eager ? { Component: page.eager } : { lazy: page.lazy };
  if (page.children) return { path: page.path || undefined, children: [{ index: true, ...load }, ...page.children] };
  return page.path ? { path: page.path, ...load } : { index: true, ...load };
}

/** A pathless child with its own error boundary, so a failing page keeps its layout's header and navigation. */
export function withinLayout(children: RouteObject[]): RouteObject[] {
  return [{ errorElement: <RouteError />, children: [...children, notFound] }];
}

const lazyCache = new WeakMap<LazyPage, ComponentType>();

export function lazyComponent(load: LazyPage): ComponentType {
  let component = lazyCache.get(load);
  if (!component) {
    component = lazy(() => load().then((m) => ({ default: m.Component })));
    lazyCache.set(load, component);
  }
  return component;
}

type BoundaryProps = { fallback: ReactNode; resetKey: string; children: ReactNode };
type BoundaryState = { error: unknown; key: string };

class RouteErrorBoundary extends ReactComponent<BoundaryProps, BoundaryState> {
  state: BoundaryState = { error: null, key: this.props.resetKey };
  static getDerivedStateFromError(error: unknown): Partial<BoundaryState> {
    return { error: error ?? new Error('Unknown error') };
  }
  static getDerivedStateFromProps(props: BoundaryProps, state: BoundaryState): Partial<BoundaryState> | null {
    // A new address clears the error, as the data router's boundaries did.
    return props.resetKey === state.key ? null : { error: null, key: props.resetKey };
  }
  render() {
    if (this.state.error !== null) return <CaughtErrorContext value={this.state.error}>{this.props.fallback}</CaughtErrorContext>;
    return this.props.children;
  }
}

function WithBoundary({ fallback, children }: { fallback: ReactNode; children: ReactNode }) {
  const { pathname } = useLocation();
  return (
    <RouteErrorBoundary fallback={fallback} resetKey={pathname}>
      {children}
    </RouteErrorBoundary>
  );
}

function Page({ of: Of }: { of: ComponentType }) {
  return (
    <Suspense fallback={<PageSpinner />}>
      <Of />
    </Suspense>
  );
}

/** Turns data-router style objects (lazy, Component, errorElement) into the elements useRoutes renders. */
export function toDeclarative(route: RouteObject): RouteObject {
  let element: ReactNode = route.element;
  if (route.lazy) element = <Page of={lazyComponent(route.lazy as LazyPage)} />;
  else if (route.Component) element = <Page of={route.Component} />;
  if (route.errorElement) element = <WithBoundary fallback={route.errorElement}>{element ?? <Outlet />}</WithBoundary>;
  if (route.index) return { index: true, path: route.path, element };
  return { path: route.path, element, children: route.children?.map(toDeclarative) };
}
