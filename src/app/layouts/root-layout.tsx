import { useEffect, useRef } from 'react';
import { Outlet, useLocation } from 'react-router-dom';
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
    // A new page starts at its top (an in-page #anchor is left to the browser).
    if (!window.location.hash) window.scrollTo(0, 0);
  }, [pathname]);
}

export function RootLayout() {
  useFocusMainOnNavigate();
  return (
    <>
      <SkipLink />
      <Outlet />
    </>
  );
}
