import { roles, type Role } from '@shared/roles';

export const roleLabels: Record<Role, string> = {
  backer: 'Backer',
  outreach: 'Outreach',
  engineer: 'Engineer',
  finance: 'Finance',
  admin: 'Admin',
};

export const staffRoles: readonly Role[] = ['outreach', 'engineer', 'finance', 'admin'];

export function hasAnyRole(held: readonly Role[] | undefined, wanted: readonly Role[]): boolean {
  return !!held && wanted.some((role) => held.includes(role));
}

/** Roles in their fixed order (backer first), whatever order the server sent them in. */
export function sortRoles(held: readonly Role[]): Role[] {
  return [...held].sort((a, b) => roles.indexOf(a) - roles.indexOf(b));
}
