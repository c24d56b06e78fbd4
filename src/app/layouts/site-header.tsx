import { lazy, Suspense, useEffect } from 'react';
import { Link, NavLink, useLocation } from 'react-router-dom';
import { buttonClasses } from '@/components/ui/button';
import { ThemeToggle } from '@/components/ui/theme-toggle';
import { useMe } from '@/features/auth/api/get-me';
import { cn } from '@/lib/cn';
import { publicPages } from '../site-map/public-pages';
import { accountLinks, type HeaderLink } from './account-links';
import { useDisclosure } from './use-disclosure';
import { Wordmark } from './wordmark';

// The account menu and sign-out are for signed-in visitors only: their code loads once the session is known to
// have an account.
const AccountMenu = lazy(() => import('./account-menu').then((m) => ({ default: m.AccountMenu })));
const MobileAccount = lazy(() => import('./account-menu').then((m) => ({ default: m.MobileAccount })));

const publicLinks: HeaderLink[] = publicPages
  .filter((page) => page.nav)
  .sort((a, b) => a.nav!.order - b.nav!.order)
  .map((page) => ({ to: `/${page.path}`, label: page.nav!.label, end: page.path === '' }));

const navLinkClass = ({ isActive }: { isActive: boolean }) =>
  cn(
    'rounded-lg px-3 py-2 text-sm font-semibold transition-colors',
    isActive ? 'bg-night-800 text-foil-50' : 'text-foil-300 hover:bg-night-800/70 hover:text-foil-50',
  );

export function SiteHeader({ areaLabel, wide = false }: { areaLabel?: string; wide?: boolean }) {
  const me = useMe();
  const account = me.data ?? null;
  const location = useLocation();
  const mobile = useDisclosure();
  const { container, button, close: closeMobile } = mobile;

  useEffect(() => closeMobile(), [location.pathname, closeMobile]);

  const returnTo = location.pathname.startsWith('/sign-') ? undefined : location.pathname + location.search;
  const signInTo = returnTo && returnTo !== '/' ? `/sign-in?returnTo=${encodeURIComponent(returnTo)}` : '/sign-in';

  return (
    <header className="sticky top-0 z-30 border-b border-foil-800/80 bg-night-950/90 backdrop-blur">
      <div ref={container} className={cn('mx-auto flex h-16 items-center gap-4 px-4 sm:px-6', wide ? 'max-w-7xl' : 'max-w-6xl')}>
        <Wordmark suffix={areaLabel} />

        <nav aria-label="Site" className="hidden flex-1 items-center gap-1 sm:flex">
          {publicLinks.map((link) => (
            <NavLink key={link.to} to={link.to} end={link.end} className={navLinkClass}>
              {link.label}
            </NavLink>
          ))}
          {account &&
            accountLinks(account).map((link) => (
              <NavLink key={link.to} to={link.to} className={navLinkClass}>
                {link.label}
              </NavLink>
            ))}
        </nav>

        <div className="ml-auto hidden items-center gap-2 sm:flex">
          <ThemeToggle />
          {me.isPending ? null : account ? (
            <Suspense fallback={null}>
              <AccountMenu account={account} />
            </Suspense>
          ) : (
            <>
              <Link to={signInTo} className={buttonClasses({ variant: 'ghost' })}>
                Sign in
              </Link>
              <Link to="/sign-up" className={buttonClasses({ variant: 'secondary' })}>
                Create account
              </Link>
            </>
          )}
        </div>

        <ThemeToggle className="ml-auto sm:hidden" />
        <button
          ref={button}
          type="button"
          aria-expanded={mobile.open}
          aria-controls={mobile.id}
          onClick={mobile.toggle}
          className="inline-flex min-h-10 items-center gap-2 rounded-lg border border-foil-700 px-3 text-sm font-semibold text-foil-100 sm:hidden"
        >
          <svg aria-hidden="true" viewBox="0 0 20 20" className="size-5">
            {mobile.open ? (
              <path d="M5 5 L15 15 M15 5 L5 15" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
            ) : (
              <path d="M3 6 H17 M3 10 H17 M3 14 H17" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
            )}
          </svg>
          Menu
        </button>

        <div
          id={mobile.id}
          hidden={!mobile.open}
          className="absolute inset-x-0 top-16 border-b border-foil-800 bg-night-950 px-4 pb-4 pt-2 shadow-2xl sm:hidden"
        >
          <nav aria-label="Site (menu)">
            <ul className="space-y-1">
              {[...publicLinks, ...(account ? accountLinks(account) : [])].map((link) => (
                <li key={link.to}>
                  <NavLink to={link.to} end={link.end} className={({ isActive }) => cn(navLinkClass({ isActive }), 'block py-3 text-base')}>
                    {link.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
          <div className="mt-3 border-t border-foil-800 pt-3">
            {account ? (
              <Suspense fallback={null}>
                <MobileAccount account={account} />
              </Suspense>
            ) : (
              <div className="grid grid-cols-2 gap-2">
                <Link to={signInTo} className={buttonClasses({ variant: 'secondary' })}>
                  Sign in
                </Link>
                <Link to="/sign-up" className={buttonClasses({ variant: 'primary' })}>
                  Create account
                </Link>
              </div>
            )}
          </div>
        </div>
      </div>
    </header>
  );
}
