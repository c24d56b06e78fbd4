import type { MySupportPage } from './types';

// The backer area's pages, in navigation order. Add an entry to get a route under /my-support and a nav link.
export const mySupportPages: MySupportPage[] = [
  { path: '', label: 'Account', order: 10, lazy: () => import('@/app/routes/my-support/account') },
];
