import { useRoutes, type RouteObject } from 'react-router-dom';
import { PublicLayout } from './layouts/public-layout';
import { RootLayout } from './layouts/root-layout';
import { lazyComponent, pageRoute, toDeclarative, withinLayout } from './route-tree';
import { RouteError } from './routes/route-error';
import { mySupportPages } from './site-map/my-support-pages';
import { publicPages } from './site-map/public-pages';

// Pages are not listed here: they come from the three lists in ./site-map/. The console (its layout, section list
// and pages) and the my-support layout load on the first visit to those areas, so public pages carry none of it.

const ConsoleArea = lazyComponent(() => import('./layouts/console-area'));
const MySupportLayout = lazyComponent(() => import('./layouts/my-support-layout').then((m) => ({ Component: m.MySupportLayout })));

export const routes: RouteObject[] = [
  {
    Component: RootLayout,
    errorElement: <RouteError standalone />,
    children: [
      { path: '/', Component: PublicLayout, children: withinLayout(publicPages.map(pageRoute)) },
      { path: '/my-support', Component: MySupportLayout, children: withinLayout(mySupportPages.map(pageRoute)) },
      { path: '/console/*', Component: ConsoleArea },
    ],
  },
];

const declarativeRoutes = routes.map(toDeclarative);

export function AppRoutes() {
  return useRoutes(declarativeRoutes);
}
