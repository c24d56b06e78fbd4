import type { MySupportPage } from './types';

// The backer area's pages, in navigation order. Add an entry to get a route under /my-support and a nav link.
export const mySupportPages: MySupportPage[] = [
  { path: '', label: 'Account', order: 10, lazy: () => import('@/app/routes/my-support/account') },
  { path: 'pledges', label: 'Pledges', order: 20, lazy: () => import('@/app/routes/my-support/pledges') },
  {
    path: 'memberships',
    label: 'Crew memberships',
    order: 30,
    lazy: () => import('@/app/routes/my-support/memberships'),
    children: [{ path: ':id/card', lazy: () => import('@/app/routes/my-support/membership-card') }],
  },
  {
    path: 'receipts',
    label: 'Receipts',
    order: 40,
    lazy: () => import('@/app/routes/my-support/receipts'),
    children: [{ path: ':entryId', lazy: () => import('@/app/routes/my-support/receipt') }],
  },
  { path: 'places', label: 'Saved places', order: 45, lazy: () => import('@/app/routes/my-support/places') },
  { path: 'email', label: 'E-mail choices', order: 50, lazy: () => import('@/app/routes/my-support/email') },
  { path: 'data', label: 'Your data', order: 60, lazy: () => import('@/app/routes/my-support/data') },
];
