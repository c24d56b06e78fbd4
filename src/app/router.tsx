import { createBrowserRouter, Outlet, type RouteObject } from 'react-router-dom';
import { PageSpinner } from '@/components/ui/spinner';
import { ConsoleLayout } from './layouts/console-layout';
import { MySupportLayout } from './layouts/my-support-layout';
import { PublicLayout } from './layouts/public-layout';
import { RequireRoles } from './layouts/require-roles';
import { RootLayout } from './layouts/root-layout';
import { NotFoundPage } from './routes/not-found';
import { RouteError } from './routes/route-error';
import { SectionLanding } from './routes/console/section-landing';
import { consoleSections } from './site-map/console-sections';
import { mySupportPages } from './site-map/my-support-pages';
import { publicPages } from './site-map/public-pages';
import type { LazyPage } from './site-map/types';

const notFound: RouteObject = { path: '*', Component: NotFoundPage };

function pageRoute(page: { path: string; lazy: LazyPage; children?: RouteObject[] }): RouteObject {
  if (page.children) return { path: page.path || undefined, children: [{ index: true, lazy: page.lazy }, ...page.children] };
  return page.path ? { path: page.path, lazy: page.lazy } : { index: true, lazy: page.lazy };
}

export const routes: RouteObject[] = [
  {
    Component: RootLayout,
    errorElement: <RouteError standalone />,
    HydrateFallback: () => <PageSpinner />,
    children: [
      {
        path: '/',
        Component: PublicLayout,
        children: [{ errorElement: <RouteError />, children: [...publicPages.map(pageRoute), notFound] }],
      },
      {
        path: '/my-support',
        Component: MySupportLayout,
        children: [{ errorElement: <RouteError />, children: [...mySupportPages.map(pageRoute), notFound] }],
      },
      {
        path: '/console',
        Component: ConsoleLayout,
        children: [
          {
            errorElement: <RouteError />,
            children: [
          { index: true, lazy: () => import('./routes/console/overview') },
          ...consoleSections.map(
            (section): RouteObject => ({
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
            }),
          ),
          notFound,
            ],
          },
        ],
      },
    ],
  },
];

export function createRouter() {
  return createBrowserRouter(routes);
}
