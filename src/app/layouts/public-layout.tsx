import { useEffect } from 'react';
import { Outlet, useLocation } from 'react-router-dom';
import { SiteFooter } from './site-footer';
import { SiteHeader } from './site-header';

// The path whose description the page carries: the server wrote the first page's into the HTML.
let described = typeof window === 'undefined' ? '' : window.location.pathname;

/** Keeps the meta description right as the visitor moves on (the list of descriptions loads on the first move). */
function useMetaDescription() {
  const { pathname } = useLocation();
  useEffect(() => {
    if (pathname === described) return;
    let current = true;
    void import('@shared/site-meta').then(({ pageMeta }) => {
      if (!current) return;
      described = pathname;
      document.querySelector('meta[name="description"]')?.setAttribute('content', pageMeta(pathname).description);
    });
    return () => {
      current = false;
    };
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
