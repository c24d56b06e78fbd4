import { useRoutes } from 'react-router-dom';
import { pageRoute, toDeclarative, withinLayout } from '../route-tree';
import { mySupportPages } from '../site-map/my-support-pages';
import { MySupportLayout } from './my-support-layout';

// Everything under /my-support (its layout and page list), loaded on the first visit there, as the console is.

const mySupportRoutes = [{ Component: MySupportLayout, children: withinLayout(mySupportPages.map(pageRoute)) }].map(toDeclarative);

export function Component() {
  return useRoutes(mySupportRoutes);
}
