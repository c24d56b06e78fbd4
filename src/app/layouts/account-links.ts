import type { AccountView } from '@shared/schemas/auth';
import { hasAnyRole, staffRoles } from '@/lib/roles';

export type HeaderLink = { to: string; label: string; end?: boolean };

/** The header's links for a signed-in account. */
export function accountLinks(account: AccountView): HeaderLink[] {
  const links: HeaderLink[] = [{ to: '/my-support', label: 'My support' }];
  if (hasAnyRole(account.roles, staffRoles)) links.push({ to: '/console', label: 'Console' });
  return links;
}
