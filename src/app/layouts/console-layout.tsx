import { Link, Outlet } from 'react-router-dom';
import type { AccountView } from '@shared/schemas/auth';
import { buttonClasses } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { sectionsFor } from '../site-map/console-sections';
import { AreaNav } from './area-nav';
import { RequireAccount } from './require-account';
import { SiteHeader } from './site-header';

function ConsoleBody({ account }: { account: AccountView }) {
  const sections = sectionsFor(account.roles);
  if (sections.length === 0) {
    return (
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-3xl flex-1 px-4 py-16 outline-none sm:px-6">
        <h1 className="sr-only">Console</h1>
        <EmptyState
          title="The console is for mission staff"
          description="Your account holds no staff role. An admin can grant one if you work on the mission."
          action={
            <Link to="/my-support" className={buttonClasses({ variant: 'secondary' })}>
              Go to my support
            </Link>
          }
        />
      </main>
    );
  }
  return (
    <div className="mx-auto flex w-full max-w-7xl flex-1 flex-col gap-6 px-4 py-6 sm:px-6 md:flex-row md:py-10">
      <AreaNav
        label="Console sections"
        items={[{ to: '/console', label: 'Overview', end: true }, ...sections.map((s) => ({ to: `/console/${s.path}`, label: s.title }))]}
      />
      <main id="main" tabIndex={-1} className="min-w-0 flex-1 outline-none">
        <Outlet />
      </main>
    </div>
  );
}

export function ConsoleLayout() {
  return (
    <div className="flex min-h-dvh flex-col bg-night-950">
      <SiteHeader areaLabel="Console" wide />
      <RequireAccount>{(account) => <ConsoleBody account={account} />}</RequireAccount>
    </div>
  );
}
