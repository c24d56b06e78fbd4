import { useCallback, useEffect, useId, useRef, useState } from 'react';
import { Link, NavLink, useLocation, useNavigate } from 'react-router-dom';
import type { AccountView } from '@shared/schemas/auth';
import { buttonClasses } from '@/components/ui/button';
import { ThemeToggle } from '@/components/ui/theme-toggle';
import { useMe } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { cn } from '@/lib/cn';
import { hasAnyRole, staffRoles } from '@/lib/roles';
import { publicPages } from '../site-map/public-pages';
import { useDismiss } from './use-dismiss';
import { Wordmark } from './wordmark';

type HeaderLink = { to: string; label: string; end?: boolean };

const publicLinks: HeaderLink[] = publicPages
  .filter((page) => page.nav)
  .sort((a, b) => a.nav!.order - b.nav!.order)
  .map((page) => ({ to: `/${page.path}`, label: page.nav!.label, end: page.path === '' }));

function accountLinks(account: AccountView): HeaderLink[] {
  const links: HeaderLink[] = [{ to: '/my-support', label: 'My support' }];
  if (hasAnyRole(account.roles, staffRoles)) links.push({ to: '/console', label: 'Console' });
  return links;
}

const navLinkClass = ({ isActive }: { isActive: boolean }) =>
  cn(
    'rounded-lg px-3 py-2 text-sm font-semibold transition-colors',
    isActive ? 'bg-night-800 text-foil-50' : 'text-foil-300 hover:bg-night-800/70 hover:text-foil-50',
  );

function initials(name: string): string {
  return name
    .split(/\s+/)
    .filter(Boolean)
    .slice(0, 2)
    .map((part) => part[0]!.toUpperCase())
    .join('');
}

function AccountMenu({ account, onSignOut, signingOut }: { account: AccountView; onSignOut: () => void; signingOut: boolean }) {
  const [open, setOpen] = useState(false);
  const menuId = useId();
  const container = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  const close = useCallback(() => setOpen(false), []);
  useDismiss(open, close, container, button);

  return (
    <div ref={container} className="relative">
      <button
        ref={button}
        type="button"
        aria-expanded={open}
        aria-controls={menuId}
        onClick={() => setOpen((v) => !v)}
        className="inline-flex min-h-10 items-center gap-2 rounded-lg border border-foil-700 px-2 pr-3 text-sm font-semibold text-foil-100 hover:border-foil-400"
      >
        <span
          aria-hidden="true"
          className="flex size-7 items-center justify-center rounded-full bg-amber-400 text-xs font-bold text-night-950"
        >
          {initials(account.displayName) || '·'}
        </span>
        <span className="max-w-40 truncate">{account.displayName}</span>
        <span className="sr-only">, account menu</span>
        <svg aria-hidden="true" viewBox="0 0 12 12" className={cn('size-3 transition-transform', open && 'rotate-180')}>
          <path d="M2 4 L6 8 L10 4" fill="none" stroke="currentColor" strokeWidth="1.6" />
        </svg>
      </button>
      <div
        id={menuId}
        hidden={!open}
        className="absolute right-0 z-40 mt-2 w-64 rounded-xl border border-foil-700 bg-night-900 p-2 shadow-2xl shadow-night-950"
      >
        <p className="truncate px-3 pb-2 pt-1 text-xs text-foil-400">Signed in as {account.email}</p>
        <ul className="space-y-0.5">
          {accountLinks(account).map((link) => (
            <li key={link.to}>
              <Link
                to={link.to}
                onClick={close}
                className="block rounded-lg px-3 py-2 text-sm font-semibold text-foil-100 hover:bg-night-800"
              >
                {link.label}
              </Link>
            </li>
          ))}
          <li>
            <button
              type="button"
              onClick={onSignOut}
              disabled={signingOut}
              className="block w-full rounded-lg px-3 py-2 text-left text-sm font-semibold text-foil-100 hover:bg-night-800 disabled:opacity-60"
            >
              {signingOut ? 'Signing out…' : 'Sign out'}
            </button>
          </li>
        </ul>
      </div>
    </div>
  );
}

export function SiteHeader({ areaLabel, wide = false }: { areaLabel?: string; wide?: boolean }) {
  const me = useMe();
  const account = me.data ?? null;
  const location = useLocation();
  const navigate = useNavigate();
  const signOut = useSignOut({ onSuccess: () => void navigate('/') });
  const [mobileOpen, setMobileOpen] = useState(false);
  const mobileId = useId();
  const container = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  const closeMobile = useCallback(() => setMobileOpen(false), []);
  useDismiss(mobileOpen, closeMobile, container, button);

  useEffect(() => setMobileOpen(false), [location.pathname]);

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
            <AccountMenu account={account} onSignOut={() => signOut.mutate()} signingOut={signOut.isPending} />
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
          aria-expanded={mobileOpen}
          aria-controls={mobileId}
          onClick={() => setMobileOpen((v) => !v)}
          className="inline-flex min-h-10 items-center gap-2 rounded-lg border border-foil-700 px-3 text-sm font-semibold text-foil-100 sm:hidden"
        >
          <svg aria-hidden="true" viewBox="0 0 20 20" className="size-5">
            {mobileOpen ? (
              <path d="M5 5 L15 15 M15 5 L5 15" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
            ) : (
              <path d="M3 6 H17 M3 10 H17 M3 14 H17" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
            )}
          </svg>
          Menu
        </button>

        <div
          id={mobileId}
          hidden={!mobileOpen}
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
              <div className="space-y-2">
                <p className="truncate px-3 text-sm text-foil-400">Signed in as {account.email}</p>
                <button
                  type="button"
                  onClick={() => signOut.mutate()}
                  disabled={signOut.isPending}
                  className={buttonClasses({ variant: 'secondary', className: 'w-full' })}
                >
                  {signOut.isPending ? 'Signing out…' : 'Sign out'}
                </button>
              </div>
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
