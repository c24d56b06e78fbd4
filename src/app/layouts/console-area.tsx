import { Outlet, useRoutes, type RouteObject } from 'react-router-dom';
import { toDeclarative, withinLayout } from '../route-tree';
import { SectionLanding } from '../routes/console/section-landing';
import { consoleSections } from '../site-map/console-sections';
import type { ConsoleSection } from '../site-map/types';
import { ConsoleLayout } from './console-layout';
import { RequireRoles } from './require-roles';

// Everything under /console, loaded on the first visit there.

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

const consoleRoutes: RouteObject[] = [
  {
    Component: ConsoleLayout,
    children: withinLayout([{ index: true, lazy: () => import('../routes/console/overview') }, ...consoleSections.map(sectionRoute)]),
  },
].map(toDeclarative);

export function Component() {
  return useRoutes(consoleRoutes);
}
