import { useRoutes, type RouteObject } from 'react-router-dom';
import { PublicLayout } from './layouts/public-layout';
import { RootLayout } from './layouts/root-layout';
import { lazyComponent, pageRoute, toDeclarative, withinLayout } from './route-tree';
import { RouteError } from './routes/route-error';
import { publicPages } from './site-map/public-pages';

// Pages are not listed here: they come from the three lists in ./site-map/. The console and my support (each with
// its layout, page list and pages) load on the first visit to those areas, so public pages carry none of it.

const ConsoleArea = lazyComponent(() => import('./layouts/console-area'));
const MySupportArea = lazyComponent(() => import('./layouts/my-support-area'));

export const routes: RouteObject[] = [
  {
    Component: RootLayout,
    errorElement: <RouteError standalone />,
    children: [
      { path: '/', Component: PublicLayout, children: withinLayout(publicPages.map(pageRoute)) },
      { path: '/my-support/*', Component: MySupportArea },
      { path: '/console/*', Component: ConsoleArea },
    ],
  },
];

const declarativeRoutes = routes.map(toDeclarative);

export function AppRoutes() {
  return useRoutes(declarativeRoutes);
}
