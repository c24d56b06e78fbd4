import { Component as MissionPage } from '@/app/routes/home';
import type { PublicPage } from './types';

// The public site's pages. Add a page here: its route, and (with `nav`) a header link.
export const publicPages: PublicPage[] = [
  // The mission page is where most visitors land: it is in the entry, so it paints without a second round trip.
  { path: '', lazy: () => import('@/app/routes/home'), eager: MissionPage, nav: { label: 'Mission', order: 10 } },
  { path: 'sign-in', lazy: () => import('@/app/routes/sign-in') },
  { path: 'sign-up', lazy: () => import('@/app/routes/sign-up') },
  { path: 'forgot-password', lazy: () => import('@/app/routes/forgot-password') },
  { path: 'reset-password', lazy: () => import('@/app/routes/reset-password') },
  { path: 'verify-email', lazy: () => import('@/app/routes/verify-email') },
  { path: 'campaign', lazy: () => import('@/app/routes/campaign'), nav: { label: 'Campaign', order: 20 } },
  { path: 'campaign/pledge', lazy: () => import('@/app/routes/campaign-pledge') },
  { path: 'campaign/:slug', lazy: () => import('@/app/routes/campaign') },
  { path: 'pledges/:id/thanks', lazy: () => import('@/app/routes/pledge-thanks') },
  { path: 'pledges/:id/cancelled', lazy: () => import('@/app/routes/pledge-cancelled') },
  { path: 'snapshots/:slug', lazy: () => import('@/app/routes/public-snapshot') },
  { path: 'dispatches', lazy: () => import('@/app/routes/dispatches'), nav: { label: 'Dispatches', order: 30 } },
  { path: 'dispatches/:slug', lazy: () => import('@/app/routes/dispatch') },
  { path: 'unsubscribe', lazy: () => import('@/app/routes/unsubscribe') },
  { path: 'where-it-is-now', lazy: () => import('@/app/routes/where-it-is-now'), nav: { label: 'Where it is now', order: 40 } },
  { path: 'sky-watch', lazy: () => import('@/app/routes/sky-watch'), nav: { label: 'Sky watch', order: 50 } },
];
