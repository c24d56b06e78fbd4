import { useEffect } from 'react';
import { Outlet, useLocation } from 'react-router-dom';
import { pageMeta } from '@shared/site-meta';
import { SiteFooter } from './site-footer';
import { SiteHeader } from './site-header';

/** The server wrote the first page's description into the HTML; this keeps it right as the visitor moves on. */
function useMetaDescription() {
  const { pathname } = useLocation();
  useEffect(() => {
    document.querySelector('meta[name="description"]')?.setAttribute('content', pageMeta(pathname).description);
  }, [pathname]);
}

export function PublicLayout() {
  useMetaDescription();
  return (
    <div className="flex min-h-dvh flex-col">
      <SiteHeader />
      <main id="main" tabIndex={-1} className="flex-1 outline-none">
        <Outlet />
      </main>
      <SiteFooter />
    </div>
  );
}
