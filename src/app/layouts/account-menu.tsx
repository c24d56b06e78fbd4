import { Link, useNavigate } from 'react-router-dom';
import type { AccountView } from '@shared/schemas/auth';
import { buttonClasses } from '@/components/ui/button';
import { useSignOut } from '@/features/auth/api/sign-out';
import { cn } from '@/lib/cn';
import { accountLinks } from './account-links';
import { useDisclosure } from './use-disclosure';

function initials(name: string): string {
  return name
    .split(/\s+/)
    .filter(Boolean)
    .slice(0, 2)
    .map((part) => part[0]!.toUpperCase())
    .join('');
}

/** Signing out ends the session here and returns to the mission page. */
function useSignOutHome() {
  const navigate = useNavigate();
  return useSignOut({ onSuccess: () => void navigate('/') });
}

/** The header's account menu (wider screens). */
export function AccountMenu({ account }: { account: AccountView }) {
  const signOut = useSignOutHome();
  const { open, id: menuId, container, button, close, toggle } = useDisclosure();

  return (
    <div ref={container} className="relative">
      <button
        ref={button}
        type="button"
        aria-expanded={open}
        aria-controls={menuId}
        onClick={toggle}
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
              onClick={() => signOut.mutate()}
              disabled={signOut.isPending}
              className="block w-full rounded-lg px-3 py-2 text-left text-sm font-semibold text-foil-100 hover:bg-night-800 disabled:opacity-60"
            >
              {signOut.isPending ? 'Signing out…' : 'Sign out'}
            </button>
          </li>
        </ul>
      </div>
    </div>
  );
}

/** The account part of the header's menu panel (phones). */
export function MobileAccount({ account }: { account: AccountView }) {
  const signOut = useSignOutHome();
  return (
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
  );
}
