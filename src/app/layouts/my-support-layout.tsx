import { Outlet } from 'react-router-dom';
import { mySupportPages } from '../site-map/my-support-pages';
import { AreaNav, type AreaNavItem } from './area-nav';
import { RequireAccount } from './require-account';
import { SiteFooter } from './site-footer';
import { SiteHeader } from './site-header';

const items: AreaNavItem[] = [...mySupportPages]
  .sort((a, b) => a.order - b.order)
  .map((page) => ({ to: page.path ? `/my-support/${page.path}` : '/my-support', label: page.label, end: page.path === '' }));

export function MySupportLayout() {
  return (
    <div className="flex min-h-dvh flex-col">
      <SiteHeader areaLabel="My support" />
      <RequireAccount>
        {() => (
          <div className="mx-auto flex w-full max-w-6xl flex-1 flex-col gap-6 px-4 py-6 sm:px-6 md:flex-row md:py-10">
            <AreaNav label="My support" items={items} />
            <main id="main" tabIndex={-1} className="min-w-0 flex-1 outline-none">
              <Outlet />
            </main>
          </div>
        )}
      </RequireAccount>
      <SiteFooter />
    </div>
  );
}
