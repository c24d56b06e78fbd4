import { useEffect, useRef } from 'react';
import { Outlet, ScrollRestoration, useLocation } from 'react-router-dom';
import { SkipLink } from './skip-link';

/** After client-side navigation, focus moves to the new page's main region so screen readers start there. */
function useFocusMainOnNavigate() {
  const { pathname } = useLocation();
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    document.getElementById('main')?.focus({ preventScroll: true });
  }, [pathname]);
}

export function RootLayout() {
  useFocusMainOnNavigate();
  return (
    <>
      <SkipLink />
      <Outlet />
      <ScrollRestoration />
    </>
  );
}
