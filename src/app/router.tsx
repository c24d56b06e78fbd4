import { createBrowserRouter, Outlet, type RouteObject } from 'react-router-dom';
import { PageSpinner } from '@/components/ui/spinner';
import { ConsoleLayout } from './layouts/console-layout';
import { MySupportLayout } from './layouts/my-support-layout';
import { PublicLayout } from './layouts/public-layout';
import { RequireRoles } from './layouts/require-roles';
import { RootLayout } from './layouts/root-layout';
import { SectionLanding } from './routes/console/section-landing';
import { NotFoundPage } from './routes/not-found';
import { RouteError } from './routes/route-error';
import { consoleSections } from './site-map/console-sections';
import { mySupportPages } from './site-map/my-support-pages';
import { publicPages } from './site-map/public-pages';
import type { ConsoleSection, LazyPage } from './site-map/types';

// Pages are not listed here: they come from the three lists in ./site-map/.

const notFound: RouteObject = { path: '*', Component: NotFoundPage };

function pageRoute(page: { path: string; lazy: LazyPage; children?: RouteObject[] }): RouteObject {
  if (page.children) return { path: page.path || undefined, children: [{ index: true, lazy: page.lazy }, ...page.children] };
  return page.path ? { path: page.path, lazy: page.lazy } : { index: true, lazy: page.lazy };
}

function sectionRoute(section: ConsoleSection): RouteObject {
  return {
    path: section.path,
    element: (
      <RequireRoles roles={section.roles}>
        <Outlet />
      </RequireRoles>
    ),
    children: [
      section.lazy ? { index: true, lazy: section.lazy } : { index: true, element: <SectionLanding section={section} /> },
      ...(section.children ?? []),
    ],
  };
}

/** A pathless child with its own error boundary, so a failing page keeps its layout's header and navigation. */
function withinLayout(children: RouteObject[]): RouteObject[] {
  return [{ errorElement: <RouteError />, children: [...children, notFound] }];
}

export const routes: RouteObject[] = [
  {
    Component: RootLayout,
    errorElement: <RouteError standalone />,
    HydrateFallback: () => <PageSpinner />,
    children: [
      { path: '/', Component: PublicLayout, children: withinLayout(publicPages.map(pageRoute)) },
      { path: '/my-support', Component: MySupportLayout, children: withinLayout(mySupportPages.map(pageRoute)) },
      {
        path: '/console',
        Component: ConsoleLayout,
        children: withinLayout([{ index: true, lazy: () => import('./routes/console/overview') }, ...consoleSections.map(sectionRoute)]),
      },
    ],
  },
];

export function createRouter() {
  return createBrowserRouter(routes);
}
